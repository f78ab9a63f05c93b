// S21 data on any frequency grid → the spectrum on the bins of a real FFT, with a real DC bin.
import type { ComplexArray } from "../signal/fftPlan.ts";
import { interpolateLinear } from "../signal/interpolateLinear.ts";
import { raisedCosineRolloff } from "../signal/windows.ts";

/** The spectrum on FFT bins, and how its DC point was obtained. */
export interface FftGridSpectrum {
  /** Bins k = 0 … size/2 at `k/(size·dt_s)` Hz (zero above the data's top frequency). */
  readonly spectrum: ComplexArray;
  /** True when the data have no 0 Hz point and the DC bin was extrapolated. */
  readonly dcExtrapolated: boolean;
}

/**
 * Interpolates magnitude and unwrapped phase of S21 onto the bins of a real FFT of length `size`
 * with time step `dt_s`, rolls off the top `taperFraction` of the band with a raised cosine and sets
 * zero above it. Only the DC bin is made real: a measured 0 Hz point keeps its magnitude and takes
 * the nearest multiple of π as its phase (the other bins keep their measured phase); a missing one
 * is extrapolated from the first two points (magnitude linear in f, unwrapped phase linear in f
 * rounded to 0 or π). A real signal's spectrum is real at DC; rotating every bin by the DC point's
 * phase instead would shift the whole response in time.
 *
 * @param freqs_Hz - ascending frequencies in Hz (≥ 0), at least 2 (checked by the caller).
 * @param s21 - S21 at those frequencies (a delay τ is `exp(−i2πfτ)`).
 * @param size - FFT length (a power of two).
 * @param dt_s - time step in seconds.
 * @param taperFraction - fraction of the usable band rolled off at its top, in [0, 1].
 */
export function s21OnFftGrid(
  freqs_Hz: Float64Array,
  s21: ComplexArray,
  size: number,
  dt_s: number,
  taperFraction: number,
): FftGridSpectrum {
  const count = freqs_Hz.length;
  const mag = new Float64Array(count);
  const phase = new Float64Array(count);
  for (let i = 0; i < count; i++) {
    mag[i] = Math.hypot(s21.re[i], s21.im[i]);
    const raw = Math.atan2(s21.im[i], s21.re[i]);
    if (i === 0) phase[i] = raw;
    else {
      let d = raw - (phase[i - 1] % (2 * Math.PI));
      d -= 2 * Math.PI * Math.round(d / (2 * Math.PI));
      phase[i] = phase[i - 1] + d;
    }
  }
  let f = freqs_Hz;
  let m = mag;
  let ph = phase;
  const dcExtrapolated = freqs_Hz[0] !== 0;
  if (!dcExtrapolated) {
    ph[0] = Math.PI * Math.round(phase[0] / Math.PI);
  } else {
    const [f0, f1] = [freqs_Hz[0], freqs_Hz[1]];
    const m0 = Math.max(0, mag[0] - (f0 * (mag[1] - mag[0])) / (f1 - f0));
    let p0 = phase[0] - (f0 * (phase[1] - phase[0])) / (f1 - f0);
    const turns = Math.round(p0 / (2 * Math.PI));
    p0 -= 2 * Math.PI * turns;
    const dcPhase = Math.abs(p0) <= Math.PI / 2 ? 0 : Math.sign(p0) * Math.PI;
    f = new Float64Array(count + 1);
    m = new Float64Array(count + 1);
    ph = new Float64Array(count + 1);
    f.set(freqs_Hz, 1);
    m.set(mag, 1);
    m[0] = m0;
    for (let i = 0; i < count; i++) ph[i + 1] = phase[i] - 2 * Math.PI * turns;
    ph[0] = dcPhase;
  }
  const half = size / 2 + 1;
  const df = 1 / (size * dt_s);
  const top = Math.min(freqs_Hz[count - 1], 1 / (2 * dt_s));
  const used = Math.min(half, Math.floor(top / df) + 1);
  const gridF = Float64Array.from({ length: used }, (_, k) => k * df);
  const gm = interpolateLinear(f, m, gridF);
  const gp = interpolateLinear(f, ph, gridF);
  const re = new Float64Array(half);
  const im = new Float64Array(half);
  for (let k = 0; k < used; k++) {
    const w = raisedCosineRolloff(gridF[k], top * (1 - taperFraction), top);
    re[k] = w * gm[k] * Math.cos(gp[k]);
    im[k] = w * gm[k] * Math.sin(gp[k]);
  }
  im[0] = 0;
  return { spectrum: { re, im }, dcExtrapolated };
}
