// The fewest DFE taps that meet the required headroom, after the optimizer's main pass: bisection of
// the tap count with feasibility passes of the joint search (more taps never hurt).
import type { Pulse } from "../types.ts";
import { evaluateSetting } from "./evaluateSetting.ts";
import { type Candidate, jointSearch, type JointSearchResult } from "./jointSearch.ts";
import type { PreparedChannels } from "./prepareChannels.ts";
import type { SearchStats } from "./search/searchResults.ts";
import type { SearchSpace } from "./searchSpace.ts";

/** The fewest DFE taps and the work the feasibility passes added. */
export interface FewestDfeTaps {
  /** Fewest DFE taps whose best setting meets the required headroom (0: linear suffices; null: none does). */
  readonly taps: number | null;
  /** The main pass's work plus the feasibility passes'. */
  readonly stats: SearchStats;
}

/**
 * Fewest DFE taps that reach `space.budget.requiredHeadroom_V`, given the main pass's best settings
 * with the budget's DFE (`full`) and without (`linear`): bisects between them. A setting already
 * found that meets the requirement with `n` taps proves `n` feasible (the best linear one first: few
 * taps added to it often suffice); otherwise a feasibility pass of {@link jointSearch} decides,
 * visiting the CTLE settings best first by the main pass and starting from the settings it found.
 *
 * @param pulse - channel pulse for a 1 V symbol.
 * @param space - the resolved budget.
 * @param prepared - the channels of the main pass.
 * @param main - the main pass (objectives: the budget's DFE taps, then none).
 * @param full - its best setting with the budget's DFE taps.
 * @param linear - its best setting without DFE.
 */
export function fewestDfeTaps(
  pulse: Pulse,
  space: SearchSpace,
  prepared: PreparedChannels,
  main: JointSearchResult,
  full: Candidate,
  linear: Candidate,
): FewestDfeTaps {
  let stats = { ...main.stats };
  const required = space.budget.requiredHeadroom_V;
  if (!(full.limiterHeadroom_V >= required)) return { taps: null, stats };
  if (linear.limiterHeadroom_V >= required) return { taps: 0, stats };
  let lo = 0; // fails
  let hi = space.dfeCount; // succeeds
  const known = [linear, full, ...main.top];
  const order = space.ctleSettings
    .map((_, ci) => ci)
    .sort((a, b) => main.perCtle[0][b].upperBound_V - main.perCtle[0][a].upperBound_V || a - b);
  const seeds = space.ctleSettings.map((_, ci) =>
    main.perCtle.flatMap((per) => (per[ci].best === null ? [] : [(per[ci].best as Candidate).taps])),
  );
  const feasible = (n: number): boolean => {
    for (const c of known) {
      stats.exact++;
      if (evaluateSetting(prepared.channels[c.ctleIndex], space, c.taps, n).limiterHeadroom_V >= required) return true;
    }
    const r = jointSearch(pulse, space, { dfeCounts: [n], target_V: required, order, seeds }, prepared);
    stats = {
      exact: stats.exact + r.stats.exact,
      heavy: stats.heavy + r.stats.heavy,
      boxes: stats.boxes + r.stats.boxes,
      leaves: stats.leaves + r.stats.leaves,
    };
    return r.best[0] !== null;
  };
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (feasible(mid)) hi = mid;
    else lo = mid;
  }
  return { taps: hi, stats };
}
