// A member's own optimum: the best setting of the budget's grid for that channel alone, the yardstick
// a class default is compared with (and one of the candidates it is rounded from).
import type { BudgetInput } from "../contract/budget.ts";
import { jointSearch } from "../optimize/jointSearch.ts";
import { type PreparedChannels, prepareChannels } from "../optimize/prepareChannels.ts";
import { searchSpace } from "../optimize/searchSpace.ts";
import type { Pulse } from "../types.ts";

/** A channel's best setting alone (plain JSON, so a job can hand it to another). */
export interface OwnOptimum {
  /** Transmit FIR taps from the earliest pre-cursor tap (fractions of the peak swing). */
  readonly taps: number[];
  readonly ctle: { readonly gDc_dB: number; readonly gDc2_dB: number };
  /** Limiter headroom at the target BER with the budget's DFE taps adapted, volts. */
  readonly limiterHeadroom_V: number;
}

/**
 * The channel's own optimum under the budget: the exact best of the transmit FIR × CTLE grid with
 * the budget's DFE taps (the joint search, one member).
 *
 * @param pulse - the channel's pulse for a 1 V symbol.
 * @param budget - the budget (a corner's, for a member at a corner).
 * @param prepared - the channel already filtered by the budget's CTLE grid (to share with other searches).
 * @throws RangeError when the budget does not fit the pulse or no transmit FIR setting is legal.
 */
export function ownOptimum(pulse: Pulse, budget: BudgetInput, prepared?: PreparedChannels): OwnOptimum {
  const space = searchSpace(pulse, budget);
  const r = jointSearch(
    pulse,
    space,
    { dfeCounts: [space.dfeCount], topCount: 1 },
    prepared ?? prepareChannels(pulse, space),
  );
  const best = r.best[0];
  if (best === null)
    throw new RangeError("budget.tx: no transmit FIR setting satisfies the tap ranges, the step and Σ|c| ≤ 1");
  return {
    taps: Array.from(best.taps),
    ctle: { gDc_dB: best.ctle.gDc_dB, gDc2_dB: best.ctle.gDc2_dB },
    limiterHeadroom_V: best.limiterHeadroom_V,
  };
}
