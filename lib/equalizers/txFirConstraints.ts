// The legal settings of a transmit FIR: peak-swing limit, per-tap ranges and a quantization step.
import { checkTaps } from "./checkTaps.ts";

/** A closed interval `[min, max]` for one tap. */
export type TapRange = readonly [min: number, max: number];

/** What a transmit FIR may be set to. */
export interface TxFirSpec {
  /** Number of pre-cursor taps (integer ≥ 0). */
  readonly pre: number;
  /** Number of post-cursor taps (integer ≥ 0). */
  readonly post: number;
  /** Quantization step of every tap (> 0), as a fraction of the peak swing. */
  readonly step: number;
  /**
   * Per-tap ranges, `pre + 1 + post` of them from the earliest tap. Default: side taps
   * `[−0.5, 0]` (de-emphasis and pre-shoot), main tap `[0, 1]`.
   */
  readonly ranges?: readonly TapRange[];
}

/** Default range of a side tap: de-emphasis / pre-shoot only, at most half the swing. */
export const DEFAULT_SIDE_TAP_RANGE: TapRange = [-0.5, 0];
/** Default range of the main tap. */
export const DEFAULT_MAIN_TAP_RANGE: TapRange = [0, 1];

/** Tolerance for comparing tap sums against the peak-swing limit (floating-point grids). */
export const TAP_TOLERANCE = 1e-9;

/** Checks a spec and returns its ranges, filling in the defaults. */
export function resolveTapRanges(spec: TxFirSpec): TapRange[] {
  if (spec === null || typeof spec !== "object") throw new TypeError("spec must be an object");
  const { pre, post, step } = spec;
  if (!Number.isInteger(pre) || pre < 0 || pre > 64)
    throw new RangeError(`spec.pre must be an integer 0…64, got ${String(pre)}`);
  if (!Number.isInteger(post) || post < 0 || post > 64) {
    throw new RangeError(`spec.post must be an integer 0…64, got ${String(post)}`);
  }
  if (!(step > 0) || !Number.isFinite(step) || step > 1) {
    throw new RangeError(`spec.step must be a number in (0, 1], got ${String(step)}`);
  }
  const count = pre + 1 + post;
  if (spec.ranges === undefined) {
    return Array.from({ length: count }, (_, j) => (j === pre ? DEFAULT_MAIN_TAP_RANGE : DEFAULT_SIDE_TAP_RANGE));
  }
  if (spec.ranges.length !== count) {
    throw new RangeError(`spec.ranges must hold ${count} ranges (pre + 1 + post), got ${spec.ranges.length}`);
  }
  return spec.ranges.map((r, j) => {
    if (!Array.isArray(r) || r.length !== 2 || !Number.isFinite(r[0]) || !Number.isFinite(r[1]) || r[0] > r[1]) {
      throw new RangeError(`spec.ranges[${j}] must be [min, max] with finite min ≤ max`);
    }
    if (Math.abs(r[0]) > 1 || Math.abs(r[1]) > 1) {
      throw new RangeError(`spec.ranges[${j}] must lie within [−1, 1] (the peak swing)`);
    }
    return [r[0], r[1]] as const;
  });
}

/** `Σ|c|`: the peak output level of the FIR as a fraction of the full swing. */
export function peakSwing(taps: ArrayLike<number>): number {
  checkTaps(taps, 0);
  let s = 0;
  for (let j = 0; j < taps.length; j++) s += Math.abs(taps[j]);
  return s;
}

/** Taps scaled so that `Σ|c| = 1` (the full swing). */
export function normalizePeakSwing(taps: ArrayLike<number>): Float64Array {
  const s = peakSwing(taps);
  if (s === 0) throw new RangeError("taps are all zero; they cannot be scaled to the peak swing");
  return Float64Array.from(taps, (c) => c / s);
}

/** Each tap rounded to the nearest multiple of `step` (> 0). */
export function quantizeTaps(taps: ArrayLike<number>, step: number): Float64Array {
  checkTaps(taps, 0);
  if (!(step > 0) || !Number.isFinite(step))
    throw new RangeError(`step must be a finite number > 0, got ${String(step)}`);
  return Float64Array.from(taps, (c) => Math.round(c / step) * step);
}

/**
 * Whether `taps` is a legal setting: right length, every tap inside its range, `Σ|c| ≤ 1`,
 * every tap on the step grid (all within {@link TAP_TOLERANCE}).
 */
export function isLegalTxFir(taps: ArrayLike<number>, spec: TxFirSpec): boolean {
  const ranges = resolveTapRanges(spec);
  if (taps.length !== ranges.length) return false;
  for (let j = 0; j < taps.length; j++) {
    const c = taps[j];
    if (!Number.isFinite(c)) return false;
    if (c < ranges[j][0] - TAP_TOLERANCE || c > ranges[j][1] + TAP_TOLERANCE) return false;
    if (Math.abs(c / spec.step - Math.round(c / spec.step)) > 1e-6) return false;
  }
  return peakSwing(taps) <= 1 + TAP_TOLERANCE;
}
