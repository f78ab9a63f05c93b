// A minimum-phase spectrum from its log-magnitude: the causal filter with a prescribed gain curve.
import { FftPlan, type ComplexArray } from "./fftPlan.ts";

/**
 * The minimum-phase spectrum `G = exp(C)` whose log-magnitude is `logMagnitude` (natural log of
 * |G|, bins 0 … N/2 of a real FFT of length `size`): the real cepstrum of the log-magnitude is
 * folded onto positive quefrencies (c[0], 2·c[1 … N/2−1], c[N/2]) and transformed back, so
 * `Re C = ln|G|` exactly and `Im C` is the unwrapped minimum phase (radians). The filter it
 * describes is causal up to the cepstrum's aliasing, small when the curve is smooth and N large.
 *
 * @param logMagnitude - ln|G| at bins k = 0 … size/2 (finite), length size/2 + 1.
 * @param size - the FFT length N (a power of two ≥ 4).
 * @returns the half spectrum (bins 0 … N/2) with `phase_rad` the unwrapped phase `Im C`.
 * @see Oppenheim & Schafer, *Discrete-Time Signal Processing*, 3rd ed., §13 (homomorphic
 *   deconvolution: the minimum-phase sequence from the folded real cepstrum).
 */
export function minimumPhaseSpectrum(
  logMagnitude: Float64Array,
  size: number,
): ComplexArray & { readonly phase_rad: Float64Array } {
  if (!Number.isInteger(size) || size < 4 || (size & (size - 1)) !== 0) {
    throw new RangeError(`size must be a power of two ≥ 4, got ${String(size)}`);
  }
  const half = size / 2 + 1;
  if (!(logMagnitude instanceof Float64Array) || logMagnitude.length !== half) {
    throw new RangeError(`logMagnitude must be a Float64Array of ${half} bins (0 … size/2)`);
  }
  for (let k = 0; k < half; k++) {
    if (!Number.isFinite(logMagnitude[k])) throw new RangeError(`logMagnitude[${k}] must be finite`);
  }
  const plan = new FftPlan(size);
  // Real, even log-magnitude → real, even cepstrum.
  const cepstrum = plan.realInverse({ re: logMagnitude, im: new Float64Array(half) });
  const folded = new Float64Array(size);
  folded[0] = cepstrum[0];
  for (let n = 1; n < size / 2; n++) folded[n] = 2 * cepstrum[n];
  folded[size / 2] = cepstrum[size / 2];
  const c = plan.realForward(folded);
  const re = new Float64Array(half);
  const im = new Float64Array(half);
  for (let k = 0; k < half; k++) {
    const a = Math.exp(logMagnitude[k]);
    re[k] = a * Math.cos(c.im[k]);
    im[k] = a * Math.sin(c.im[k]);
  }
  return { re, im, phase_rad: c.im };
}
