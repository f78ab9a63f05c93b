// The receiver's bandwidth: a 4th-order Butterworth low-pass, the front-end filter of IEEE 802.3 Annex 93A.
import type { ComplexArray } from "../signal/fftPlan.ts";

/**
 * Writes `H_r(f)` of the 4th-order Butterworth filter with −3 dB frequency `bandwidth_Hz` into
 * `out[0]` (re) and `out[1]` (im): with `x = f/f_r`,
 * `H_r = 1 / (1 − 3.414214·x² + x⁴ + i·2.613126·(x − x³))`, so `|H_r|² = 1/(1 + x⁸)`.
 * The caller has checked `bandwidth_Hz`.
 */
export function receiverFilterAt(bandwidth_Hz: number, f: number, out: Float64Array): void {
  const x = f / bandwidth_Hz;
  const x2 = x * x;
  const dr = 1 - 3.414213562373095 * x2 + x2 * x2;
  const di = 2.613125929752753 * (x - x2 * x);
  const den = dr * dr + di * di;
  out[0] = dr / den;
  out[1] = -di / den;
}

/**
 * Complex response of the receiver's bandwidth filter, a 4th-order Butterworth low-pass
 * (unit DC gain, −3.010 dB at `bandwidth_Hz`, causal: its poles lie in the left half-plane).
 *
 * @param bandwidth_Hz - −3 dB frequency in Hz (> 0); IEEE 802.3 uses `f_r = 0.75·f_b`.
 * @param freqs_Hz - frequencies in Hz (≥ 0).
 * @see IEEE 802.3, Annex 93A, eq. 93A-20 (the receiver noise filter) [memory: recalled, not re-read];
 *   Butterworth polynomial of order 4: `s⁴ + 2.613126·s³ + 3.414214·s² + 2.613126·s + 1`.
 */
export function receiverFilter(bandwidth_Hz: number, freqs_Hz: ArrayLike<number>): ComplexArray {
  if (!(Number.isFinite(bandwidth_Hz) && bandwidth_Hz > 0)) {
    throw new RangeError(`bandwidth_Hz must be a finite number > 0, got ${String(bandwidth_Hz)}`);
  }
  const re = new Float64Array(freqs_Hz.length);
  const im = new Float64Array(freqs_Hz.length);
  const h = new Float64Array(2);
  for (let k = 0; k < freqs_Hz.length; k++) {
    const f = freqs_Hz[k];
    if (!(Number.isFinite(f) && f >= 0))
      throw new RangeError(`freqs_Hz[${k}] must be a finite number ≥ 0, got ${String(f)}`);
    receiverFilterAt(bandwidth_Hz, f, h);
    re[k] = h[0];
    im[k] = h[1];
  }
  return { re, im };
}
