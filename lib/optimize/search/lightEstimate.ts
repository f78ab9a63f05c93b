// A cheap estimate of a setting's headroom at one phase from the first two tiers of the leaf
// cascade: what orders the CTLE settings and guides the warm-start climb (never what prunes).
import type { LeafBound } from "../bound/leafBound.ts";
import { lightPhaseBound, prepareEye } from "../evaluateSetting.ts";
import type { SearchSpace } from "../searchSpace.ts";
import type { MemberContext } from "./ctleContext.ts";

/**
 * The lesser of a setting's leaf bound `leaf` (at `phase`) and its light bound at the jitter phase
 * that gave it: within a fraction of a millivolt of the exact headroom, in volts.
 */
export function lightEstimate(
  space: SearchSpace,
  member: MemberContext,
  taps: Float64Array,
  dfeCount: number,
  phase: number,
  leaf: LeafBound,
): number {
  const setup = member.setup;
  const light =
    setup.shifts.length === 0
      ? leaf.bound_V
      : lightPhaseBound(
          space,
          prepareEye(member.channel, space, taps, dfeCount, phase),
          setup.shifts[leaf.shiftIndex],
          setup.weights[leaf.shiftIndex],
        );
  return Math.min(leaf.bound_V, light);
}
