// The CTLE channels of a search space, filtered once and shared by every pass of the joint search
// over the grid (and one set per member of a population).
import { checkLinkAggressors, type LinkAggressor } from "../crosstalk/linkAggressor.ts";
import { applyFrontEnd } from "../package/frontEnd.ts";
import type { Pulse } from "../types.ts";
import { type CtleChannel, phaseReach, receiverChannel } from "./ctleChannel.ts";
import { ctleGridPulses } from "./ctleGridPulses.ts";
import type { SearchSpace } from "./searchSpace.ts";

/** The CTLE channels of a search space, filtered once and shared by every pass over the grid. */
export interface PreparedChannels {
  /** One channel per CTLE setting, in `space.ctleSettings` order. */
  readonly channels: readonly CtleChannel[];
  /**
   * The budget the channels were prepared under. A member of a population may have its own (a
   * corner: other swing, noise, jitter or sensitivity, the same grids); absent means the search's.
   */
  readonly space?: SearchSpace;
}

/**
 * Filters the pulse and its aggressors through the budget's front end (packages, receiver bandwidth)
 * and every CTLE setting of the grid ({@link ctleGridPulses}: four inverse FFTs per pulse), then
 * prepares each setting's channel ({@link receiverChannel}: receive FFE, noise, crosstalk).
 *
 * @param pulse - the victim's pulse for a 1 V symbol.
 * @param space - the resolved budget.
 * @param aggressors - its aggressors' crosstalk pulses at the receiver's pins (same grid).
 */
export function prepareChannels(
  pulse: Pulse,
  space: SearchSpace,
  aggressors: readonly LinkAggressor[] = [],
): PreparedChannels {
  checkLinkAggressors(aggressors, pulse);
  const maxPhase = phaseReach(space, pulse.samplesPerUi);
  const grid = (p: Pulse) => ctleGridPulses(applyFrontEnd(p, space.frontEnd), space.ctleCorners, space.ctleSettings);
  const pulses = grid(pulse);
  const crosstalk = aggressors.map((a) => grid(a.pulse));
  return {
    channels: space.ctleSettings.map((s, i) =>
      receiverChannel(
        pulses[i],
        space,
        s,
        maxPhase,
        aggressors.map((a, j) => ({ ...a, pulse: crosstalk[j][i] })),
      ),
    ),
    space,
  };
}
