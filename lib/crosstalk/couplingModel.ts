// Synthetic crosstalk between two weakly coupled lines: the published near-end (backward) and
// far-end (forward) coupling forms, on the synthetic line of lib/channel/lossModel.
import { type LossModel, lossModelS21 } from "../channel/lossModel.ts";
import { checkPulseGrid, type PulseGrid } from "../channel/pulseFromSamples.ts";
import { MAX_CHANNEL_FFT, pulseFromSpectrum } from "../channel/pulseFromSpectrum.ts";
import { magnitudeDb } from "../signal/decibels.ts";
import { type ComplexArray, nextPowerOfTwo } from "../signal/fftPlan.ts";
import { raisedCosineRolloff } from "../signal/windows.ts";
import type { FrequencyPulse } from "../channel/pulseFromS21.ts";

/**
 * A synthetic aggressor. NEXT: the backward coupling coefficient `K_b = ¼(C_m/C + L_m/L)` over a
 * coupled section whose one-way loss and delay `line` gives. FEXT: the forward coupling
 * `K_f·T_D = ½(C_m/C − L_m/L)·ℓ/v` in seconds (signed; 0 in a homogeneous stripline) along a link
 * whose loss and delay `line` gives (usually the victim's own line).
 */
export type CouplingModel =
  | { readonly kind: "next"; readonly backwardCoefficient: number; readonly line: LossModel }
  | { readonly kind: "fext"; readonly forwardCoupling_s: number; readonly line: LossModel };

/** Throws RangeError naming the field unless `model` is usable. */
export function checkCouplingModel(model: CouplingModel, name = "coupling"): void {
  if (model === null || typeof model !== "object") throw new TypeError(`${name} must be a coupling model`);
  if (model.kind === "next") {
    const k = model.backwardCoefficient;
    if (!(Number.isFinite(k) && k >= 0 && k <= 0.5))
      throw new RangeError(`${name}.backwardCoefficient must be a number 0…0.5, got ${String(k)}`);
  } else if (model.kind === "fext") {
    const k = model.forwardCoupling_s;
    if (!(Number.isFinite(k) && Math.abs(k) <= 1e-9))
      throw new RangeError(`${name}.forwardCoupling_s must be a number within ±1e-9 s, got ${String(k)}`);
  } else {
    throw new RangeError(`${name}.kind must be "next" or "fext", got ${String((model as { kind: unknown }).kind)}`);
  }
  if (model.line === null || typeof model.line !== "object") throw new TypeError(`${name}.line must be a loss model`);
}

/**
 * Crosstalk transfer function of the weak-coupling forms, with `H(f)` the line's one-way transfer
 * ({@link lossModelS21}):
 * - NEXT `X(f) = K_b·(1 − H(f)²)`: the backward waves launched along the section return over the round
 *   trip, so a long (or lossy) section saturates at `K_b` and the time response is `K_b·[v(t) − v(t − 2T_D)]`;
 * - FEXT `X(f) = −i2πf·K_f·T_D·H(f)`: the forward wave grows with the coupled length and the edge rate,
 *   `−K_f·T_D·dv/dt` delayed by the line.
 *
 * @param model - the coupling.
 * @param freqs_Hz - frequencies in Hz (≥ 0).
 * @param nyquist_Hz - where the line's loss is given.
 * @see C. R. Paul, *Analysis of Multiconductor Transmission Lines*, 2nd ed., the weak-coupling
 *   (inductive–capacitive) crosstalk model [memory: recalled, not re-read]; E. Bogatin, *Signal and Power
 *   Integrity — Simplified*, near-end and far-end noise coefficients [memory: recalled, not re-read].
 */
export function couplingTransfer(model: CouplingModel, freqs_Hz: ArrayLike<number>, nyquist_Hz: number): ComplexArray {
  checkCouplingModel(model);
  const h = lossModelS21(freqs_Hz, model.line, nyquist_Hz);
  const re = new Float64Array(freqs_Hz.length);
  const im = new Float64Array(freqs_Hz.length);
  for (let k = 0; k < re.length; k++) {
    if (model.kind === "next") {
      const h2r = h.re[k] * h.re[k] - h.im[k] * h.im[k];
      const h2i = 2 * h.re[k] * h.im[k];
      re[k] = model.backwardCoefficient * (1 - h2r);
      im[k] = -model.backwardCoefficient * h2i;
    } else {
      const w = -2 * Math.PI * freqs_Hz[k] * model.forwardCoupling_s; // X = i·w·H
      re[k] = -w * h.im[k];
      im[k] = w * h.re[k];
    }
  }
  return { re, im };
}

/**
 * The crosstalk pulse of a synthetic aggressor (response at the victim's receiver to one 1 V symbol of
 * the aggressor), with its transfer from DC to the baud rate (201 points) for plotting.
 */
export function pulseFromCoupling(model: CouplingModel, grid: PulseGrid): FrequencyPulse {
  checkPulseGrid(grid);
  checkCouplingModel(model);
  const spu = grid.samplesPerUi;
  const dt = grid.ui_s / spu;
  const nyquist = 1 / (2 * grid.ui_s);
  const delay = model.line.delay_s ?? 0;
  const window_s = Math.max(1024 * grid.ui_s, 4 * delay + 512 * grid.ui_s);
  const size = nextPowerOfTwo(Math.ceil(window_s / dt));
  if (size > MAX_CHANNEL_FFT)
    throw new RangeError(
      `the line's delay_s and samplesPerUi need an FFT of ${size} points (at most ${MAX_CHANNEL_FFT})`,
    );
  const half = size / 2 + 1;
  const freqs = Float64Array.from({ length: half }, (_, k) => k / (size * dt));
  const x = couplingTransfer(model, freqs, nyquist);
  const top = freqs[half - 1];
  for (let k = 0; k < half; k++) {
    const w = raisedCosineRolloff(freqs[k], 0.9 * top, top);
    x.re[k] *= w;
    x.im[k] *= w;
  }
  const { pulse, start_s } = pulseFromSpectrum(x, size, grid);
  const plotF = Float64Array.from({ length: 201 }, (_, i) => (i * 2 * nyquist) / 200);
  const plotX = couplingTransfer(model, plotF, nyquist);
  return { pulse, start_s, insertionLoss: { freqs_Hz: plotF, magnitude_dB: magnitudeDb(plotX.re, plotX.im) } };
}
