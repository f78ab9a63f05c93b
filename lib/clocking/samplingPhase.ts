// Where the receiver samples: the eye centre as an edge-locking CDR finds it, the phase of the
// largest eye, or the Mueller–Müller baud-rate criterion.
import type { StatisticalEye } from "../analysis/statisticalEye.ts";

/** Sampling-phase policy of a receiver. */
export type SamplingPolicy = "centre" | "max-height" | "mueller-muller";

/** The sampling-phase policies, for validation and forms. */
export const SAMPLING_POLICIES: readonly SamplingPolicy[] = ["centre", "max-height", "mueller-muller"];

/**
 * The one default policy of Tapwright (the `eye` command and budgets alike): the eye centre a
 * bang-bang CDR locks to, so an eye and a budget's run sample at the same place unless told otherwise.
 */
export const DEFAULT_SAMPLING_POLICY: SamplingPolicy = "centre";

/** An integer window of sampling phases in samples, relative to the nominal main-cursor sample. */
export interface PhaseWindow {
  readonly lo: number;
  readonly hi: number;
}

/** The default search window: ±½ UI around the nominal main cursor. */
export function defaultPhaseWindow(samplesPerUi: number): PhaseWindow {
  if (!Number.isInteger(samplesPerUi) || samplesPerUi < 1) {
    throw new RangeError(`samplesPerUi must be an integer ≥ 1, got ${String(samplesPerUi)}`);
  }
  const h = Math.floor(samplesPerUi / 2);
  return { lo: -h, hi: h };
}

/**
 * Lag of the timing criterion of a policy, in samples: the criterion compares the pulse `lag`
 * before and `lag` after the sampling instant. "centre": half a UI (the edge samples of a
 * bang-bang CDR); "mueller-muller": one UI (the first pre- and post-cursor).
 */
export function criterionLag(policy: "centre" | "mueller-muller", samplesPerUi: number): number {
  return policy === "centre" ? samplesPerUi / 2 : samplesPerUi;
}

/**
 * The lock point of a zero-crossing timing criterion on the pulse `main(t)` (the pulse at phase t):
 * `F(t) = main(t − lag) − main(t + lag)` changes sign from negative to positive where the pulse is
 * balanced. Among the integer phases `t` of the window with `F(t−1) < 0 ≤ F(t)`, the one nearest to
 * phase 0 is taken, and of `t − 1` and `t` the one with the smaller |F| (the rounded zero). With no
 * such sign change the lock point lies beyond the window: its low end when `F(lo) ≥ 0` (sampling
 * already late), else its high end.
 *
 * - "centre" (lag ½ UI): a bang-bang (Alexander) CDR puts its edge samples where a transition's mean
 *   crossing is, `p(t − UI/2) = p(t + UI/2)`, and samples data half a UI away — the eye centre.
 * - "mueller-muller" (lag 1 UI): the baud-rate criterion `h(−1) = h(+1)`.
 *
 * @see J. D. H. Alexander, "Clock recovery from random binary signals", Electronics Letters 11(22),
 *   1975; K. H. Mueller and M. Müller, "Timing recovery in digital synchronous data receivers",
 *   IEEE Trans. Commun. 24(5), 1976 [memory: recalled, not re-read].
 */
export function criterionPhase(main: (t: number) => number, lag: number, window: PhaseWindow): number {
  checkWindow(window);
  if (!(Number.isFinite(lag) && lag > 0)) throw new RangeError(`lag must be a finite number > 0, got ${lag}`);
  const F = (t: number) => main(t - lag) - main(t + lag);
  const span = window.hi - window.lo;
  const inWindow = (t: number) => t >= window.lo && t <= window.hi;
  const start = Math.min(window.hi, Math.max(window.lo, 0));
  for (let d = 0; d <= span; d++) {
    for (const t of d === 0 ? [start] : [start - d, start + d]) {
      if (!inWindow(t) || !inWindow(t - 1)) continue;
      const a = F(t - 1);
      const b = F(t);
      if (a < 0 && b >= 0) return -a < b ? t - 1 : t;
    }
  }
  return F(window.lo) >= 0 ? window.lo : window.hi;
}

/**
 * The phase of the largest vertical opening at `ber` in the window (the first, scanning outward
 * from phase 0, on ties).
 */
export function maxHeightPhase(eye: StatisticalEye, ber: number, window: PhaseWindow): number {
  checkWindow(window);
  const start = Math.min(window.hi, Math.max(window.lo, 0));
  let best = start;
  let bestH = eye.eyeHeight(start, ber);
  for (let d = 1; d <= window.hi - window.lo; d++) {
    for (const t of [start - d, start + d]) {
      if (t < window.lo || t > window.hi) continue;
      const h = eye.eyeHeight(t, ber);
      if (h > bestH) {
        bestH = h;
        best = t;
      }
    }
  }
  return best;
}

/**
 * The sampling phase (integer samples relative to the nominal main cursor) a policy chooses on a
 * statistical eye.
 *
 * @param eye - the statistical eye (its `main(t)` is the pulse at phase t).
 * @param policy - "centre", "max-height" or "mueller-muller".
 * @param ber - target error ratio (used by "max-height").
 * @param window - phases searched (default ±½ UI).
 */
export function samplingPhase(
  eye: StatisticalEye,
  policy: SamplingPolicy,
  ber: number,
  window: PhaseWindow = defaultPhaseWindow(eye.samplesPerUi),
): number {
  if (policy === "max-height") return maxHeightPhase(eye, ber, window);
  if (policy === "centre" || policy === "mueller-muller") {
    return criterionPhase(eye.main, criterionLag(policy, eye.samplesPerUi), window);
  }
  throw new RangeError(`policy must be one of ${SAMPLING_POLICIES.join(", ")}, got ${String(policy)}`);
}

function checkWindow(w: PhaseWindow): void {
  if (w === null || typeof w !== "object" || !Number.isInteger(w.lo) || !Number.isInteger(w.hi) || w.lo > w.hi) {
    throw new RangeError("window must be { lo, hi } with integers lo ≤ hi");
  }
}
