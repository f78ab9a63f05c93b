// Pulse response from a sampled time record: a pulse, step or impulse response on any time grid.
import type { Pulse } from "../types.ts";
import { peakIndex } from "../pulse/peakIndex.ts";
import { convolve } from "../signal/convolve.ts";
import { interpolateLinear } from "../signal/interpolateLinear.ts";
import { riseTimeKernel } from "./riseTimeFilter.ts";

/** What a sampled record measures. */
export type ResponseKind = "pulse" | "step" | "impulse";

/** A sampled response: values on a uniform step `dt_s` or at explicit ascending times `time_s`. */
export interface SampledResponse {
  readonly response: ResponseKind;
  /** Volts for pulse and step responses (step: response to a 1 V step); 1/s for an impulse response. */
  readonly values: Float64Array;
  /** Uniform sample step in seconds (give this or `time_s`). */
  readonly dt_s?: number;
  /** Sample times in seconds, strictly ascending (give this or `dt_s`). */
  readonly time_s?: Float64Array;
}

/** Target grid of a pulse: UI, samples per UI, optional transmitter rise time. */
export interface PulseGrid {
  /** Unit interval in seconds (> 0). */
  readonly ui_s: number;
  /** Samples per UI (integer 1 … 1024). */
  readonly samplesPerUi: number;
  /** 10–90 % rise time of a Gaussian transmitter edge filter in seconds (default 0, none). */
  readonly riseTime_s?: number;
}

/** A pulse and the time of its first sample. */
export interface PulseWithTime {
  readonly pulse: Pulse;
  /** Time in seconds of `pulse.values_V[0]` on the source's time axis. */
  readonly start_s: number;
}

/** Longest pulse built, in samples. */
export const MAX_PULSE_SAMPLES = 1 << 22;

/** Checks the target grid, naming the field at fault. */
export function checkPulseGrid(grid: PulseGrid): void {
  if (!(grid.ui_s > 0) || !Number.isFinite(grid.ui_s))
    throw new RangeError(`ui_s must be a finite number > 0, got ${String(grid.ui_s)}`);
  if (!Number.isInteger(grid.samplesPerUi) || grid.samplesPerUi < 1 || grid.samplesPerUi > 1024) {
    throw new RangeError(`samplesPerUi must be an integer 1…1024, got ${String(grid.samplesPerUi)}`);
  }
  const rt = grid.riseTime_s ?? 0;
  if (!(rt >= 0) || !Number.isFinite(rt))
    throw new RangeError(`riseTime_s must be a finite number ≥ 0, got ${String(rt)}`);
}

/**
 * Builds the pulse response on the grid `ui_s / samplesPerUi` from a sampled record:
 * - a pulse response is resampled (linear interpolation);
 * - a step response `s(t)` gives `p(t) = s(t) − s(t − UI)` (the level before the record is its
 *   first value, after it its last value), so a constant offset cancels;
 * - an impulse response is first integrated (trapezoids, at its own resolution) to a step response.
 * The optional rise-time filter is a centred Gaussian kernel, so it widens the pulse by its
 * half-width on each side and `start_s` moves earlier by that much. `mainIndex` is the peak.
 * By linearity and time invariance, the response to a 1 V rectangle of one UI is the step
 * response minus itself delayed by one UI.
 */
export function pulseFromSamples(source: SampledResponse, grid: PulseGrid): PulseWithTime {
  checkPulseGrid(grid);
  const { response, values } = source;
  if (response !== "pulse" && response !== "step" && response !== "impulse") {
    throw new RangeError(`response must be "pulse", "step" or "impulse", got ${String(response)}`);
  }
  if (!(values instanceof Float64Array) || values.length < 2)
    throw new RangeError("values must hold at least 2 samples");
  for (let i = 0; i < values.length; i++) {
    if (!Number.isFinite(values[i])) throw new RangeError(`values[${i}] must be finite, got ${values[i]}`);
  }
  let time: Float64Array;
  if (source.time_s !== undefined) {
    if (source.time_s.length !== values.length) {
      throw new RangeError(`time_s must have the length of values (${values.length}), got ${source.time_s.length}`);
    }
    time = source.time_s;
    for (let i = 0; i < time.length; i++) {
      if (!Number.isFinite(time[i])) throw new RangeError(`time_s[${i}] must be finite`);
      if (i > 0 && !(time[i] > time[i - 1])) throw new RangeError(`time_s must ascend strictly (time_s[${i}])`);
    }
  } else {
    const dt = source.dt_s;
    if (dt === undefined || !(dt > 0) || !Number.isFinite(dt))
      throw new RangeError(`dt_s must be a finite number > 0, got ${String(dt)}`);
    time = Float64Array.from(values, (_, i) => i * dt);
  }
  const spu = grid.samplesPerUi;
  const dt = grid.ui_s / spu;
  const t0 = time[0];
  const span = time[time.length - 1] - t0;
  const count = Math.floor(span / dt + 1e-9) + 1;
  if (count + spu > MAX_PULSE_SAMPLES) {
    throw new RangeError(`the record spans ${count} samples at samplesPerUi ${spu}; at most ${MAX_PULSE_SAMPLES}`);
  }
  const grid_t = Float64Array.from({ length: count }, (_, j) => t0 + j * dt);

  let out: Float64Array;
  if (response === "pulse") {
    out = interpolateLinear(time, values, grid_t);
  } else {
    let step = values;
    if (response === "impulse") {
      step = new Float64Array(values.length);
      for (let i = 1; i < values.length; i++) {
        step[i] = step[i - 1] + 0.5 * (values[i] + values[i - 1]) * (time[i] - time[i - 1]);
      }
    }
    const s = interpolateLinear(time, step, grid_t);
    const first = s[0];
    const last = s[s.length - 1];
    out = new Float64Array(count + spu);
    for (let j = 0; j < out.length; j++) {
      const now = j < count ? s[j] : last;
      const before = j - spu >= 0 ? s[j - spu] : first;
      out[j] = now - before;
    }
  }
  let start_s = t0;
  const rise = grid.riseTime_s ?? 0;
  if (rise > 0) {
    const { kernel, half } = riseTimeKernel(rise, dt);
    out = convolve(out, kernel);
    start_s -= half * dt;
  }
  return {
    pulse: { ui_s: grid.ui_s, samplesPerUi: spu, values_V: out, mainIndex: peakIndex(out) },
    start_s,
  };
}
