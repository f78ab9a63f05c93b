// The warm start of the first CTLE setting searched: a steepest-ascent climb on a cheap estimate
// from the best starting point, so that the thresholds start near their final values.
import { leafBound } from "../bound/leafBound.ts";
import { criterionPhaseOf } from "../evaluateSetting.ts";
import type { CtleContext } from "./ctleContext.ts";
import { type FirGrid, settingAt } from "./firGrid.ts";
import { lightEstimate } from "./lightEstimate.ts";
import type { SearchState } from "./searchState.ts";

/** A setting the climb has estimated. */
interface Estimated {
  readonly taps: Float64Array;
  readonly value: number;
}

/**
 * A cheap estimate of a setting's figure for objective `o` (within a fraction of a millivolt of the
 * exact one): per member the best over its policy's phases of {@link lightEstimate}, the least over
 * members.
 */
function estimate(state: SearchState, ctx: CtleContext, taps: Float64Array, o: number): number {
  const space = state.space;
  const dfeCount = state.dfeCounts[o];
  let least = Number.POSITIVE_INFINITY;
  for (const member of ctx.members) {
    const phases =
      space.policy === "max-height" ? state.allPhases : [criterionPhaseOf(member.channel, member.space, taps)];
    let best = Number.NEGATIVE_INFINITY;
    for (const t of phases) {
      const leaf = leafBound(member.setup, member.coefficients, t, taps, dfeCount, member.scratch);
      if (!(leaf.bound_V > best)) continue;
      const v = lightEstimate(member.space, member, taps, dfeCount, t, leaf);
      if (v > best) best = v;
    }
    if (best < least) least = best;
  }
  return least;
}

/** Grid positions of a setting's side taps (null when one is off the grid). */
function positionOf(grid: FirGrid, taps: Float64Array): Int32Array | null {
  const pos = new Int32Array(grid.sides.length);
  for (let s = 0; s < grid.sides.length; s++) {
    const i = grid.sideSteps[s].indexOf(Math.round(taps[grid.sides[s]] / grid.step));
    if (i < 0) return null;
    pos[s] = i;
  }
  return pos;
}

/** The grid positions one step away from `at` along one side tap. */
function neighbours(grid: FirGrid, at: Int32Array): Int32Array[] {
  const out: Int32Array[] = [];
  for (let s = 0; s < grid.sides.length; s++) {
    for (const d of [-1, 1]) {
      const q = at[s] + d;
      if (q < 0 || q >= grid.sideSteps[s].length) continue;
      const pos = Int32Array.from(at);
      pos[s] = q;
      out.push(pos);
    }
  }
  return out;
}

/**
 * Settings worth evaluating first in the first CTLE setting searched: per objective, a
 * steepest-ascent walk on {@link estimate} from the best of `starts` over single-step moves of one
 * side tap, then the end point's neighbours; as many as the objective keeps (and one more), best
 * estimate first.
 */
export function warmStart(state: SearchState, ctx: CtleContext, starts: readonly Float64Array[]): Float64Array[] {
  const grid = state.grid;
  if (grid.empty) return [];
  const known = new Map<string, Estimated>();
  const picks: Estimated[] = [];
  for (let o = 0; o < state.objectiveCount; o++) {
    const value = (pos: Int32Array): number => {
      const key = `${o}:${pos.join(",")}`;
      const seen = known.get(key);
      if (seen !== undefined) return seen.value;
      const taps = new Float64Array(grid.tapCount);
      if (!settingAt(grid, pos, taps)) return Number.NEGATIVE_INFINITY;
      const v = estimate(state, ctx, taps, o);
      known.set(key, { taps, value: v });
      return v;
    };
    let at: Int32Array | null = null;
    let atValue = Number.NEGATIVE_INFINITY;
    for (const s of starts) {
      const pos = positionOf(grid, s);
      if (pos === null) continue;
      const v = value(pos);
      if (v > atValue) {
        at = pos;
        atValue = v;
      }
    }
    if (at === null) continue;
    for (let steps = 0; steps < 4 * grid.sides.length * 26; steps++) {
      let next: Int32Array | null = null;
      let nextValue = atValue;
      for (const pos of neighbours(grid, at)) {
        const v = value(pos);
        if (v > nextValue) {
          next = pos;
          nextValue = v;
        }
      }
      if (next === null) break;
      at = next;
      atValue = nextValue;
    }
    const near: Estimated[] = [];
    const end = known.get(`${o}:${at.join(",")}`);
    if (end !== undefined) near.push(end);
    for (const pos of neighbours(grid, at)) {
      const x = known.get(`${o}:${pos.join(",")}`);
      if (x !== undefined) near.push(x);
    }
    near.sort((a, b) => b.value - a.value);
    picks.push(...near.slice(0, o === 0 ? state.results.topCount + 1 : 2));
  }
  return picks.map((x) => x.taps);
}
