// Which sampling phases a timing-criterion policy may choose for some setting of a box: the
// criterion F(t) = main(t − lag) − main(t + lag) is affine in the taps, so its range over the box
// is exact, and a phase is kept only where F can cross zero.
import { criterionLag, type PhaseWindow } from "../../clocking/samplingPhase.ts";
import { affineRangeInto } from "../bound/tapBox.ts";
import type { MemberContext } from "./ctleContext.ts";
import type { SearchState } from "./searchState.ts";

/** Ranges over the current box of the criterion at each phase of the window, filled when first asked. */
export interface CriterionTable {
  /** `[lo, hi]` per phase of the window (from its low end). */
  readonly ranges: Float64Array;
  /** Which ranges belong to the current (member, box): equal to `serial`. */
  readonly stamp: Int32Array;
  serial: number;
}

/** An empty table for the phases of `window`. */
export function createCriterionTable(window: PhaseWindow): CriterionTable {
  const count = window.hi - window.lo + 1;
  return { ranges: new Float64Array(2 * count), stamp: new Int32Array(count), serial: 0 };
}

/** The criterion `F(t) = main(t − lag) − main(t + lag)` as coefficients per tap, volts (computed once per phase). */
function criterionCoefficients(state: SearchState, member: MemberContext, t: number): Float64Array {
  const known = member.criterion.get(t);
  if (known !== undefined) return known;
  const { space, grid } = state;
  const lag = criterionLag(space.policy as "centre" | "mueller-muller", state.samplesPerUi);
  // The main cursor at a fractional phase interpolates linearly between the two nearest phases.
  const mainCoefficients = (u: number): Float64Array => {
    const b = Math.floor(u);
    const f = u - b;
    const out = new Float64Array(grid.tapCount);
    for (const [p, w] of f === 0
      ? [[b, 1]]
      : [
          [b, 1 - f],
          [b + 1, f],
        ]) {
      const h = member.channel.cursors(p);
      for (let j = 0; j < grid.tapCount; j++) {
        const i = member.channel.pre + grid.mainIndex - j;
        if (i >= 0 && i < h.length) out[j] += w * member.space.scale_V * h[i];
      }
    }
    return out;
  };
  const early = mainCoefficients(t - lag);
  const late = mainCoefficients(t + lag);
  const v = Float64Array.from(early, (x, j) => x - late[j]);
  member.criterion.set(t, v);
  return v;
}

/** Offset in the table of phase `t`'s range over the current box (computed when first asked). */
function rangeAt(state: SearchState, member: MemberContext, t: number): number {
  const table = state.criterion;
  const i = t - state.window.lo;
  if (table.stamp[i] !== table.serial) {
    affineRangeInto(state.box, criterionCoefficients(state, member, t), 0, table.ranges, 2 * i);
    table.stamp[i] = table.serial;
  }
  return 2 * i;
}

/**
 * Phases the policy may choose for some setting of the current box (`state.box`), among `parent`
 * (the phases of an enclosing box: a setting's phase does not depend on the box it is seen in).
 * Every phase for "max-height".
 */
export function boxPhases(state: SearchState, member: MemberContext, parent: readonly number[]): readonly number[] {
  const { space, window } = state;
  if (space.policy === "max-height") return state.allPhases;
  // A small tolerance keeps rounding differences from hiding a phase the leaf would choose.
  const eps = 1e-12 * member.space.scale_V;
  const table = state.criterion;
  const ranges = table.ranges;
  table.serial++;
  let out: number[] | null = null;
  for (let n = 0; n < parent.length; n++) {
    const t = parent[n];
    // A crossing at u (F(u−1) < 0 ≤ F(u)) may lock at u − 1 or u: t is kept for a crossing at t or t + 1.
    let keep = false;
    for (let u = t; u <= t + 1 && !keep; u++) {
      if (u - 1 < window.lo || u > window.hi) continue;
      keep = ranges[rangeAt(state, member, u - 1)] < eps && ranges[rangeAt(state, member, u) + 1] >= -eps;
    }
    if (!keep && t === window.lo) keep = ranges[rangeAt(state, member, t) + 1] >= -eps; // no crossing and F(lo) ≥ 0
    if (!keep && t === window.hi) keep = ranges[rangeAt(state, member, t)] < eps; // no crossing and F(hi) < 0
    if (keep) {
      if (out !== null) out.push(t);
    } else if (out === null) out = parent.slice(0, n);
  }
  return out ?? parent;
}
