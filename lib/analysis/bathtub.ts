// Bathtub curves and eye width: the error ratio of fixed decision thresholds as the sampling
// phase sweeps across the eye.
import { berPerLevelTail } from "./berConvention.ts";
import type { StatisticalEye } from "./statisticalEye.ts";

/** log10 of an error ratio is reported no lower than this (an open eye without noise has BER 0). */
export const LOG10_BER_FLOOR = -40;

/** A bathtub curve: error ratio against sampling phase. */
export interface Bathtub {
  /** Sampling phase in UI, relative to the nominal main-cursor sample. */
  readonly phase_UI: Float64Array;
  /** log10 of the error ratio (floored at {@link LOG10_BER_FLOOR}). */
  readonly log10Ber: Float64Array;
}

/** `log10(max(p, 10^LOG10_BER_FLOOR))`. */
export function log10Ber(p: number): number {
  return p > 0 ? Math.max(LOG10_BER_FLOOR, Math.log10(p)) : LOG10_BER_FLOOR;
}

/**
 * Decision thresholds of the eye at the sampling phase `t`: midway between adjacent nominal
 * levels, `(l_i + l_{i+1})/2 · main(t)` (NRZ: 0; PAM4: −2/3, 0, +2/3 times the main cursor).
 */
export function decisionThresholds(eye: StatisticalEye, t: number): Float64Array {
  const m = eye.main(t);
  const out = new Float64Array(eye.levels.length - 1);
  for (let i = 0; i < out.length; i++) out[i] = 0.5 * (eye.levels[i] + eye.levels[i + 1]) * m;
  return out;
}

/**
 * Bit error ratio at phase `t` with the given thresholds (see `berPerLevelTail`): for every eye `i`,
 * `f·(P(level i+1 < θ_i) + P(level i > θ_i))`; the worst eye counts (PAM4: the largest of the three,
 * as the eye height is the smallest; the receiver's total is at most three times it).
 */
export function thresholdBer(eye: StatisticalEye, t: number, thresholds: Float64Array): number {
  let worst = 0;
  for (let i = 0; i < thresholds.length; i++) {
    const b = eye.probBelow(i + 1, t, thresholds[i]) + eye.probAbove(i, t, thresholds[i]);
    if (b > worst) worst = b;
  }
  worst *= berPerLevelTail(eye.modulation);
  return worst > 1 ? 1 : worst;
}

/**
 * Bathtub curve around the sampling phase `t0` (samples): the thresholds are fixed at `t0`
 * ({@link decisionThresholds}) and the phase sweeps `t0 − span/2 … t0 + span/2` on the sample grid.
 *
 * @param eye - the statistical eye.
 * @param t0 - sampling phase in samples (integer).
 * @param span_UI - width of the sweep in UI (default 1).
 * @see the bathtub curve of jitter analysis: BER against sampling instant, e.g. T11.2 MJSQ
 *   [memory: recalled, not re-read].
 */
export function bathtub(eye: StatisticalEye, t0: number, span_UI = 1): Bathtub {
  if (!Number.isInteger(t0)) throw new RangeError(`t0 must be an integer phase in samples, got ${t0}`);
  if (!(Number.isFinite(span_UI) && span_UI > 0 && span_UI <= 4)) {
    throw new RangeError(`span_UI must be a number in (0, 4], got ${span_UI}`);
  }
  const spu = eye.samplesPerUi;
  const half = Math.round((span_UI * spu) / 2);
  const th = decisionThresholds(eye, t0);
  const n = 2 * half + 1;
  const phase_UI = new Float64Array(n);
  const log10 = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const t = t0 - half + i;
    phase_UI[i] = t / spu;
    log10[i] = log10Ber(thresholdBer(eye, t, th));
  }
  return { phase_UI, log10Ber: log10 };
}

/**
 * Eye width at error ratio `ber` around the sampling phase `t0`: the contiguous span of phases
 * (fractional, found by bisection between grid phases) where {@link thresholdBer} with the
 * thresholds of `t0` stays at or below `ber`. Searched up to one UI on each side.
 *
 * @returns width in UI and its two ends in samples (`left = right = t0` when closed at `t0`).
 */
export function eyeWidth(
  eye: StatisticalEye,
  t0: number,
  ber: number,
): { eyeWidth_UI: number; left: number; right: number } {
  if (!(Number.isFinite(ber) && ber > 0 && ber < 0.5)) {
    throw new RangeError(`ber must be a number strictly between 0 and 0.5, got ${String(ber)}`);
  }
  if (!Number.isInteger(t0)) throw new RangeError(`t0 must be an integer phase in samples, got ${t0}`);
  const spu = eye.samplesPerUi;
  const th = decisionThresholds(eye, t0);
  const open = (t: number) => thresholdBer(eye, t, th) <= ber;
  if (!open(t0)) return { eyeWidth_UI: 0, left: t0, right: t0 };
  const side = (dir: 1 | -1): number => {
    let inside = t0;
    let outside = t0 + dir;
    while (Math.abs(outside - t0) <= spu && open(outside)) {
      inside = outside;
      outside += dir;
    }
    if (Math.abs(outside - t0) > spu) return inside;
    for (let it = 0; it < 40; it++) {
      const m = 0.5 * (inside + outside);
      if (open(m)) inside = m;
      else outside = m;
    }
    return 0.5 * (inside + outside);
  };
  const left = side(-1);
  const right = side(1);
  return { eyeWidth_UI: (right - left) / spu, left, right };
}
