// The branch and bound over one CTLE setting's FIR grid: boxes of grid-position ranges are bounded
// for every member and live objective, split at their widest side tap, and dropped when nothing in
// them can enter the result; single settings go to the leaf cascade.
import { boxBound } from "../bound/boxBound.ts";
import type { CtleContext } from "./ctleContext.ts";
import { boxPhases } from "./criterionPhases.ts";
import { settingAt } from "./firGrid.ts";
import { setGridBox } from "./gridBox.ts";
import { evaluateLeaf } from "./leafCascade.ts";
import type { SearchState } from "./searchState.ts";
import { startsFor } from "./startingPoints.ts";

/** Sampling phases per member. */
type MemberPhases = readonly (readonly number[])[];

/** A box's bound for one objective, and the coarse figure its halves are ordered by. */
interface BoxFigure {
  readonly bound_V: number;
  readonly score_V: number;
}

/** The two halves of a box at one depth of the branch and bound (buffers kept for the whole search). */
export interface BoxLevel {
  readonly lo: [Int32Array, Int32Array];
  readonly hi: [Int32Array, Int32Array];
  readonly alive: [boolean[], boolean[]];
  readonly score: Float64Array;
  /** Phases per member of each half: `own[h]` when bounded here, the parent's for a single setting. */
  readonly phases: MemberPhases[];
  readonly own: (readonly number[])[][];
}

/**
 * Bound of the current box (`state.box`, member ranges reset to it) for objective `o`: per member
 * the largest bound over its phases, then the least over members. A member's phase scan stops at
 * the first phase that passes the threshold, and the member scan stops at the first member that
 * fails it; so a box that fails carries a true bound, while a box that passes carries a value that
 * only orders the halves. The score is the same over the coarse (independent-way) bounds.
 */
function boundBox(state: SearchState, ctx: CtleContext, phases: MemberPhases, o: number): BoxFigure {
  const results = state.results;
  results.stats.boxes++;
  const stopAt = results.stopAt(o);
  const dfeCount = state.dfeCounts[o];
  const memberCount = ctx.members.length;
  let least = Number.POSITIVE_INFINITY;
  let leastScore = Number.POSITIVE_INFINITY;
  for (let i = 0; i < memberCount; i++) {
    const m = (ctx.lead + i) % memberCount;
    const member = ctx.members[m];
    let v = Number.NEGATIVE_INFINITY;
    let score = Number.NEGATIVE_INFINITY;
    for (const t of phases[m]) {
      const b = boxBound(member.setup, member.ranges, t, dfeCount, member.scratch, stopAt, member.firstShift);
      if (b.bound_V <= stopAt) member.firstShift = b.shiftIndex;
      if (b.bound_V > v) v = b.bound_V;
      if (b.coarse_V > score) score = b.coarse_V;
      if (results.canEnter(o, v)) break;
    }
    if (v < least) least = v;
    if (score < leastScore) leastScore = score;
    if (!results.canEnter(o, least)) break;
  }
  return { bound_V: least, score_V: leastScore };
}

/** The buffers of depth `depth` (made when first reached). */
function levelAt(state: SearchState, depth: number): BoxLevel {
  const sideCount = state.grid.sides.length;
  const objectiveCount = state.objectiveCount;
  while (state.levels.length <= depth) {
    state.levels.push({
      lo: [new Int32Array(sideCount), new Int32Array(sideCount)],
      hi: [new Int32Array(sideCount), new Int32Array(sideCount)],
      alive: [new Array<boolean>(objectiveCount).fill(false), new Array<boolean>(objectiveCount).fill(false)],
      score: new Float64Array(2),
      phases: [[], []],
      own: [[], []],
    });
  }
  return state.levels[depth];
}

/** The side tap to split (the widest range; −1 for a single setting) and the last position of the lower half. */
function splitOf(state: SearchState, lo: Int32Array, hi: Int32Array): { side: number; mid: number } {
  let side = -1;
  let width = 0;
  for (let s = 0; s < lo.length; s++) {
    if (hi[s] - lo[s] > width) {
      width = hi[s] - lo[s];
      side = s;
    }
  }
  if (side < 0) return { side, mid: 0 };
  const g = state.grid.sideSteps[side];
  let mid = (lo[side] + hi[side]) >> 1;
  if (g[lo[side]] < 0 && g[hi[side]] > 0) {
    // Split at the sign change first, so that the main tap stays affine: [negative] and [0 and positive].
    let z = lo[side];
    while (g[z + 1] < 0) z++;
    mid = z;
  }
  return { side, mid };
}

/**
 * Bounds half `h` of a box split at `side` (written into the level's buffers) for the live
 * objectives; true when it stays live. A single setting stays live with every live objective (its
 * own tiers decide).
 */
function boundHalf(
  state: SearchState,
  ctx: CtleContext,
  level: BoxLevel,
  h: 0 | 1,
  split: { side: number; mid: number },
  parent: { lo: Int32Array; hi: Int32Array; alive: readonly boolean[]; phases: MemberPhases },
): boolean {
  const lo = level.lo[h];
  const hi = level.hi[h];
  lo.set(parent.lo);
  hi.set(parent.hi);
  if (h === 0) hi[split.side] = split.mid;
  else lo[split.side] = split.mid + 1;
  const alive = level.alive[h];
  let single = true;
  for (let s = 0; s < lo.length && single; s++) single = lo[s] === hi[s];
  if (single) {
    for (let o = 0; o < state.objectiveCount; o++) alive[o] = parent.alive[o];
    level.score[h] = Number.POSITIVE_INFINITY;
    level.phases[h] = parent.phases;
    return true;
  }
  if (!setGridBox(state, lo, hi)) return false;
  const phases = level.own[h];
  phases.length = ctx.members.length;
  level.phases[h] = phases;
  for (let m = 0; m < ctx.members.length; m++) {
    const member = ctx.members[m];
    member.ranges.reset(state.box);
    phases[m] = boxPhases(state, member, parent.phases[m]);
  }
  let score = Number.NEGATIVE_INFINITY;
  let any = false;
  let firstAlive = true;
  for (let o = 0; o < state.objectiveCount; o++) {
    alive[o] = false;
    if (!parent.alive[o]) continue;
    const figure = boundBox(state, ctx, phases, o);
    if (state.results.canEnter(o, figure.bound_V)) {
      alive[o] = true;
      any = true;
    } else state.results.prune(ctx.ctleIndex, o, figure.bound_V);
    if (firstAlive) score = figure.score_V;
    firstAlive = false;
  }
  // A live half stays live: its bound may be partial (see boundBox), so it is not re-tested later.
  if (any) level.score[h] = score;
  return any;
}

/**
 * Branch and bound below the box `[lo, hi]`: split the widest range (at the sign change first, so
 * that the main tap stays affine), bound both halves, visit the better one first. Stops when the
 * feasibility target is reached.
 */
function descend(
  state: SearchState,
  ctx: CtleContext,
  lo: Int32Array,
  hi: Int32Array,
  alive: readonly boolean[],
  phases: MemberPhases,
  depth: number,
): void {
  const split = splitOf(state, lo, hi);
  if (split.side < 0) {
    if (settingAt(state.grid, lo, state.leafTaps)) evaluateLeaf(state, ctx, state.leafTaps, alive);
    return;
  }
  const level = levelAt(state, depth);
  const parent = { lo, hi, alive, phases };
  let first = -1;
  let second = -1;
  for (const h of [0, 1] as const) {
    if (!boundHalf(state, ctx, level, h, split, parent)) continue;
    if (first < 0) first = h;
    else second = h;
  }
  if (second >= 0 && level.score[second] > level.score[first]) [first, second] = [second, first];
  for (const h of [first, second]) {
    if (h < 0 || state.results.targetReached) return;
    descend(state, ctx, level.lo[h], level.hi[h], level.alive[h], level.phases[h], depth + 1);
  }
}

/**
 * Searches one CTLE setting: the whole FIR grid as one box first; then, for the objectives it
 * leaves alive only (for the others nothing in this CTLE setting can enter the result), the
 * setting's starting points and the branch and bound.
 */
export function searchCtleSetting(state: SearchState, ctx: CtleContext): void {
  const grid = state.grid;
  const lo = new Int32Array(grid.sides.length);
  const hi = Int32Array.from(grid.sideSteps, (g) => g.length - 1);
  if (grid.empty || !setGridBox(state, lo, hi)) return;
  for (const member of ctx.members) member.ranges.reset(state.box);
  const phases = ctx.members.map((member) => boxPhases(state, member, state.allPhases));
  const alive = state.everyone.map((_, o) => {
    const figure = boundBox(state, ctx, phases, o);
    if (state.results.canEnter(o, figure.bound_V)) return true;
    state.results.prune(ctx.ctleIndex, o, figure.bound_V);
    return false;
  });
  if (!alive.some(Boolean)) return;
  for (const s of startsFor(state, ctx.ctleIndex).all) {
    evaluateLeaf(state, ctx, s, alive);
    if (state.results.targetReached) return;
  }
  descend(state, ctx, lo, hi, alive, phases, 0);
}
