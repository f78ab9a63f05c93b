// The statistical eye drawn as an image: log10 of the error ratio of a decision threshold at every
// (sampling phase, threshold voltage) pair of a grid, ready for contouring.
import { log10Ber } from "./bathtub.ts";
import { berPerLevelTail } from "./berConvention.ts";
import { type JitterKernel, jitterKernel } from "./jitterKernel.ts";
import type { StatisticalEye } from "./statisticalEye.ts";
import { nearestLevelsInto } from "./nearestLevelsInto.ts";

/** log10 BER on a grid; `values[row·width + col]`. */
export interface BerMap {
  readonly width: number;
  readonly height: number;
  /** Column phases in samples relative to the nominal main-cursor sample. */
  readonly phases: Float64Array;
  /** Row threshold voltages in volts. */
  readonly voltage_V: Float64Array;
  /** log10 of {@link StatisticalEye.ber}, floored at `LOG10_BER_FLOOR` (bathtub.ts). */
  readonly values: Float64Array;
}

/**
 * Evaluates `log10(eye.ber(t, v))` on the grid `phases × voltage_V` (rows follow `voltage_V`).
 * Per integer phase and row the level probabilities are computed once and reused by every column
 * that the jitter law and the interpolation reach.
 *
 * @param eye - the statistical eye.
 * @param phases - column phases in samples (fractional allowed), finite.
 * @param voltage_V - row thresholds in volts, finite.
 */
export function berMap(eye: StatisticalEye, phases: Float64Array, voltage_V: Float64Array): BerMap {
  for (let i = 0; i < phases.length; i++) {
    if (!Number.isFinite(phases[i])) throw new RangeError(`phases[${i}] is not finite`);
  }
  for (let i = 0; i < voltage_V.length; i++) {
    if (!Number.isFinite(voltage_V[i])) throw new RangeError(`voltage_V[${i}] is not finite`);
  }
  const W = phases.length;
  const H = voltage_V.length;
  const L = eye.levels.length;
  const values = new Float64Array(W * H);
  // cache[p][(row·L + level)·2 + (0: below, 1: above)]
  const cache = new Map<number, Float64Array>();
  const at = (p: number): Float64Array => {
    let c = cache.get(p);
    if (c !== undefined) return c;
    const law = eye.distribution(p);
    const m = eye.main(p);
    c = new Float64Array(H * L * 2);
    for (let r = 0; r < H; r++) {
      for (let l = 0; l < L; l++) {
        const u = voltage_V[r] - eye.levels[l] * m;
        c[(r * L + l) * 2] = law.probBelow(u);
        c[(r * L + l) * 2 + 1] = law.probAbove(u);
      }
    }
    cache.set(p, c);
    return c;
  };
  const kernels = new Map<number, JitterKernel>();
  const bounds = new Int32Array(2);
  const perTail = berPerLevelTail(eye.modulation);
  for (let col = 0; col < W; col++) {
    const t = phases[col];
    const base = Math.floor(t);
    const frac = t - base;
    let k = kernels.get(frac);
    if (k === undefined) {
      k = jitterKernel(eye.jitter, eye.samplesPerUi, frac, eye.kernelFloor);
      kernels.set(frac, k);
    }
    const m = eye.main(t);
    for (let r = 0; r < H; r++) {
      const v = voltage_V[r];
      nearestLevelsInto(eye.levels, m, v, bounds);
      const above = bounds[0];
      const below = bounds[1];
      let s = 0;
      for (let i = 0; i < k.weights.length; i++) {
        const c = at(base + k.first + i);
        const w = k.weights[i];
        if (above >= 0) s += w * c[(r * L + above) * 2];
        if (below >= 0) s += w * c[(r * L + below) * 2 + 1];
      }
      s *= perTail;
      values[r * W + col] = log10Ber(s > 1 ? 1 : s);
    }
  }
  return { width: W, height: H, phases: Float64Array.from(phases), voltage_V: Float64Array.from(voltage_V), values };
}
