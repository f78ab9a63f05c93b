// The figure of one transmit FIR setting, through a cascade of ever tighter bounds: the leaf bound
// (watched cursors), the light bound (every cursor, no law built), the heavy bound (one exact law),
// and only then the exact eye.
import { leafBound } from "../bound/leafBound.ts";
import { sortedCrosstalkParts } from "../channelCrosstalk.ts";
import {
  criterionPhaseOf,
  finishEye,
  heavyPhaseBound,
  lightPhaseBound,
  type PhaseEye,
  prepareEye,
} from "../evaluateSetting.ts";
import type { CtleContext, MemberContext } from "./ctleContext.ts";
import type { SearchState } from "./searchState.ts";

/** One member's figure for a setting: its eye when known exactly, else a bound on its headroom. */
interface MemberFigure {
  readonly eye: PhaseEye | null;
  readonly bound_V: number;
}

/**
 * One member's figure for FIR `taps` and objective `o`: the tiers over the policy's phases. Returns
 * its eye when known exactly (and at least every pruned phase's bound), else null and a bound on its
 * headroom.
 */
function memberFigure(state: SearchState, member: MemberContext, taps: Float64Array, o: number): MemberFigure {
  const { space, results } = state;
  const dfeCount = state.dfeCounts[o];
  if (member.leafSerial !== state.leafSerial) {
    member.leafPhases =
      space.policy === "max-height" ? state.allPhases : [criterionPhaseOf(member.channel, member.space, taps)];
    member.leafSerial = state.leafSerial;
  }
  const setup = member.setup;
  // Aggressors that follow these taps are known exactly at a leaf: the leaf bound holds their parts too.
  const crosstalk = member.channel.crosstalk === null ? null : sortedCrosstalkParts(member.channel.crosstalk, taps);
  let bestEye: PhaseEye | null = null;
  let worstPruned = Number.NEGATIVE_INFINITY;
  for (const t of member.leafPhases) {
    const floor = bestEye === null ? Number.NEGATIVE_INFINITY : bestEye.limiterHeadroom_V;
    const leaf = leafBound(setup, member.coefficients, t, taps, dfeCount, member.scratch, crosstalk ?? undefined);
    const leafBound_V = leaf.bound_V;
    if (!results.canEnter(o, leafBound_V) || !(leafBound_V > floor)) {
      worstPruned = Math.max(worstPruned, leafBound_V);
      continue;
    }
    const prepared = prepareEye(member.channel, member.space, taps, dfeCount, t);
    const jittered = setup.shifts.length !== 0;
    const shift = jittered ? setup.shifts[leaf.shiftIndex] : 0;
    const weight = jittered ? setup.weights[leaf.shiftIndex] : 1;
    const lightBound_V = lightPhaseBound(member.space, prepared, shift, weight);
    if (!results.canEnter(o, lightBound_V) || !(lightBound_V > floor)) {
      worstPruned = Math.max(worstPruned, lightBound_V);
      continue;
    }
    results.stats.heavy++;
    const heavyBound_V = jittered ? heavyPhaseBound(member.space, prepared, shift, weight) : Number.POSITIVE_INFINITY;
    if (!results.canEnter(o, heavyBound_V) || !(heavyBound_V > floor)) {
      worstPruned = Math.max(worstPruned, heavyBound_V);
      continue;
    }
    results.stats.exact++;
    const e = finishEye(member.space, prepared);
    if (bestEye === null || e.limiterHeadroom_V > bestEye.limiterHeadroom_V) bestEye = e;
  }
  if (bestEye !== null && bestEye.limiterHeadroom_V >= worstPruned)
    return { eye: bestEye, bound_V: bestEye.limiterHeadroom_V };
  return { eye: null, bound_V: Math.max(worstPruned, bestEye?.limiterHeadroom_V ?? Number.NEGATIVE_INFINITY) };
}

/**
 * Evaluates FIR `taps` in one CTLE setting for the live objectives (`alive`) and records what can
 * enter the result: the worst member counts, and a member that cannot pass the threshold ends the
 * evaluation early (it is evaluated first next time). A setting is evaluated once per CTLE setting.
 */
export function evaluateLeaf(
  state: SearchState,
  ctx: CtleContext,
  taps: Float64Array,
  alive: readonly boolean[],
): void {
  const key = Array.from(taps, (c) => Math.round(c / state.grid.step)).join(",");
  if (ctx.seen.has(key)) return;
  ctx.seen.add(key);
  const results = state.results;
  results.stats.leaves++;
  state.leafSerial++;
  const memberCount = ctx.members.length;
  for (let o = 0; o < state.objectiveCount; o++) {
    if (!alive[o]) continue;
    let worst: { eye: PhaseEye; member: number } | null = null;
    let cut = false;
    for (let i = 0; i < memberCount; i++) {
      const m = (ctx.lead + i) % memberCount;
      const r = memberFigure(state, ctx.members[m], taps, o);
      if (r.eye === null) {
        results.prune(ctx.ctleIndex, o, r.bound_V);
        ctx.lead = m;
        cut = true;
        break;
      }
      if (worst === null || r.eye.limiterHeadroom_V < worst.eye.limiterHeadroom_V) worst = { eye: r.eye, member: m };
      if (i < memberCount - 1 && !results.canEnter(o, worst.eye.limiterHeadroom_V)) {
        results.prune(ctx.ctleIndex, o, worst.eye.limiterHeadroom_V);
        ctx.lead = m;
        cut = true;
        break;
      }
    }
    if (!cut && worst !== null) {
      results.record(ctx.ctleIndex, ctx.setting, o, taps, worst.eye, worst.member);
      if (results.targetReached) return;
    }
  }
}
