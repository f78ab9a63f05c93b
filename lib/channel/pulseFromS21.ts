// Pulse response of a channel measured in the frequency domain (S21 or SDD21 on any frequency grid).
import type { MagnitudeCurve } from "../types.ts";
import { magnitudeDb } from "../signal/decibels.ts";
import { nextPowerOfTwo, type ComplexArray } from "../signal/fftPlan.ts";
import type { ChannelWarning } from "./channelWarning.ts";
import { s21OnFftGrid } from "./s21OnFftGrid.ts";
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

/** A pulse from S21 data, with what the data could not support. */
export interface S21Pulse extends FrequencyPulse {
  /** True when the data had no 0 Hz point and S21(0) was extrapolated. */
  readonly dcExtrapolated: boolean;
  /** The FFT's time window in seconds (at least 1/Δf of the data). */
  readonly window_s: number;
  /** Findings a designer should act on: a window too short for the response, data that stop below the baud rate. */
  readonly warnings: ChannelWarning[];
}

/**
 * Pulse response from S21 samples: the spectrum on a uniform grid `k·Δf` ({@link s21OnFftGrid}:
 * magnitude and unwrapped phase interpolated, only the DC bin made real, a raised-cosine taper over
 * the top of the band, zero above it), then {@link pulseFromSpectrum} (rise-time filter, Hermitian
 * extension and real IFFT, step, pulse). The delay is kept. The time window is at least 1/Δf of the
 * data and `minWindow_UI`; a pulse that has not died out by the window's end (more than 1e-6 of its
 * energy in the window's last tenth: delay plus ring-down longer than the data's 1/Δf, so its tail
 * wraps onto its start) gives a `window-short` warning. Data that stop below the baud rate give a `band-below-baud` warning: above the data S21 is
 * taken as zero, so the file, not the channel, limits the pulse's bandwidth.
 *
 * @param freqs_Hz - ascending frequencies in Hz (≥ 0), at least 2.
 * @param s21 - S21 at those frequencies (engineering convention: a delay τ is `exp(−i2πfτ)`).
 * @param options - target grid and shaping.
 */
export function pulseFromS21(freqs_Hz: Float64Array, s21: ComplexArray, options: S21PulseOptions): S21Pulse {
  checkPulseGrid(options);
  const count = freqs_Hz.length;
  if (count < 2) throw new RangeError(`freqs_Hz must hold at least 2 frequencies, got ${count}`);
  if (s21.re.length !== count || s21.im.length !== count)
    throw new RangeError(`s21 must hold ${count} values (one per frequency)`);
  for (let i = 0; i < count; i++) {
    if (!Number.isFinite(freqs_Hz[i]) || freqs_Hz[i] < 0)
      throw new RangeError(`freqs_Hz[${i}] must be a finite number ≥ 0`);
    if (i > 0 && !(freqs_Hz[i] > freqs_Hz[i - 1]))
      throw new RangeError(`freqs_Hz must ascend strictly (freqs_Hz[${i}])`);
    if (!Number.isFinite(s21.re[i]) || !Number.isFinite(s21.im[i])) throw new RangeError(`s21[${i}] must be finite`);
  }
  const taper = options.taperFraction ?? 0.1;
  if (!(taper >= 0 && taper <= 1)) throw new RangeError(`taperFraction must be in [0, 1], got ${String(taper)}`);
  const minWindow = options.minWindow_UI ?? 64;
  if (!Number.isInteger(minWindow) || minWindow < 1)
    throw new RangeError(`minWindow_UI must be an integer ≥ 1, got ${String(minWindow)}`);

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
  // The window must hold the delay and the ring-down: a response still ringing when the window ends
  // wraps its tail onto its start. Widening the FFT beyond 1/Δf cannot help (interpolating data
  // spaced Δf repeats the response every 1/Δf), so the remedy is finer data: warn.
  const { spectrum, dcExtrapolated } = s21OnFftGrid(freqs_Hz, s21, size, dt, taper);
  const { pulse, start_s } = pulseFromSpectrum(spectrum, size, options, options);
  const warnings: ChannelWarning[] = [];
  if (tailEnergyShare(pulse.values_V, size) > TAIL_ENERGY_LIMIT) {
    const window = size * dt;
    const peak_s = start_s + pulse.mainIndex * dt;
    warnings.push({
      code: "window-short",
      message:
        `the response has not died out within the ${formatTime(window)} time window that the data's ${formatFreq(spacing)} frequency step allows ` +
        `(its peak is at ${formatTime(peak_s)}): its tail wraps onto its start; use data with a frequency step of at most ${formatFreq(1 / (2 * window))}`,
    });
  }
  const baud_Hz = 1 / options.ui_s;
  if (fMax < baud_Hz) {
    warnings.push({
      code: "band-below-baud",
      message:
        `the data stop at ${formatFreq(fMax)}, ${(fMax / baud_Hz).toFixed(2)}× the baud rate: the pulse is band-limited by the file, not the channel ` +
        `(S21 is taken as zero above ${formatFreq(fMax)}, rolled off over its top ${Math.round(taper * 100)} %); use data that reach at least the baud rate (${formatFreq(baud_Hz)})`,
    });
  }
  const magnitude_dB = magnitudeDb(s21.re, s21.im);
  return {
    pulse,
    start_s,
    insertionLoss: { freqs_Hz: Float64Array.from(freqs_Hz), magnitude_dB },
    dcExtrapolated,
    window_s: size * dt,
    warnings,
  };
}

/**
 * Largest share of the pulse's energy allowed in the window's last tenth (−60 dB): more means the
 * response is still ringing where the periodic FFT wraps it onto its start.
 */
const TAIL_ENERGY_LIMIT = 1e-6;

/** Share of the energy of the pulse's first `size` samples that lies in their last tenth. */
function tailEnergyShare(values_V: Float64Array, size: number): number {
  let total = 0;
  let tail = 0;
  const from = Math.floor(0.9 * size);
  for (let i = 0; i < Math.min(values_V.length, size); i++) {
    total += values_V[i] * values_V[i];
    if (i >= from) tail += values_V[i] * values_V[i];
  }
  return total > 0 ? tail / total : 0;
}

function formatFreq(f_Hz: number): string {
  return f_Hz >= 1e9 ? `${+(f_Hz / 1e9).toPrecision(3)} GHz` : `${+(f_Hz / 1e6).toPrecision(3)} MHz`;
}

function formatTime(t_s: number): string {
  return `${+(t_s * 1e9).toPrecision(3)} ns`;
}
