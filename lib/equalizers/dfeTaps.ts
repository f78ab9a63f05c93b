// Decision-feedback equalizer: taps that cancel the first post-cursors, clipped to their limits.
import type { Cursors } from "../pulse/cursorsAt.ts";

/** DFE taps and what they leave behind. */
export interface DfeResult {
  /** Tap values in volts, `taps[k]` cancels post-cursor `k + 1`. */
  readonly taps: Float64Array;
  /** Post-cursor ISI left where a tap was clipped: `h[main + 1 + k] − taps[k]`. */
  readonly residual: Float64Array;
  /** Whether tap `k` hit its limit. */
  readonly clipped: readonly boolean[];
  /** The cursors after the DFE: post-cursors `1 … count` reduced by the taps. */
  readonly cursors: Cursors;
}

/**
 * An ideal-decision DFE of `count` taps: each tap equals its post-cursor, clipped to
 * `±limits_V[k]`; the ISI of clipped cursors remains. Post-cursors beyond the given cursors are 0.
 *
 * @param cursors - symbol-spaced cursors `{ h, main }` in volts.
 * @param count - number of taps (integer ≥ 0).
 * @param limits_V - magnitude limit per tap in volts (≥ 0), one number for all taps, or
 *   omitted for no limit.
 * @see Belfiore & Park, "Decision feedback equalization", Proc. IEEE 67(8), 1979.
 */
export function dfeTaps(cursors: Cursors, count: number, limits_V?: number | ArrayLike<number>): DfeResult {
  const { h, main } = cursors;
  if (!(h instanceof Float64Array) || h.length === 0)
    throw new RangeError("cursors.h must be a non-empty Float64Array");
  if (!Number.isInteger(main) || main < 0 || main >= h.length) {
    throw new RangeError(`cursors.main must be an integer 0…${h.length - 1}, got ${String(main)}`);
  }
  if (!Number.isInteger(count) || count < 0 || count > 1024) {
    throw new RangeError(`count must be an integer 0…1024, got ${String(count)}`);
  }
  const limitOf = (k: number): number => {
    if (limits_V === undefined) return Number.POSITIVE_INFINITY;
    if (typeof limits_V === "number") return limits_V;
    return limits_V[k];
  };
  if (limits_V !== undefined && typeof limits_V !== "number" && limits_V.length !== count) {
    throw new RangeError(`limits_V must hold ${count} limits (one per tap), got ${limits_V.length}`);
  }
  const taps = new Float64Array(count);
  const residual = new Float64Array(count);
  const clipped: boolean[] = [];
  const after = Float64Array.from(h);
  for (let k = 0; k < count; k++) {
    const lim = limitOf(k);
    if (!(lim >= 0) || Number.isNaN(lim))
      throw new RangeError(`limits_V[${k}] must be a number ≥ 0, got ${String(lim)}`);
    const i = main + 1 + k;
    const v = i < h.length ? h[i] : 0;
    const t = Math.max(-lim, Math.min(lim, v));
    taps[k] = t;
    residual[k] = v - t;
    clipped.push(t !== v);
    if (i < h.length) after[i] = v - t;
  }
  return { taps, residual, clipped, cursors: { h: after, main } };
}
