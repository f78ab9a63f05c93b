// The shared last stage of frequency-domain channels: spectrum on an FFT grid → impulse → step → pulse.
import { peakIndex } from "../pulse/peakIndex.ts";
import { FftPlan, type ComplexArray } from "../signal/fftPlan.ts";
import { riseTimeResponse, riseTimeSigma } from "./riseTimeFilter.ts";
import { checkPulseGrid, type PulseGrid, type PulseWithTime } from "./pulseFromSamples.ts";

/** Largest FFT used to turn a spectrum into a pulse. */
export const MAX_CHANNEL_FFT = 1 << 22;

/** Shaping options of frequency-domain pulses. */
export interface SpectrumPulseOptions {
  /** UIs kept before t = 0 for the non-causal ringing of band limits and filters (default 8). */
  readonly guard_UI?: number;
  /**
   * The tail is cut where every later sample is below this fraction of the peak (default 1e-4)…
   */
  readonly tailThreshold?: number;
  /**
   * …and the area cut off is below this fraction of the pulse's area (default 5e-3, so the
   * pulse keeps its DC gain to 0.5 %; slow skin-effect tails decay only as t^(−3/2)).
   */
  readonly areaTolerance?: number;
}

/**
 * Pulse response from a channel spectrum sampled on the bins of a real FFT of length `size`
 * with time step `ui_s / samplesPerUi` (bin k at `k / (size·dt)` Hz, k = 0 … size/2). Applies
 * the rise-time filter, inverts with a real IFFT (`x[n] = h(n·dt)·dt`), reads the last `guard`
 * samples of the periodic result as negative time, integrates (trapezoids) to the step response and forms
 * `p(t) = s(t) − s(t − UI)`. The pulse starts at `start_s = −guard·dt`; the channel delay is kept.
 * Its area is `H(0)·ui_s` up to the trimmed tail (see `areaTolerance`).
 */
export function pulseFromSpectrum(
  spectrum: ComplexArray,
  size: number,
  grid: PulseGrid,
  options: SpectrumPulseOptions = {},
): PulseWithTime {
  checkPulseGrid(grid);
  const spu = grid.samplesPerUi;
  const dt = grid.ui_s / spu;
  const guardUi = options.guard_UI ?? 8;
  const threshold = options.tailThreshold ?? 1e-4;
  if (!Number.isInteger(guardUi) || guardUi < 0)
    throw new RangeError(`guard_UI must be an integer ≥ 0, got ${String(guardUi)}`);
  if (!(threshold >= 0 && threshold < 1))
    throw new RangeError(`tailThreshold must be in [0, 1), got ${String(threshold)}`);
  const areaTolerance = options.areaTolerance ?? 5e-3;
  if (!(areaTolerance >= 0 && areaTolerance < 1)) {
    throw new RangeError(`areaTolerance must be in [0, 1), got ${String(areaTolerance)}`);
  }
  const rise = grid.riseTime_s ?? 0;
  const half = size / 2 + 1;
  const re = Float64Array.from(spectrum.re);
  const im = Float64Array.from(spectrum.im);
  if (rise > 0) {
    for (let k = 0; k < half; k++) {
      const w = riseTimeResponse(k / (size * dt), rise);
      re[k] *= w;
      im[k] *= w;
    }
  }
  const x = new FftPlan(size).realInverse({ re, im });
  const guard = Math.min(Math.floor(size / 4), guardUi * spu + Math.ceil((4 * riseTimeSigma(rise)) / dt));

  // Step response over the window, negative times first; then the pulse, one UI longer.
  const len = size + spu;
  // Trapezoidal integration puts step[i] at t_i exactly (a running sum would lag half a sample).
  const step = new Float64Array(size);
  let acc = 0;
  for (let i = 0; i < size; i++) {
    const xi = x[(i - guard + size) % size];
    step[i] = acc + 0.5 * xi;
    acc += xi;
  }
  const p = new Float64Array(len);
  let peak = 0;
  let total = 0;
  for (let i = 0; i < len; i++) {
    const now = i < size ? step[i] : step[size - 1];
    const before = i >= spu ? step[i - spu] : 0;
    p[i] = now - before;
    peak = Math.max(peak, Math.abs(p[i]));
    total += p[i];
  }
  // Trim the tail: after the last sample above the threshold, and only as far as the area allows.
  let end = len;
  const limit = threshold * peak;
  let last = len - 1;
  while (last > 0 && Math.abs(p[last]) <= limit) last--;
  const areaTol = areaTolerance * Math.max(Math.abs(total), peak * spu);
  let suffix = 0;
  for (let i = len - 1; i > last; i--) {
    suffix += p[i];
    if (Math.abs(suffix) <= areaTol) end = i;
    else break;
  }
  const values_V = p.slice(0, Math.max(end, 1));
  return {
    pulse: { ui_s: grid.ui_s, samplesPerUi: spu, values_V, mainIndex: peakIndex(values_V) },
    start_s: -guard * dt,
  };
}
