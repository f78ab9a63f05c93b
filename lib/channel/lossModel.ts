// A synthetic lossy line: skin (√f) and dielectric (f) loss with causal phase, plus a delay.
import { magnitudeDb } from "../signal/decibels.ts";
import type { ComplexArray } from "../signal/fftPlan.ts";
import { nextPowerOfTwo } from "../signal/fftPlan.ts";
import { raisedCosineRolloff } from "../signal/windows.ts";
import { checkPulseGrid, type PulseGrid } from "./pulseFromSamples.ts";
import type { FrequencyPulse } from "./pulseFromS21.ts";
import { MAX_CHANNEL_FFT, pulseFromSpectrum, type SpectrumPulseOptions } from "./pulseFromSpectrum.ts";

/** Parameters of the synthetic line. */
export interface LossModel {
  /** Insertion loss at the Nyquist frequency in dB (0 … 100). */
  readonly lossAtNyquist_dB: number;
  /** Propagation delay in seconds (default 0). */
  readonly delay_s?: number;
  /** Share of the Nyquist loss from the skin (√f) term, 0 … 1 (default 0.35); the rest is dielectric (f). */
  readonly skinFraction?: number;
}

/** Default share of skin loss at Nyquist. */
export const DEFAULT_SKIN_FRACTION = 0.35;

const NEPER_PER_DB = Math.LN10 / 20;

function checkModel(model: LossModel): { skin: number; diel: number; delay: number } {
  const { lossAtNyquist_dB: loss } = model;
  if (!(loss >= 0 && loss <= 100)) throw new RangeError(`lossAtNyquist_dB must be a number 0…100, got ${String(loss)}`);
  const frac = model.skinFraction ?? DEFAULT_SKIN_FRACTION;
  if (!(frac >= 0 && frac <= 1)) throw new RangeError(`skinFraction must be a number 0…1, got ${String(frac)}`);
  const delay = model.delay_s ?? 0;
  if (!(delay >= 0 && delay <= 1e-6)) throw new RangeError(`delay_s must be a number 0…1e-6, got ${String(delay)}`);
  return { skin: loss * frac * NEPER_PER_DB, diel: loss * (1 - frac) * NEPER_PER_DB, delay };
}

/**
 * Transfer function of the line at `freqs_Hz`, with `x = f/fN`:
 * `H = exp(−a·√x·(1 + i)) · exp(−b·x·(1 − i·(2/π)·ln x)) · exp(−i2πf·delay)`,
 * `a`, `b` the skin and dielectric losses at Nyquist in nepers. `exp(−a√(2ix))` is the causal skin
 * term (equal loss and phase); the dielectric phase is the minimum-phase partner of a loss linear
 * in f, which makes higher frequencies travel slightly faster. `|H(fN)|` is the requested loss.
 *
 * @param freqs_Hz - frequencies in Hz (≥ 0).
 * @param model - the line.
 * @param nyquist_Hz - the Nyquist frequency in Hz (> 0), where the loss is specified.
 * @see Pozar, *Microwave Engineering* (skin-effect conductor loss ∝ √f, dielectric loss ∝ f);
 *   Djordjevic, Biljic, Likar-Smiljanic & Sarkar, "Wideband frequency-domain characterization of
 *   FR-4 and time-domain causality", IEEE Trans. EMC 43(4), 2001 (causal dielectric dispersion).
 */
export function lossModelS21(freqs_Hz: ArrayLike<number>, model: LossModel, nyquist_Hz: number): ComplexArray {
  const { skin, diel, delay } = checkModel(model);
  if (!(nyquist_Hz > 0) || !Number.isFinite(nyquist_Hz))
    throw new RangeError(`nyquist_Hz must be a finite number > 0, got ${String(nyquist_Hz)}`);
  const re = new Float64Array(freqs_Hz.length);
  const im = new Float64Array(freqs_Hz.length);
  for (let k = 0; k < freqs_Hz.length; k++) {
    const f = freqs_Hz[k];
    if (!(f >= 0) || !Number.isFinite(f)) throw new RangeError(`freqs_Hz[${k}] must be a finite number ≥ 0`);
    const x = f / nyquist_Hz;
    const sq = Math.sqrt(x);
    const logMag = -skin * sq - diel * x;
    const ph = -skin * sq + (x > 0 ? diel * x * (2 / Math.PI) * Math.log(x) : 0) - 2 * Math.PI * f * delay;
    const a = Math.exp(logMag);
    re[k] = a * Math.cos(ph);
    im[k] = a * Math.sin(ph);
  }
  return { re, im };
}

/**
 * Pulse response of the synthetic line on the given grid (Nyquist = 1/(2·ui_s)), with the
 * insertion loss from DC to the baud rate (201 points) for plotting.
 */
export function pulseFromLossModel(
  model: LossModel,
  grid: PulseGrid,
  options: SpectrumPulseOptions = {},
): FrequencyPulse {
  checkPulseGrid(grid);
  const { delay } = checkModel(model);
  const spu = grid.samplesPerUi;
  const dt = grid.ui_s / spu;
  const nyquist = 1 / (2 * grid.ui_s);
  const window_s = Math.max(1024 * grid.ui_s, 2 * delay + 512 * grid.ui_s);
  const size = nextPowerOfTwo(Math.ceil(window_s / dt));
  if (size > MAX_CHANNEL_FFT)
    throw new RangeError(`delay_s and samplesPerUi need an FFT of ${size} points (at most ${MAX_CHANNEL_FFT})`);
  const half = size / 2 + 1;
  const freqs = Float64Array.from({ length: half }, (_, k) => k / (size * dt));
  const h = lossModelS21(freqs, model, nyquist);
  const top = freqs[half - 1];
  for (let k = 0; k < half; k++) {
    const w = raisedCosineRolloff(freqs[k], 0.9 * top, top);
    h.re[k] *= w;
    h.im[k] *= w;
  }
  const { pulse, start_s } = pulseFromSpectrum(h, size, grid, options);
  const plotF = Float64Array.from({ length: 201 }, (_, i) => (i * 2 * nyquist) / 200);
  const plotH = lossModelS21(plotF, model, nyquist);
  const magnitude_dB = magnitudeDb(plotH.re, plotH.im);
  return { pulse, start_s, insertionLoss: { freqs_Hz: plotF, magnitude_dB } };
}
