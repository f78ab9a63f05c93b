// Frequency response of a symbol-spaced FIR, referenced to its main tap.
import { DB_FLOOR } from "../signal/decibels.ts";
import { checkTaps } from "./checkTaps.ts";

/** A complex frequency response with its magnitude and phase. */
export interface FrequencyResponse {
  readonly re: Float64Array;
  readonly im: Float64Array;
  readonly magnitude_dB: Float64Array;
  readonly phase_rad: Float64Array;
}

/**
 * `H(f) = Σ_j c[j]·exp(−i·2π·f·(j − pre)·ui_s)` on the given frequencies (the main tap has zero delay).
 *
 * @param taps - coefficients, main tap `taps[pre]`.
 * @param pre - number of pre-cursor taps.
 * @param ui_s - unit interval in seconds (> 0).
 * @param freqs_Hz - frequencies in Hz.
 * @returns real/imaginary parts, `20·log10|H|` in dB (floored at −400 dB, an exact zero) and `arg H` in rad.
 */
export function firResponse(
  taps: ArrayLike<number>,
  pre: number,
  ui_s: number,
  freqs_Hz: ArrayLike<number>,
): FrequencyResponse {
  checkTaps(taps, pre);
  if (!(ui_s > 0) || !Number.isFinite(ui_s))
    throw new RangeError(`ui_s must be a finite number > 0, got ${String(ui_s)}`);
  const n = freqs_Hz.length;
  const re = new Float64Array(n);
  const im = new Float64Array(n);
  const magnitude_dB = new Float64Array(n);
  const phase_rad = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    const f = freqs_Hz[k];
    if (!Number.isFinite(f)) throw new RangeError(`freqs_Hz[${k}] must be finite, got ${String(f)}`);
    let sr = 0;
    let si = 0;
    for (let j = 0; j < taps.length; j++) {
      const a = -2 * Math.PI * f * (j - pre) * ui_s;
      sr += taps[j] * Math.cos(a);
      si += taps[j] * Math.sin(a);
    }
    re[k] = sr;
    im[k] = si;
    magnitude_dB[k] = Math.max(DB_FLOOR, 10 * Math.log10(sr * sr + si * si));
    phase_rad[k] = Math.atan2(si, sr);
  }
  return { re, im, magnitude_dB, phase_rad };
}
