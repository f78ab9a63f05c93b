// Upper bound on the limiter headroom of every transmit FIR setting of a box at one sampling phase:
// what lets the joint search drop a whole box of settings unseen.
import { type BoundScratch, JOINT_CURSORS } from "./boundScratch.ts";
import type { BoundSetup } from "./boundSetup.ts";
import type { BoxRanges } from "./boxRanges.ts";
import { clipped } from "./leafBound.ts";
import { binStepBound, headroomOfEye, residualBound } from "./residualBound.ts";

/** A box bound, the jitter phase that gave it, and the coarser figure that orders boxes. */
export interface BoxBound {
  /** Upper bound on the limiter headroom of every setting of the box, volts. */
  readonly bound_V: number;
  /** Index in `setup.shifts` of the jitter phase that gave the bound. */
  readonly shiftIndex: number;
  /**
   * The least independent-way bound over the jitter phases tried, volts: a coarser figure that
   * orders boxes better (it does not favour the boxes whose joint bound is loose).
   */
  readonly coarse_V: number;
}

/** Least magnitude over an interval. */
function minAbs(lo: number, hi: number): number {
  return lo <= 0 && hi >= 0 ? 0 : Math.min(Math.abs(lo), Math.abs(hi));
}

/**
 * Upper bound on the limiter headroom of every FIR of a box, sampled at phase `t` with `dfeCount`
 * DFE taps. Per jitter phase: each watched cursor is affine in the free side taps, so its range over
 * the box is exact, and the bound of the k largest residuals (see {@link BoundSetup}) is taken two
 * ways — with the largest main cursor and the smallest residuals independently, and, for k ≤ 3,
 * with the main cursor and a fixed set of k residuals together: `L·g₀ − 2·Σ|r_i| ≤ L·g₀ − 2·Σ s_i·r_i`
 * for any signs `s_i`, an affine function whose maximum over the box is exact (the residuals with
 * the largest least magnitudes, signed as their ranges; a DFE residual at a jitter phase when its
 * tap cannot clip, as the cursor's change). The least over the ways and jitter phases counts. The
 * jitter phases are tried from index `firstShift` on (then the others in the setup's order), and the
 * search stops at the first bound at or below `stopAt` (still a valid bound).
 *
 * @param setup - the channel's bound constants.
 * @param ranges - the box's cursor ranges (reset to the box).
 * @param t - sampling phase, samples from the main cursor.
 * @param dfeCount - DFE taps (at most the setup's).
 * @param scratch - caller-owned buffers ({@link createBoundScratch}).
 * @param stopAt - a bound at or below this value ends the scan (volts).
 * @param firstShift - index in `setup.shifts` of the jitter phase tried first.
 */
export function boxBound(
  setup: BoundSetup,
  ranges: BoxRanges,
  t: number,
  dfeCount: number,
  scratch: BoundScratch,
  stopAt = Number.NEGATIVE_INFINITY,
  firstShift = 0,
): BoxBound {
  const watchedCount = setup.offsets.length;
  const shiftCount = setup.shifts.length;
  const values = ranges.values;
  const atSampling = ranges.at(t);
  const residuals = scratch.residuals;
  const cursors = scratch.jointCursors;
  const signs = scratch.jointSigns;
  const change = scratch.jointChange;
  const mags = scratch.jointMags;
  let out = Number.POSITIVE_INFINITY;
  let loose = Number.POSITIVE_INFINITY;
  let shiftIndex = firstShift;
  for (let n = 0; n < shiftCount; n++) {
    const jj = n === 0 ? firstShift : n <= firstShift ? n - 1 : n;
    const shift = setup.shifts[jj];
    const o = ranges.at(t + shift);
    const mainMax = values[o + 1];
    let sum = 0;
    let picked = 0;
    for (let f = 1; f < watchedCount; f++) {
      let a = values[o + 2 * f];
      let b = values[o + 2 * f + 1];
      const k = setup.offsets[f];
      let m: number;
      let affine = true;
      let isChange = 0;
      if (k > 0 && k <= dfeCount) {
        const limit = setup.limits_V[k - 1];
        if (shift === 0) {
          const big = Math.max(Math.abs(a), Math.abs(b));
          m = minAbs(a, b) - limit;
          if (m < 0) m = 0;
          sum += big > limit ? big - limit : 0;
          affine = false;
        } else {
          const wlo = values[atSampling + 2 * f];
          const whi = values[atSampling + 2 * f + 1];
          if (wlo >= -limit && whi <= limit) {
            // The tap never clips in the box: the residual is the cursor's change, an affine function.
            const d = ranges.diff(t, jj);
            a = ranges.diffs[d + 2 * f];
            b = ranges.diffs[d + 2 * f + 1];
            isChange = 1;
          } else {
            const ra = a - clipped(whi, limit);
            const rb = b - clipped(wlo, limit);
            a = ra;
            b = rb;
            affine = false;
          }
          m = minAbs(a, b);
          sum += Math.max(Math.abs(a), Math.abs(b));
        }
      } else {
        m = minAbs(a, b);
        sum += Math.max(Math.abs(a), Math.abs(b));
      }
      residuals[f - 1] = m;
      // Keep the JOINT_CURSORS affine residuals with the largest least magnitudes.
      if (affine && m > 0 && (picked < JOINT_CURSORS || m > mags[picked - 1])) {
        let i = picked < JOINT_CURSORS ? picked++ : picked - 1;
        while (i > 0 && mags[i - 1] < m) {
          mags[i] = mags[i - 1];
          cursors[i] = cursors[i - 1];
          signs[i] = signs[i - 1];
          change[i] = change[i - 1];
          i--;
        }
        mags[i] = m;
        cursors[i] = f;
        signs[i] = a > 0 ? 1 : -1;
        change[i] = isChange;
      }
    }
    const tail = values[o + 2 * watchedCount];
    let bound = residualBound(setup, jj, tail, mainMax, residuals, watchedCount - 1, sum);
    if (bound < loose) loose = bound;
    if (bound > stopAt && picked > 0) {
      const delta = binStepBound(setup, sum, tail);
      const jointMax = scratch.jointMax;
      ranges.jointMax(t, jj, setup.levelGap, cursors, signs, change, picked, jointMax);
      for (let k = 1; k <= picked; k++) {
        const qk = setup.qSigma[jj * watchedCount + k];
        if (Number.isNaN(qk)) break;
        const v = headroomOfEye(setup, jointMax[k - 1] - 2 * qk + setup.slack[k] * delta);
        if (v < bound) bound = v;
      }
    }
    if (bound < out) {
      out = bound;
      shiftIndex = jj;
    }
    if (out <= stopAt) break;
  }
  return { bound_V: out, shiftIndex, coarse_V: loose };
}
