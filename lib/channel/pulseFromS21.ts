// Pulse response of a channel measured in the frequency domain (S21 or SDD21 on any frequency grid).
import type { MagnitudeCurve } from "../types.ts";
import { magnitudeDb } from "../signal/decibels.ts";
import { nextPowerOfTwo, type ComplexArray } from "../signal/fftPlan.ts";
import { interpolateLinear } from "../signal/interpolateLinear.ts";
import { raisedCosineRolloff } from "../signal/windows.ts";
import { checkPulseGrid, type PulseGrid, type PulseWithTime } from "./pulseFromSamples.ts";
import { MAX_CHANNEL_FFT, pulseFromSpectrum, type SpectrumPulseOptions } from "./pulseFromSpectrum.ts";

/** Options of {@link pulseFromS21}. */
export interface S21PulseOptions extends PulseGrid, SpectrumPulseOptions {
  /** Fraction of the usable band, at its top, rolled off with a raised cosine (default 0.1). */
  readonly taperFraction?: number;
  /** Shortest time window in UIs (default 64); the window is at least 1/Δf of the data. */
  readonly minWindow_UI?: number;
}

/** A pulse from frequency-domain data, with the insertion loss for plotting. */
export interface FrequencyPulse extends PulseWithTime {
  /** `20·log10|S21|` in dB at the data's frequencies (≤ 0 for a passive channel; floored at −400 dB). */
  readonly insertionLoss: MagnitudeCurve;
}

/**
 * Pulse response from S21 samples: a DC point extrapolated from the low-frequency trend (real;
 * magnitude linear in f, unwrapped phase linear in f rounded to 0 or π at DC), interpolation of
 * magnitude and unwrapped phase onto a uniform grid `k·Δf` (Δf no coarser than the data's mean
 * spacing, so the impulse response does not wrap around), a raised-cosine taper over the top of
 * the band against truncation ringing, zero above it, then {@link pulseFromSpectrum} (rise-time
 * filter, Hermitian extension and real IFFT, step, pulse). The delay is kept.
 *
 * @param freqs_Hz - ascending frequencies in Hz (≥ 0), at least 2.
 * @param s21 - S21 at those frequencies (engineering convention: a delay τ is `exp(−i2πfτ)`).
 * @param options - target grid and shaping.
 */
export function pulseFromS21(freqs_Hz: Float64Array, s21: ComplexArray, options: S21PulseOptions): FrequencyPulse {
  checkPulseGrid(options);
  const count = freqs_Hz.length;
  if (count < 2) throw new RangeError(`freqs_Hz must hold at least 2 frequencies, got ${count}`);
  if (s21.re.length !== count || s21.im.length !== count) throw new RangeError(`s21 must hold ${count} values (one per frequency)`);
  for (let i = 0; i < count; i++) {
    if (!Number.isFinite(freqs_Hz[i]) || freqs_Hz[i] < 0) throw new RangeError(`freqs_Hz[${i}] must be a finite number ≥ 0`);
    if (i > 0 && !(freqs_Hz[i] > freqs_Hz[i - 1])) throw new RangeError(`freqs_Hz must ascend strictly (freqs_Hz[${i}])`);
    if (!Number.isFinite(s21.re[i]) || !Number.isFinite(s21.im[i])) throw new RangeError(`s21[${i}] must be finite`);
  }
  const taper = options.taperFraction ?? 0.1;
  if (!(taper >= 0 && taper <= 1)) throw new RangeError(`taperFraction must be in [0, 1], got ${String(taper)}`);
  const minWindow = options.minWindow_UI ?? 64;
  if (!Number.isInteger(minWindow) || minWindow < 1) throw new RangeError(`minWindow_UI must be an integer ≥ 1, got ${String(minWindow)}`);

  // Magnitude and unwrapped phase of the data.
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
  // The DC point: measured, or extrapolated from the first two points.
  let f: Float64Array;
  let m: Float64Array;
  let ph: Float64Array;
  if (freqs_Hz[0] === 0) {
    f = freqs_Hz;
    m = mag;
    ph = phase;
    const shift = s21.re[0] >= 0 ? -phase[0] : Math.PI - phase[0];
    for (let i = 0; i < count; i++) ph[i] += shift;
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

  // The FFT grid: time step from the pulse grid, window from the data's frequency spacing.
  const spu = options.samplesPerUi;
  const dt = options.ui_s / spu;
  const fMax = freqs_Hz[count - 1];
  const spacing = (fMax - freqs_Hz[0]) / (count - 1);
  const window_s = Math.max(1 / spacing, minWindow * options.ui_s);
  const size = nextPowerOfTwo(Math.ceil(window_s / dt));
  if (size > MAX_CHANNEL_FFT) {
    throw new RangeError(
      `the data's ${spacing} Hz spacing at samplesPerUi ${spu} needs an FFT of ${size} points (at most ${MAX_CHANNEL_FFT}); use fewer samples per UI`,
    );
  }
  const half = size / 2 + 1;
  const df = 1 / (size * dt);
  const top = Math.min(fMax, 1 / (2 * dt));
  const used = Math.min(half, Math.floor(top / df) + 1);
  const gridF = Float64Array.from({ length: used }, (_, k) => k * df);
  const gm = interpolateLinear(f, m, gridF);
  const gp = interpolateLinear(f, ph, gridF);
  const re = new Float64Array(half);
  const im = new Float64Array(half);
  for (let k = 0; k < used; k++) {
    const w = raisedCosineRolloff(gridF[k], top * (1 - taper), top);
    re[k] = w * gm[k] * Math.cos(gp[k]);
    im[k] = w * gm[k] * Math.sin(gp[k]);
  }
  const { pulse, start_s } = pulseFromSpectrum({ re, im }, size, options, options);
  const magnitude_dB = magnitudeDb(s21.re, s21.im);
  return { pulse, start_s, insertionLoss: { freqs_Hz: Float64Array.from(freqs_Hz), magnitude_dB } };
}
