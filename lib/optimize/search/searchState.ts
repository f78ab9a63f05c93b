// The joint search's one state object: the problem (space, objectives, members, FIR grid, sampling
// phases), what has been found, and the per-CTLE contexts and buffers that every step shares.
import { defaultPhaseWindow, type PhaseWindow } from "../../clocking/samplingPhase.ts";
import { createTapBox, type TapBox } from "../bound/tapBox.ts";
import type { PreparedChannels } from "../prepareChannels.ts";
import type { SearchSpace } from "../searchSpace.ts";
import type { BoxLevel } from "./boxSearch.ts";
import type { CtleContext } from "./ctleContext.ts";
import { createCriterionTable, type CriterionTable } from "./criterionPhases.ts";
import { type FirGrid, firGrid } from "./firGrid.ts";
import { SearchResults } from "./searchResults.ts";
import type { CtleStarts } from "./startingPoints.ts";

/** Everything one run of the joint search reads and writes. */
export interface SearchState {
  readonly space: SearchSpace;
  /** DFE tap count per objective; the first objective keeps the top list. */
  readonly dfeCounts: readonly number[];
  readonly objectiveCount: number;
  readonly maxDfeCount: number;
  /** The population's members (one for a single channel), each with a channel per CTLE setting. */
  readonly members: readonly PreparedChannels[];
  readonly samplesPerUi: number;
  readonly grid: FirGrid;
  /** The ±½ UI window of sampling phases, samples from the main cursor. */
  readonly window: PhaseWindow;
  /** Every phase of the window, 0 first, then −1, 1, −2, 2, … */
  readonly allPhases: readonly number[];
  /** Every objective alive. */
  readonly everyone: readonly boolean[];
  /** The caller's extra starting points per CTLE setting. */
  readonly seeds: readonly (readonly Float64Array[])[] | undefined;
  readonly results: SearchResults;
  /** Per CTLE setting, its context and its starting points (made when first needed). */
  readonly contexts: (CtleContext | undefined)[];
  readonly starts: (CtleStarts | undefined)[];
  /** Serial number of the setting being evaluated (members keep their policy's phases per setting). */
  leafSerial: number;
  /** The box being bounded: one buffer for the whole search. */
  readonly box: TapBox;
  /** Ranges of the timing criterion over the box being bounded. */
  readonly criterion: CriterionTable;
  /** The branch and bound's halves per depth, kept for the whole search. */
  readonly levels: BoxLevel[];
  /** The setting at a leaf of the branch and bound. */
  readonly leafTaps: Float64Array;
}

/** What a search is asked for (validated by the caller). */
export interface SearchRequest {
  readonly dfeCounts: readonly number[];
  readonly topCount: number;
  readonly target_V: number | undefined;
  readonly seeds: readonly (readonly Float64Array[])[] | undefined;
}

/** A fresh state for searching `space` for every member at once. */
export function createSearchState(
  space: SearchSpace,
  request: SearchRequest,
  members: readonly PreparedChannels[],
  samplesPerUi: number,
): SearchState {
  const ctleCount = space.ctleSettings.length;
  const grid = firGrid(space.firSpec);
  const window = defaultPhaseWindow(samplesPerUi);
  const allPhases: number[] = [0];
  for (let d = 1; d <= window.hi; d++) allPhases.push(-d, d);
  const objectiveCount = request.dfeCounts.length;
  return {
    space,
    dfeCounts: request.dfeCounts,
    objectiveCount,
    maxDfeCount: Math.max(...request.dfeCounts),
    members,
    samplesPerUi,
    grid,
    window,
    allPhases,
    everyone: new Array<boolean>(objectiveCount).fill(true),
    seeds: request.seeds,
    results: new SearchResults(request.dfeCounts, ctleCount, request.topCount, request.target_V),
    contexts: new Array<CtleContext | undefined>(ctleCount),
    starts: new Array<CtleStarts | undefined>(ctleCount),
    leafSerial: 0,
    box: createTapBox(grid.tapCount, grid.mainIndex),
    criterion: createCriterionTable(window),
    levels: [],
    leafTaps: new Float64Array(grid.tapCount),
  };
}
