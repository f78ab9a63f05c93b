// Integrated crosstalk noise (ICN): the rms crosstalk a link budget books from the aggressors'
// coupling spectra, weighted by the aggressors' transmit spectra and the receiver's filter.
import type { ComplexArray } from "../signal/fftPlan.ts";
import { type AggressorKind, checkAggressorKind } from "./aggressorKind.ts";

/** One aggressor's crosstalk transfer on the shared frequency grid and its transmitter's amplitude. */
export interface IcnAggressor {
  readonly kind: AggressorKind;
  /** Crosstalk transfer (mixed-mode, like SDD21) at each frequency of the grid. */
  readonly transfer: ComplexArray;
  /** Peak amplitude of the aggressor's transmitter `A` in volts (half its peak-to-peak swing). */
  readonly amplitude_V: number;
}

/** Options of {@link integratedCrosstalkNoise}. */
export interface IcnOptions {
  /** Symbol rate `f_b` in Hz. */
  readonly baud_Hz: number;
  /** 3 dB frequency of the NEXT aggressors' transmit filter `f_nt` (default `f_b/4`). */
  readonly nextEdge_Hz?: number;
  /** 3 dB frequency of the FEXT aggressors' transmit filter `f_ft` (default `f_b/4`). */
  readonly fextEdge_Hz?: number;
  /** 3 dB frequency of the receiver's filter `f_r` (default `0.75·f_b`). */
  readonly receiver_Hz?: number;
}

/** ICN in volts rms: all aggressors, NEXT and FEXT apart, and each one alone. */
export interface IcnResult {
  readonly rms_V: number;
  readonly next_V: number;
  readonly fext_V: number;
  readonly perAggressor_V: number[];
}

const sinc = (x: number) => (x === 0 ? 1 : Math.sin(Math.PI * x) / (Math.PI * x));

/**
 * Integrated crosstalk noise: with the aggressor's weighting
 * `W(f) = (A²/f_b)·sinc²(f/f_b)·[1/(1 + (f/f_t)⁴)]·[1/(1 + (f/f_r)⁸)]` (`f_t` = `f_nt` or `f_ft`),
 * `σ_x² = 2·Δf·Σ_n W(f_n)·10^(−MDXT(f_n)/10)` over the grid's frequencies, where the multi-disturber
 * loss sums the aggressors' powers, `10^(−MDXT/10) = Σ_i |X_i|²`; `σ_nx` over the NEXT aggressors,
 * `σ_fx` over the FEXT ones, `σ_x = √(σ_nx² + σ_fx²)`. Each aggressor here has its own amplitude; with
 * equal amplitudes this is the clause's formula.
 *
 * @param freqs_Hz - a uniform frequency grid (step Δf), Hz.
 * @param aggressors - their kinds, transfers on the grid and amplitudes.
 * @param options - symbol rate and the filters' corners.
 * @see IEEE 802.3, Annex 85A (the integrated crosstalk noise of the cable assembly: W_nt, W_ft, σ_nx,
 *   σ_fx, σ_x) and the same form in Annex 69B.4.6 (backplane) [memory: recalled, not re-read — the
 *   sub-clause numbers and the default corners f_nt = f_ft = f_b/4, f_r = 0.75·f_b are from memory].
 */
export function integratedCrosstalkNoise(freqs_Hz: Float64Array, aggressors: readonly IcnAggressor[], options: IcnOptions): IcnResult {
  const count = freqs_Hz.length;
  if (count < 2) throw new RangeError(`freqs_Hz must hold at least 2 frequencies, got ${count}`);
  const df = (freqs_Hz[count - 1] - freqs_Hz[0]) / (count - 1);
  if (!(df > 0)) throw new RangeError("freqs_Hz must ascend");
  for (let k = 0; k < count; k++) {
    const want = freqs_Hz[0] + k * df;
    if (!(Number.isFinite(freqs_Hz[k]) && freqs_Hz[k] >= 0) || Math.abs(freqs_Hz[k] - want) > 1e-3 * df) {
      throw new RangeError(`freqs_Hz must be a uniform grid ≥ 0 (step ${df} Hz); freqs_Hz[${k}] = ${freqs_Hz[k]} is off it — resample first`);
    }
  }
  const fb = options.baud_Hz;
  if (!(Number.isFinite(fb) && fb > 0)) throw new RangeError(`baud_Hz must be a finite number > 0, got ${String(fb)}`);
  const corner = (v: number | undefined, dflt: number, name: string) => {
    const x = v ?? dflt;
    if (!(Number.isFinite(x) && x > 0)) throw new RangeError(`${name} must be a finite number > 0, got ${String(x)}`);
    return x;
  };
  const fnt = corner(options.nextEdge_Hz, fb / 4, "nextEdge_Hz");
  const fft = corner(options.fextEdge_Hz, fb / 4, "fextEdge_Hz");
  const fr = corner(options.receiver_Hz, 0.75 * fb, "receiver_Hz");
  const per = aggressors.map((a, i) => {
    checkAggressorKind(a.kind, `aggressors[${i}].kind`);
    if (a.transfer.re.length !== count || a.transfer.im.length !== count) throw new RangeError(`aggressors[${i}].transfer must hold ${count} values`);
    if (!(Number.isFinite(a.amplitude_V) && a.amplitude_V >= 0)) throw new RangeError(`aggressors[${i}].amplitude_V must be a finite number ≥ 0`);
    const ft = a.kind === "next" ? fnt : fft;
    let sum = 0;
    for (let k = 0; k < count; k++) {
      const f = freqs_Hz[k];
      const s = sinc(f / fb);
      const w = ((a.amplitude_V * a.amplitude_V) / fb) * s * s * (1 / (1 + (f / ft) ** 4)) * (1 / (1 + (f / fr) ** 8));
      const x2 = a.transfer.re[k] * a.transfer.re[k] + a.transfer.im[k] * a.transfer.im[k];
      if (!Number.isFinite(x2)) throw new RangeError(`aggressors[${i}].transfer holds a value that is not finite`);
      sum += w * x2;
    }
    return 2 * df * sum;
  });
  let next = 0;
  let fext = 0;
  per.forEach((v, i) => {
    if (aggressors[i].kind === "next") next += v;
    else fext += v;
  });
  return { rms_V: Math.sqrt(next + fext), next_V: Math.sqrt(next), fext_V: Math.sqrt(fext), perAggressor_V: per.map(Math.sqrt) };
}
