// Working memory of the leaf and box bounds, owned by the caller (one per search member), so the
// bounds keep no state of their own and may run for several searches at once.
import type { BoundSetup } from "./boundSetup.ts";

/** Largest number of cursors in the joint bound of a box. */
export const JOINT_CURSORS = 3;

/** Caller-owned buffers of {@link leafBound} and {@link boxBound}; one per caller, never shared by two calls at once. */
export interface BoundScratch {
  /** Residual magnitude per watched cursor after the main one (sorted in place by the bound). */
  readonly residuals: Float64Array;
  /** The joint bound's picked cursors: watched index, sign, whether it is a change between phases, least magnitude. */
  readonly jointCursors: Int32Array;
  readonly jointSigns: Float64Array;
  readonly jointChange: Uint8Array;
  readonly jointMags: Float64Array;
  /** The joint figure's maxima over the box for the first 1 … picked cursors. */
  readonly jointMax: Float64Array;
}

/** Fresh buffers for the bounds of one channel's setup. */
export function createBoundScratch(setup: BoundSetup): BoundScratch {
  return {
    residuals: new Float64Array(setup.offsets.length),
    jointCursors: new Int32Array(JOINT_CURSORS),
    jointSigns: new Float64Array(JOINT_CURSORS),
    jointChange: new Uint8Array(JOINT_CURSORS),
    jointMags: new Float64Array(JOINT_CURSORS),
    jointMax: new Float64Array(JOINT_CURSORS),
  };
}
