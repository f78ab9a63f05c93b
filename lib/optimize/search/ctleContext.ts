// Per CTLE setting, what the search keeps for each member channel: the bound constants and their
// caches, the box-range table, and the buffers the bounds work in; made when first needed.
import { type BoundScratch, createBoundScratch } from "../bound/boundScratch.ts";
import { type BoundSetup, boundSetup } from "../bound/boundSetup.ts";
import { BoxRanges } from "../bound/boxRanges.ts";
import { cachedCoefficients, type CoefficientSource } from "../bound/phaseCoefficients.ts";
import type { CtleChannel } from "../ctleChannel.ts";
import type { CtleSetting, SearchSpace } from "../searchSpace.ts";
import type { SearchState } from "./searchState.ts";

/** One member channel at one CTLE setting. */
export interface MemberContext {
  /** Index of the member in the population. */
  readonly index: number;
  /** The member's own budget (its corner), or the search's. */
  readonly space: SearchSpace;
  readonly channel: CtleChannel;
  readonly setup: BoundSetup;
  readonly coefficients: CoefficientSource;
  /** Ranges of the watched cursors over the box being bounded. */
  readonly ranges: BoxRanges;
  /** Jitter phase that last pruned a box (tried first on the next). */
  firstShift: number;
  /** Timing-criterion coefficients per phase (computed once). */
  readonly criterion: Map<number, Float64Array>;
  readonly scratch: BoundScratch;
  /** The sampling phases the policy may choose for the setting being evaluated (`leafSerial`). */
  leafPhases: readonly number[];
  leafSerial: number;
}

/** One CTLE setting's part of the search. */
export interface CtleContext {
  /** Index of the setting in `space.ctleSettings`. */
  readonly ctleIndex: number;
  readonly setting: CtleSetting;
  readonly members: readonly MemberContext[];
  /** Member evaluated first (the last one found worst). */
  lead: number;
  /** Settings already evaluated here (keys of their grid indices). */
  readonly seen: Set<string>;
}

/** The context of CTLE setting `ctleIndex` (made on first use and kept in the state). */
export function ctleContext(state: SearchState, ctleIndex: number): CtleContext {
  const known = state.contexts[ctleIndex];
  if (known !== undefined) return known;
  const ctx: CtleContext = {
    ctleIndex,
    setting: state.space.ctleSettings[ctleIndex],
    lead: 0,
    seen: new Set<string>(),
    members: state.members.map((m, index) => memberContext(state, index, m.channels[ctleIndex])),
  };
  state.contexts[ctleIndex] = ctx;
  return ctx;
}

function memberContext(state: SearchState, index: number, channel: CtleChannel): MemberContext {
  const space = state.members[index].space ?? state.space;
  const setup = boundSetup(space, channel, state.maxDfeCount);
  const coefficients = cachedCoefficients(setup, space, channel);
  // The box table spans the window widened by the farthest jitter phase.
  let reach = 0;
  for (const shift of setup.shifts) reach = Math.max(reach, Math.abs(shift));
  return {
    index,
    space,
    channel,
    setup,
    coefficients,
    ranges: new BoxRanges(setup, coefficients, state.window.lo - reach, state.window.hi + reach),
    firstShift: 0,
    criterion: new Map<number, Float64Array>(),
    scratch: createBoundScratch(setup),
    leafPhases: state.allPhases,
    leafSerial: -1,
  };
}
