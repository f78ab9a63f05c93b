// What lies between the transmitter's data and the receiver's equalizers besides the channel: the
// transmitter's and receiver's packages and the receiver's bandwidth, applied to any pulse response.
import { DEFAULT_TAIL_UI, paddedSpectrum } from "../equalizers/paddedSpectrum.ts";
import { peakIndex } from "../pulse/peakIndex.ts";
import type { ComplexArray } from "../signal/fftPlan.ts";
import type { Pulse } from "../types.ts";
import { checkPackageModel, type PackageModel, packageTransfer } from "./packageModel.ts";
import { receiverFilter } from "./receiverFilter.ts";

/** The optional pieces around a channel: packages at both ends and the receiver's bandwidth filter. */
export interface FrontEnd {
  readonly txPackage?: PackageModel;
  readonly rxPackage?: PackageModel;
  /** −3 dB frequency of the receiver's 4th-order Butterworth bandwidth filter, Hz. */
  readonly rxBandwidth_Hz?: number;
}

/** True when `frontEnd` changes nothing (no package, no bandwidth filter). */
export function isNeutralFrontEnd(frontEnd: FrontEnd | undefined): boolean {
  return (
    frontEnd === undefined ||
    (frontEnd.txPackage === undefined && frontEnd.rxPackage === undefined && frontEnd.rxBandwidth_Hz === undefined)
  );
}

/** Throws RangeError naming the field unless `frontEnd` is usable. */
export function checkFrontEnd(frontEnd: FrontEnd, name = "frontEnd"): void {
  if (frontEnd === null || typeof frontEnd !== "object") throw new TypeError(`${name} must be an object`);
  if (frontEnd.txPackage !== undefined) checkPackageModel(frontEnd.txPackage, `${name}.txPackage`);
  if (frontEnd.rxPackage !== undefined) checkPackageModel(frontEnd.rxPackage, `${name}.rxPackage`);
  const bw = frontEnd.rxBandwidth_Hz;
  if (bw !== undefined && !(Number.isFinite(bw) && bw > 0))
    throw new RangeError(`${name}.rxBandwidth_Hz must be a finite number > 0, got ${String(bw)}`);
}

/**
 * `H(f) = T_tx(f)·T_rx(f)·H_r(f)`: the packages' transfers ({@link packageTransfer}, channel taken as
 * matched between them) times the receiver's bandwidth filter ({@link receiverFilter}).
 *
 * @param frontEnd - the pieces present (missing ones contribute 1).
 * @param freqs_Hz - frequencies in Hz.
 */
export function frontEndTransfer(frontEnd: FrontEnd, freqs_Hz: ArrayLike<number>): ComplexArray {
  checkFrontEnd(frontEnd);
  const re = new Float64Array(freqs_Hz.length).fill(1);
  const im = new Float64Array(freqs_Hz.length);
  const factors: ComplexArray[] = [];
  if (frontEnd.txPackage !== undefined) factors.push(packageTransfer(frontEnd.txPackage, freqs_Hz, "tx"));
  if (frontEnd.rxPackage !== undefined) factors.push(packageTransfer(frontEnd.rxPackage, freqs_Hz, "rx"));
  if (frontEnd.rxBandwidth_Hz !== undefined) factors.push(receiverFilter(frontEnd.rxBandwidth_Hz, freqs_Hz));
  for (const h of factors) {
    for (let k = 0; k < re.length; k++) {
      const r = re[k] * h.re[k] - im[k] * h.im[k];
      im[k] = re[k] * h.im[k] + im[k] * h.re[k];
      re[k] = r;
    }
  }
  return { re, im };
}

/**
 * The pulse through the front end ({@link frontEndTransfer}), filtered on a zero-padded FFT grid (a
 * linear convolution): a fresh pulse `DEFAULT_TAIL_UI` UIs longer, `mainIndex` at its peak. A neutral
 * front end returns the pulse itself.
 *
 * @param pulse - a pulse response (volts for a 1 V symbol).
 * @param frontEnd - packages and bandwidth filter.
 */
export function applyFrontEnd(pulse: Pulse, frontEnd: FrontEnd | undefined): Pulse {
  if (frontEnd === undefined || isNeutralFrontEnd(frontEnd)) return pulse;
  const { fft, spectrum, freqs_Hz, outLength } = paddedSpectrum(pulse, DEFAULT_TAIL_UI);
  const h = frontEndTransfer(frontEnd, freqs_Hz);
  const re = new Float64Array(freqs_Hz.length);
  const im = new Float64Array(freqs_Hz.length);
  for (let k = 0; k < re.length; k++) {
    re[k] = spectrum.re[k] * h.re[k] - spectrum.im[k] * h.im[k];
    im[k] = spectrum.re[k] * h.im[k] + spectrum.im[k] * h.re[k];
  }
  const values_V = fft.realInverse({ re, im }).slice(0, outLength);
  return { ui_s: pulse.ui_s, samplesPerUi: pulse.samplesPerUi, values_V, mainIndex: peakIndex(values_V) };
}

/**
 * Loss of the front end at `freq_Hz` in dB (`−20·log10|H|`, ≥ 0 for passive pieces): e.g. the
 * packages' share of a link's loss at Nyquist.
 */
export function frontEndLoss_dB(frontEnd: FrontEnd, freq_Hz: number): number {
  const h = frontEndTransfer(frontEnd, [freq_Hz]);
  return -10 * Math.log10(h.re[0] * h.re[0] + h.im[0] * h.im[0]);
}
