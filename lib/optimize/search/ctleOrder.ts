// The order in which the joint search visits the CTLE settings: best first by a cheap estimate of
// their starting points, so that the setting searched first usually holds the optimum.
import { leafBound } from "../bound/leafBound.ts";
import { criterionPhaseOf } from "../evaluateSetting.ts";
import { ctleContext } from "./ctleContext.ts";
import { lightEstimate } from "./lightEstimate.ts";
import type { SearchState } from "./searchState.ts";
import { startsFor } from "./startingPoints.ts";

/**
 * CTLE setting indices, best first by the best {@link lightEstimate} of their ranking starting points
 * for the first objective (per starting point the least over the members, at phase 0 for
 * "max-height", else at the policy's phase): close to the best of their exact figures. Ties keep the
 * grid's order. A population ranks by its first member's starting points.
 */
export function ctleOrder(state: SearchState): number[] {
  const space = state.space;
  const dfeCount = state.dfeCounts[0];
  const keys = space.ctleSettings.map((_, i) => {
    const ctx = ctleContext(state, i);
    const starts = startsFor(state, i);
    let best = Number.NEGATIVE_INFINITY;
    for (const s of starts.all.slice(0, starts.ranking)) {
      let key = Number.POSITIVE_INFINITY;
      for (const member of ctx.members) {
        const phase = space.policy === "max-height" ? 0 : criterionPhaseOf(member.channel, member.space, s);
        const leaf = leafBound(member.setup, member.coefficients, phase, s, dfeCount, member.scratch);
        key = Math.min(key, lightEstimate(member.space, member, s, dfeCount, phase, leaf));
      }
      if (key > best) best = key;
    }
    return best;
  });
  return keys.map((_, i) => i).sort((a, b) => keys[b] - keys[a] || a - b);
}
