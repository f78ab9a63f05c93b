// The bound of facts 1–3 (see BoundSetup) from a main cursor and residual magnitudes: the piece the
// leaf bound and the box bound share.
import { lawStepForSpan } from "../../analysis/lawStep.ts";
import type { BoundSetup } from "./boundSetup.ts";

/**
 * Upper bound on the statistical eye's ISI grid step Δ, volts: the law's step at upper bounds of its
 * parts' total (the residuals' total `residualSum_V`, the unwatched tail and the crosstalk's span)
 * and of its Gaussian's rms; the step grows with both.
 */
export function binStepBound(setup: BoundSetup, residualSum_V: number, tail_V: number): number {
  return lawStepForSpan(residualSum_V + tail_V + setup.crosstalkSpan_V, setup.noiseHigh_V);
}

/** Limiter headroom of an eye opening (a negative opening is a closed eye, 0). */
export function headroomOfEye(setup: BoundSetup, eye_V: number): number {
  return (eye_V > 0 ? eye_V : 0) - setup.sensitivity_V;
}

/**
 * Headroom bound from the main cursor `main_V` and the watched residual magnitudes
 * `residuals[0 … count)` (sorted here in place, descending) at jitter phase `shiftIndex`: the least
 * over k of `levelGap·g₀ − 2·Σ_{k largest}|r| − 2·σQ_k + slack_k·Δ`, the k largest taken from the
 * residuals and the fixed aggressors' parts together (an aggressor's part is as independent and
 * symmetric as a residual cursor, and costs one grid step at most). `residualSum_V` bounds the
 * residuals' total from above (for Δ); `tail_V` bounds the unwatched cursors; `crosstalkParts_V`
 * (largest first) are the aggressors' parts when the FIR is known (default the fixed aggressors').
 */
export function residualBound(
  setup: BoundSetup,
  shiftIndex: number,
  tail_V: number,
  main_V: number,
  residuals: Float64Array,
  count: number,
  residualSum_V: number,
  crosstalkParts_V: Float64Array = setup.crosstalkParts_V,
): number {
  for (let i = 1; i < count; i++) {
    const x = residuals[i];
    let j = i - 1;
    while (j >= 0 && residuals[j] < x) {
      residuals[j + 1] = residuals[j];
      j--;
    }
    residuals[j + 1] = x;
  }
  const delta = binStepBound(setup, residualSum_V, tail_V);
  const qSigma = setup.qSigma;
  const watchedCount = setup.offsets.length;
  const xt = crosstalkParts_V;
  let best = Number.POSITIVE_INFINITY;
  let cumulative = 0;
  let ri = 0; // next residual
  let xi = 0; // next crosstalk part
  for (let k = 0; k < watchedCount; k++) {
    if (k > 0) {
      // The k-th largest of the two sorted lists.
      const r = ri < count ? residuals[ri] : -1;
      const x = xi < xt.length ? xt[xi] : -1;
      if (r < 0 && x < 0) break;
      if (r >= x) {
        cumulative += r;
        ri++;
      } else {
        cumulative += x;
        xi++;
      }
    }
    const qk = qSigma[shiftIndex * watchedCount + k];
    if (Number.isNaN(qk)) break;
    const v = -2 * cumulative - 2 * qk + setup.slack[k] * delta;
    if (v < best) best = v;
  }
  return headroomOfEye(setup, setup.levelGap * main_V + best);
}
