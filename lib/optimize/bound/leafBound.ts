// Upper bound on the limiter headroom of one transmit FIR setting at one sampling phase, from the
// watched cursors alone: the first and cheapest tier of the joint search's leaf cascade.
import type { BoundScratch } from "./boundScratch.ts";
import type { BoundSetup } from "./boundSetup.ts";
import type { CoefficientSource } from "./phaseCoefficients.ts";
import { residualBound } from "./residualBound.ts";

/** A leaf bound and the jitter phase that gave it. */
export interface LeafBound {
  /** Upper bound on the limiter headroom, volts. */
  readonly bound_V: number;
  /** Index in `setup.shifts` of the jitter phase whose single-phase bound is the least. */
  readonly shiftIndex: number;
}

/** `x` clamped to `±limit`: a closed-form DFE tap at its limit. */
export function clipped(x: number, limit: number): number {
  return x > limit ? limit : x < -limit ? -limit : x;
}

/**
 * Upper bound on the limiter headroom of FIR `taps` sampled at phase `t` with `dfeCount` DFE taps
 * (closed form, clipped, set at `t`): the least of the single-phase bounds over the jitter phases
 * (facts 1–3 of {@link BoundSetup}).
 *
 * @param setup - the channel's bound constants.
 * @param coefficients - its watched cursors' coefficients per phase.
 * @param t - sampling phase, samples from the main cursor.
 * @param taps - transmit FIR taps (fractions of the peak swing).
 * @param dfeCount - DFE taps (at most the setup's).
 * @param scratch - caller-owned buffers ({@link createBoundScratch}).
 * @param crosstalkParts_V - every aggressor's parts for these taps, largest first (default: the
 *   fixed aggressors' of the setup).
 */
export function leafBound(
  setup: BoundSetup,
  coefficients: CoefficientSource,
  t: number,
  taps: ArrayLike<number>,
  dfeCount: number,
  scratch: BoundScratch,
  crosstalkParts_V?: Float64Array,
): LeafBound {
  const tapCount = setup.tapCount;
  const watchedCount = setup.offsets.length;
  const residuals = scratch.residuals;
  const atSampling = coefficients(t).v;
  let out = Number.POSITIVE_INFINITY;
  let shiftIndex = 0;
  for (let jj = 0; jj < setup.shifts.length; jj++) {
    const shift = setup.shifts[jj];
    const pc = coefficients(t + shift);
    const a = pc.v;
    let main = 0;
    for (let j = 0; j < tapCount; j++) main += taps[j] * a[j];
    let sum = 0;
    for (let f = 1; f < watchedCount; f++) {
      let v = 0;
      for (let j = 0; j < tapCount; j++) v += taps[j] * a[f * tapCount + j];
      const k = setup.offsets[f];
      let r: number;
      if (k > 0 && k <= dfeCount) {
        const limit = setup.limits_V[k - 1];
        if (shift === 0) {
          r = Math.abs(v) - limit;
          if (r < 0) r = 0;
        } else {
          // The tap is set at the sampling phase and cancels its cursor there, clipped.
          let w = 0;
          for (let j = 0; j < tapCount; j++) w += taps[j] * atSampling[f * tapCount + j];
          r = Math.abs(v - clipped(w, limit));
        }
      } else {
        r = Math.abs(v);
      }
      residuals[f - 1] = r;
      sum += r;
    }
    const b = residualBound(setup, jj, pc.tail, main, residuals, watchedCount - 1, sum, crosstalkParts_V);
    if (b < out) {
      out = b;
      shiftIndex = jj;
    }
  }
  return { bound_V: out, shiftIndex };
}
