// The exact figure of one equalizer setting: the statistical eye of the equalized cursors at the
// policy's sampling phase, with the closed-form (clipped) DFE, and the limiter headroom it leaves.
import { type StatisticalEye, statisticalEyeOfCursors } from "../analysis/statisticalEye.ts";
import { criterionLag, criterionPhase, defaultPhaseWindow } from "../clocking/samplingPhase.ts";
import type { CrosstalkParts } from "../crosstalk/crosstalkParts.ts";
import { dfeTaps } from "../equalizers/dfeTaps.ts";
import { crosstalkFor } from "./channelCrosstalk.ts";
import { type CtleChannel, equalizedCursors } from "./ctleChannel.ts";
import type { SearchSpace } from "./searchSpace.ts";

/**
 * Jitter weights below `edgeTail × KERNEL_FLOOR_FACTOR` are left out of every eye the optimizer
 * evaluates: they move a level's tail at the target by less than a millionth of it.
 */
export const KERNEL_FLOOR_FACTOR = 1e-6;

/** The jitter-kernel floor of a search space's eyes. */
export function kernelFloorOf(space: SearchSpace): number {
  return Math.min(1e-3, space.edgeTail * KERNEL_FLOOR_FACTOR);
}

/** A setting's statistical eye at one sampling phase, built lazily (laws computed on demand). */
export interface PreparedEye {
  /** Sampling phase in samples relative to the equalized pulse's nominal main cursor. */
  readonly phase: number;
  /** Closed-form DFE taps at this phase (volts), clipped to the budget's limits. */
  readonly dfeTaps: Float64Array;
  /** Whether each DFE tap hit its limit. */
  readonly dfeClipped: readonly boolean[];
  /** The statistical eye (DFE and crosstalk included). */
  readonly eye: StatisticalEye;
  /** The crosstalk in the eye (null: no aggressors, or left out). */
  readonly crosstalk: CrosstalkParts | null;
}

/** The eye of one setting at one sampling phase, with its figures. */
export interface PhaseEye extends PreparedEye {
  /** Vertical opening at the target BER, volts. */
  readonly eyeHeight_V: number;
  /** `eyeHeight_V − limiterSensitivity_V`. */
  readonly limiterHeadroom_V: number;
}

/**
 * Prepares the statistical eye of CTLE channel + transmit FIR `taps` with a DFE of `dfeCount` taps
 * set in closed form at `phase`: each tap equals its post-cursor there, clipped to its limit. The
 * channel's aggressors ({@link crosstalkFor}: each at its worst phase, FEXT through `taps` unless its
 * FIR is its own) add their parts to every law and their lumped variance to the noise; the DFE
 * cancels none of them. `withCrosstalk = false` leaves them out (the eye without crosstalk).
 */
export function prepareEye(
  channel: CtleChannel,
  space: SearchSpace,
  taps: ArrayLike<number>,
  dfeCount: number,
  phase: number,
  withCrosstalk = true,
): PreparedEye {
  const pre = space.firSpec.pre;
  const at = equalizedCursors(channel, taps, pre, phase, space.scale_V);
  const dfe = dfeTaps(at, dfeCount, space.dfeLimits_V.subarray(0, dfeCount));
  const jittered = space.jitter.rjRms_UI > 0 || space.jitter.djPp_UI > 0;
  const crosstalk = withCrosstalk && channel.crosstalk !== null ? crosstalkFor(channel.crosstalk, taps) : null;
  const eye = statisticalEyeOfCursors(
    {
      samplesPerUi: channel.pulse.samplesPerUi,
      cursorsAt: (p: number) => (p === phase ? at : equalizedCursors(channel, taps, pre, p, space.scale_V)),
    },
    {
      modulation: space.modulation,
      noiseRms_V:
        crosstalk === null ? channel.noiseRms_V : Math.sqrt(channel.noiseRms_V ** 2 + crosstalk.lumpedVariance_V2),
      jitter: jittered ? space.jitter : undefined,
      dfeTaps: dfe.taps,
      kernelFloor: kernelFloorOf(space),
      targetBer: space.budget.targetBer,
      ...(crosstalk === null ? {} : { extraParts_V: crosstalk.parts_V }),
    },
  );
  return { phase, dfeTaps: dfe.taps, dfeClipped: dfe.clipped, eye, crosstalk };
}

/** Completes a prepared eye: eye height at the target BER and the limiter headroom. */
export function finishEye(space: SearchSpace, prepared: PreparedEye): PhaseEye {
  const eyeHeight_V = prepared.eye.eyeHeight(prepared.phase, space.budget.targetBer);
  return { ...prepared, eyeHeight_V, limiterHeadroom_V: eyeHeight_V - space.budget.limiterSensitivity_V };
}

/**
 * Upper bound on the headroom of a prepared eye from the single law at phase `phase + shift` with
 * jitter weight `weight` there: the mixed tail is at least `weight` times that law's tail, so the
 * upper edge is at most `L·g₀ + q(b/weight)` (same law, same numbers as the full evaluation). With no
 * jitter (`shift` 0, `weight` 1) the bound is the headroom itself.
 */
export function heavyPhaseBound(space: SearchSpace, prepared: PreparedEye, shift: number, weight: number): number {
  const b = space.edgeTail / weight;
  if (!(b < 0.5)) return Number.POSITIVE_INFINITY;
  const p = prepared.phase + shift;
  const q = prepared.eye.distribution(p).quantile(b);
  const eye = space.levelGap * prepared.eye.main(p) + 2 * q;
  return (eye > 0 ? eye : 0) - space.budget.limiterSensitivity_V + 1e-12;
}

/**
 * {@link heavyPhaseBound} without building the law: the same bound with the law's quantile replaced
 * by an upper bound on it ({@link StatisticalEye.quantileBound}); a few times cheaper, and within a
 * fraction of the noise rms of it.
 */
export function lightPhaseBound(space: SearchSpace, prepared: PreparedEye, shift: number, weight: number): number {
  const b = space.edgeTail / weight;
  if (!(b < 0.5)) return Number.POSITIVE_INFINITY;
  const p = prepared.phase + shift;
  const q = prepared.eye.quantileBound(p, b);
  const eye = space.levelGap * prepared.eye.main(p) + 2 * q;
  return (eye > 0 ? eye : 0) - space.budget.limiterSensitivity_V + 1e-12;
}

/** {@link prepareEye} and {@link finishEye} in one step (`withCrosstalk = false`: the eye without the aggressors). */
export function phaseEye(
  channel: CtleChannel,
  space: SearchSpace,
  taps: ArrayLike<number>,
  dfeCount: number,
  phase: number,
  withCrosstalk = true,
): PhaseEye {
  return finishEye(space, prepareEye(channel, space, taps, dfeCount, phase, withCrosstalk));
}

/**
 * Main cursor of the equalized pulse at phase `t` (samples, fractional allowed by linear
 * interpolation between phases), for the timing criteria.
 */
export function equalizedMain(
  channel: CtleChannel,
  space: SearchSpace,
  taps: ArrayLike<number>,
): (t: number) => number {
  const pre = space.firSpec.pre;
  const at = (p: number): number => {
    const h = channel.cursors(p);
    let s = 0;
    for (let j = 0; j < taps.length; j++) {
      const i = channel.pre + pre - j;
      if (i >= 0 && i < h.length) s += taps[j] * h[i];
    }
    return s * space.scale_V;
  };
  return (t: number) => {
    const b = Math.floor(t);
    const f = t - b;
    const a = at(b);
    return f === 0 ? a : a + f * (at(b + 1) - a);
  };
}

/** The sampling phase of a timing-criterion policy ("centre" or "mueller-muller") for these taps. */
export function criterionPhaseOf(channel: CtleChannel, space: SearchSpace, taps: ArrayLike<number>): number {
  if (space.policy === "max-height") throw new RangeError("max-height has no timing criterion; scan the phases");
  const spu = channel.pulse.samplesPerUi;
  return criterionPhase(equalizedMain(channel, space, taps), criterionLag(space.policy, spu), defaultPhaseWindow(spu));
}

/**
 * The eye of a setting under the budget's sampling policy: at the criterion's phase ("centre",
 * "mueller-muller"), or at the phase of the largest eye height in the ±½ UI window ("max-height";
 * the first, scanning outward from 0, on ties).
 */
export function evaluateSetting(
  channel: CtleChannel,
  space: SearchSpace,
  taps: ArrayLike<number>,
  dfeCount: number,
): PhaseEye {
  if (space.policy !== "max-height")
    return phaseEye(channel, space, taps, dfeCount, criterionPhaseOf(channel, space, taps));
  const w = defaultPhaseWindow(channel.pulse.samplesPerUi);
  let best = phaseEye(channel, space, taps, dfeCount, 0);
  for (let d = 1; d <= w.hi - w.lo; d++) {
    for (const t of [-d, d]) {
      if (t < w.lo || t > w.hi) continue;
      const e = phaseEye(channel, space, taps, dfeCount, t);
      if (e.limiterHeadroom_V > best.limiterHeadroom_V) best = e;
    }
  }
  return best;
}
