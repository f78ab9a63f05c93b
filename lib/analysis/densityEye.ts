// The time-domain eye: a symbol stream through the pulse response by superposition, folded over
// two unit intervals into a 2-D histogram that a canvas can paint directly.
import { assertPulse } from "../pulse/assertPulse.ts";
import type { Pulse } from "../types.ts";

/** A density eye: `counts[row·width + col]`, row 0 at the top (highest voltage). */
export interface DensityEye {
  readonly width: number;
  readonly height: number;
  /** Hits per cell. */
  readonly counts: Float64Array;
  /** Column centres in UI, relative to the sampling instant (from −1 to +1 UI). */
  readonly time_UI: Float64Array;
  /** Row centres in volts, descending (row 0 = highest). */
  readonly voltage_V: Float64Array;
  /** Number of symbols folded in. */
  readonly symbols: number;
}

/** Options of {@link densityEye}. */
export interface DensityEyeOptions {
  /** Columns over the two UI (integer ≥ 2, default 128). */
  readonly width?: number;
  /** Rows (integer ≥ 2, default 96). */
  readonly height?: number;
  /** Voltage extent `[low, high]`; default symmetric, 10 % beyond the largest |waveform|. */
  readonly voltageRange_V?: readonly [number, number];
  /** Sampling instant in samples relative to `pulse.mainIndex` (default 0). */
  readonly phase?: number;
  /** Waveform points per column, evenly spread across it (integer 1…16, default 4). */
  readonly pointsPerColumn?: number;
}

/**
 * Superposes `y(t) = Σ_k a_k·p(t − k·UI)` for the given symbols, treating the stream as periodic
 * (so every fold sees the steady state: a full PRBS period gives every pattern of the sequence), and
 * folds it over the two UI around each symbol's sampling instant into a `width × height` histogram.
 * Each column receives `pointsPerColumn` points per symbol, linearly interpolated between samples.
 *
 * @param pulse - pulse response in volts at the observation point (swing applied).
 * @param symbols - symbol values (e.g. from `symbolStream`), at least one.
 * @param options - image size, voltage range, sampling phase.
 */
export function densityEye(pulse: Pulse, symbols: Float64Array, options: DensityEyeOptions = {}): DensityEye {
  assertPulse(pulse);
  if (!(symbols instanceof Float64Array) || symbols.length === 0) {
    throw new TypeError("symbols must be a non-empty Float64Array");
  }
  for (let i = 0; i < symbols.length; i++) {
    if (!Number.isFinite(symbols[i])) throw new RangeError(`symbols[${i}] is not finite`);
  }
  const W = options.width ?? 128;
  const H = options.height ?? 96;
  const per = options.pointsPerColumn ?? 4;
  const phase = options.phase ?? 0;
  if (!Number.isInteger(W) || W < 2 || W > 4096) throw new RangeError(`width must be an integer 2…4096, got ${W}`);
  if (!Number.isInteger(H) || H < 2 || H > 4096) throw new RangeError(`height must be an integer 2…4096, got ${H}`);
  if (!Number.isInteger(per) || per < 1 || per > 16) {
    throw new RangeError(`pointsPerColumn must be an integer 1…16, got ${per}`);
  }
  if (!Number.isFinite(phase)) throw new RangeError(`phase must be a finite number of samples, got ${phase}`);

  const spu = pulse.samplesPerUi;
  const p = pulse.values_V;
  const N = symbols.length;
  const period = N * spu;
  // Periodic waveform by polyphase superposition: y[n·spu + φ] = Σ_j a_{n−j}·p[j·spu + φ], reading the
  // symbols from a copy with the last `taps` symbols in front (the stream wraps around).
  const y = new Float64Array(period);
  const taps = Math.ceil(p.length / spu);
  const ext = new Float64Array(N + taps);
  for (let i = 0; i < ext.length; i++) ext[i] = symbols[(((i - taps) % N) + N) % N];
  const col = new Float64Array(taps);
  for (let phi = 0; phi < spu; phi++) {
    let used = 0;
    for (let j = 0; j < taps; j++) {
      const idx = j * spu + phi;
      col[j] = idx < p.length ? p[idx] : 0;
      if (col[j] !== 0) used = j + 1;
    }
    for (let n = 0; n < N; n++) {
      let s = 0;
      const top = n + taps;
      for (let j = 0; j < used; j++) s += ext[top - j] * col[j];
      y[n * spu + phi] = s;
    }
  }

  let lowV: number;
  let highV: number;
  if (options.voltageRange_V !== undefined) {
    [lowV, highV] = options.voltageRange_V;
    if (!(Number.isFinite(lowV) && Number.isFinite(highV) && highV > lowV)) {
      throw new RangeError("voltageRange_V must be two finite numbers [low, high] with high > low");
    }
  } else {
    let peak = 0;
    for (let i = 0; i < period; i++) peak = Math.max(peak, Math.abs(y[i]));
    highV = peak > 0 ? 1.1 * peak : 1;
    lowV = -highV;
  }

  const counts = new Float64Array(W * H);
  const time_UI = new Float64Array(W);
  for (let c = 0; c < W; c++) time_UI[c] = -1 + ((c + 0.5) * 2) / W;
  const voltage_V = new Float64Array(H);
  const dv = (highV - lowV) / H;
  for (let r = 0; r < H; r++) voltage_V[r] = highV - (r + 0.5) * dv;

  // Every point of every column as a whole-sample offset from a symbol's start and a fraction.
  const pts = W * per;
  const whole = new Int32Array(pts);
  const frac = new Float64Array(pts);
  for (let c = 0; c < W; c++) {
    for (let q = 0; q < per; q++) {
      const x = pulse.mainIndex + phase + (-1 + ((c + (q + 0.5) / per) * 2) / W) * spu;
      const i0 = Math.floor(x);
      whole[c * per + q] = i0;
      frac[c * per + q] = x - i0;
    }
  }
  for (let n = 0; n < N; n++) {
    const base = n * spu;
    for (let i = 0; i < pts; i++) {
      let a0 = base + whole[i];
      if (a0 < 0 || a0 >= period) a0 = ((a0 % period) + period) % period;
      const a1 = a0 + 1 === period ? 0 : a0 + 1;
      const v = y[a0] + frac[i] * (y[a1] - y[a0]);
      const r = Math.floor((highV - v) / dv);
      if (r >= 0 && r < H) counts[r * W + ((i / per) | 0)] += 1;
    }
  }
  return { width: W, height: H, counts, time_UI, voltage_V, symbols: N };
}
