// The CTLE channels of a search space, filtered once and shared by every pass of the joint search
// over the grid (and one set per member of a population).
import type { Pulse } from "../types.ts";
import { type CtleChannel, filteredChannel, phaseReach } from "./ctleChannel.ts";
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

/** Filters the pulse through every CTLE setting of the grid ({@link ctleGridPulses}: four inverse FFTs in all). */
export function prepareChannels(pulse: Pulse, space: SearchSpace): PreparedChannels {
  const maxPhase = phaseReach(space, pulse.samplesPerUi);
  const pulses = ctleGridPulses(pulse, space.ctleCorners, space.ctleSettings);
  return { channels: space.ctleSettings.map((s, i) => filteredChannel(pulses[i], space, s, maxPhase)), space };
}
