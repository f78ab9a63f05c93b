// The joint search over CTLE grid × transmit FIR grid × closed-form DFE: branch and bound over the
// FIR taps with rigorous headroom bounds, so the answer equals exhaustive evaluation of the grid.
// This file checks the request and runs the steps; the steps live in ./search/ and ./bound/.
import type { Pulse } from "../types.ts";
import { type PreparedChannels, prepareChannels } from "./prepareChannels.ts";
import { searchCtleSetting } from "./search/boxSearch.ts";
import { ctleContext } from "./search/ctleContext.ts";
import { ctleOrder } from "./search/ctleOrder.ts";
import { evaluateLeaf } from "./search/leafCascade.ts";
import type { SearchStats } from "./search/searchResults.ts";
import { createSearchState } from "./search/searchState.ts";
import { startsFor } from "./search/startingPoints.ts";
import { warmStart } from "./search/warmStart.ts";
import { type CtleSetting, type SearchSpace, sharedGridMismatch } from "./searchSpace.ts";

/** One evaluated setting. */
export interface Candidate {
  /** Index of the CTLE setting in `space.ctleSettings`. */
  readonly ctleIndex: number;
  readonly ctle: CtleSetting;
  /** Transmit FIR taps (fractions of the peak swing), main tap `taps[pre]`. */
  readonly taps: Float64Array;
  readonly dfeCount: number;
  /** Sampling phase in samples relative to the equalized pulse's nominal main cursor. */
  readonly phase: number;
  readonly dfeTaps: Float64Array;
  readonly dfeClipped: readonly boolean[];
  readonly eyeHeight_V: number;
  readonly limiterHeadroom_V: number;
  /** For a population, the member whose headroom this is (the worst); 0 for one channel. */
  readonly worstMember: number;
}

/** What is known about one CTLE setting after the search. */
export interface CtleOutcome {
  /** The best setting found with this CTLE (null when none was evaluated). */
  readonly best: Candidate | null;
  /** No FIR setting with this CTLE does better than this (volts; −Infinity when none is legal). */
  readonly upperBound_V: number;
  /** True when `best` is this CTLE's optimum (its headroom reaches `upperBound_V`). */
  readonly exact: boolean;
}

/** Options of {@link jointSearch}. */
export interface JointSearchOptions {
  /** DFE tap counts to optimize for, searched together (e.g. `[budget taps, 0]`). */
  readonly dfeCounts: readonly number[];
  /** Number of best settings kept (and proven) for the first DFE count (default 5). */
  readonly topCount?: number;
  /**
   * Feasibility mode: stop at the first setting whose headroom (first DFE count) reaches this value.
   * Then `best` is that setting, or null when no setting reaches it.
   */
  readonly target_V?: number;
  /** Reports the fraction of CTLE settings done (0 … 1). */
  readonly onProgress?: (fraction: number) => void;
  /**
   * The order in which to search the CTLE settings (indices into `space.ctleSettings`, each once),
   * e.g. best first by an earlier pass. Default: best first by the single-law bound of each
   * setting's first starting point.
   */
  readonly order?: readonly number[];
  /** Further starting points per CTLE setting (indexed like `space.ctleSettings`), tried before its own. */
  readonly seeds?: readonly (readonly Float64Array[])[];
}

/** What the search found. */
export interface JointSearchResult {
  /** Best setting per DFE count (null when no FIR setting is legal, or none reaches the target). */
  readonly best: (Candidate | null)[];
  /** Per DFE count and CTLE setting (in `space.ctleSettings` order), its best and its bound. */
  readonly perCtle: CtleOutcome[][];
  /** The best settings for the first DFE count, best first (exact: no other setting beats the last). */
  readonly top: Candidate[];
  /** Work done: exact evaluations, single-law bounds, bounded boxes, leaves reached. */
  readonly stats: SearchStats;
}

/**
 * Searches the CTLE grid × transmit FIR grid (every setting `enumerateTxFirs` yields) with the DFE in
 * closed form, for each requested DFE count, maximizing the limiter headroom at the target BER under
 * the budget's sampling policy.
 *
 * The starting points of every CTLE setting (plain, MMSE and zero-forcing FIRs) are bounded first,
 * and the CTLE settings are then searched best first; in the first one, a short steepest-ascent walk
 * on the light bound from the best starting point picks the settings evaluated before the rest, so
 * that the thresholds start near their final values. Per CTLE setting the side taps are searched depth-first,
 * one per level; every box of settings is bounded by {@link boxBound} over the sampling phases the
 * policy can choose for it, and dropped when nothing in it can beat the threshold (the K-th best
 * headroom found so far for the first DFE count, the best for the others). Leaves pass four tiers:
 * {@link leafBound} (the watched cursors), {@link lightPhaseBound} (every cursor, no law built),
 * {@link heavyPhaseBound} (one exact law), then the exact eye. No bound ever
 * underestimates, so `best` and `top` are what exhaustive evaluation of the grid gives (exact ties
 * may resolve to an equally good setting), and every CTLE setting reports its optimum or a bound.
 *
 * Given several channels (a population: one {@link PreparedChannels} per member, same UI), the
 * figure of a setting is the worst member's headroom (each member samples at its own policy phase
 * and sets its own DFE): every bound is the least of the members' bounds, and the search is exact
 * for this minimax objective too. A member prepared under its own budget (a corner: other swing,
 * noise, jitter or sensitivity; the same grids, see {@link sharedGridMismatch}) is evaluated and
 * bounded under it.
 *
 * @param pulse - channel pulse for a 1 V symbol (used when `prepared` is not given; else only its
 *   samplesPerUi).
 * @param space - the resolved budget.
 * @param options - DFE counts, top-K size, feasibility target, progress callback.
 * @param prepared - channels from {@link prepareChannels} (to share between passes), or one per
 *   member of a population.
 */
export function jointSearch(
  pulse: Pulse,
  space: SearchSpace,
  options: JointSearchOptions,
  prepared: PreparedChannels | readonly PreparedChannels[] = prepareChannels(pulse, space),
): JointSearchResult {
  const dfeCounts = options.dfeCounts;
  if (dfeCounts.length === 0) throw new RangeError("dfeCounts must hold at least one DFE tap count");
  for (const n of dfeCounts) {
    if (!Number.isInteger(n) || n < 0 || n > space.dfeCount) {
      throw new RangeError(`dfeCounts must hold integers 0…${space.dfeCount} (the budget's DFE taps), got ${n}`);
    }
  }
  const topCount = options.topCount ?? 5;
  if (!Number.isInteger(topCount) || topCount < 1)
    throw new RangeError(`topCount must be an integer ≥ 1, got ${topCount}`);
  const target_V = options.target_V;
  if (target_V !== undefined && !Number.isFinite(target_V))
    throw new RangeError(`target_V must be finite, got ${target_V}`);
  const members: readonly PreparedChannels[] = Array.isArray(prepared) ? prepared : [prepared as PreparedChannels];
  if (members.length === 0) throw new RangeError("prepared must hold at least one channel");
  for (const [i, m] of members.entries()) {
    if (m.channels.length !== space.ctleSettings.length)
      throw new RangeError("prepared channels do not match the CTLE grid");
    const differs = m.space === undefined ? null : sharedGridMismatch(space, m.space);
    if (differs !== null)
      throw new RangeError(
        `prepared[${i}] was prepared under a budget whose ${differs} differs from the search's; members share the grids`,
      );
    if (m.channels.some((c) => c.pulse.samplesPerUi !== pulse.samplesPerUi)) {
      throw new RangeError("every member must have the same samplesPerUi");
    }
  }
  const ctleCount = space.ctleSettings.length;
  const given = options.order;
  if (given !== undefined) {
    const hit = new Uint8Array(ctleCount);
    for (const ci of given) {
      if (!Number.isInteger(ci) || ci < 0 || ci >= ctleCount || hit[ci] === 1) {
        throw new RangeError(`order must list every CTLE setting index 0…${ctleCount - 1} once`);
      }
      hit[ci] = 1;
    }
    if (given.length !== ctleCount)
      throw new RangeError(`order must list every CTLE setting index 0…${ctleCount - 1} once`);
  }
  if (options.seeds !== undefined && options.seeds.length !== ctleCount) {
    throw new RangeError(`seeds must hold one list per CTLE setting (${ctleCount}), got ${options.seeds.length}`);
  }

  const state = createSearchState(
    space,
    { dfeCounts, topCount, target_V, seeds: options.seeds },
    members,
    pulse.samplesPerUi,
  );
  const order = given !== undefined ? [...given] : ctleOrder(state);
  for (let done = 0; done < ctleCount; done++) {
    const ctx = ctleContext(state, order[done]);
    // Optimizing (not a feasibility pass): the warm start's settings set the thresholds first.
    if (done === 0 && target_V === undefined) {
      for (const taps of warmStart(state, ctx, startsFor(state, ctx.ctleIndex).all))
        evaluateLeaf(state, ctx, taps, state.everyone);
    }
    searchCtleSetting(state, ctx);
    if (state.results.targetReached) break;
    options.onProgress?.((done + 1) / ctleCount);
  }
  return state.results.result();
}
