// Wiener/MMSE: Haykin's example, the Jmin identity, optimality and the normal-equation oracle.
import { describe, expect, it } from "vitest";
import { equalizerMse, lmsStepBounds, mmseEqualizer, wienerSolve } from "@lib/solvers";
import { seededRandom } from "@lib/signal";
import { normalEquations } from "./oracle.ts";

const cur = (h: number[], main: number) => ({ h: Float64Array.from(h), main });

describe("wienerSolve", () => {
  // [memory; computed] Haykin, Adaptive Filter Theory, 4th ed., ch. 2 numerical example — recalled, not re-read.
  it("Haykin's two-tap example: w = [0.83627, −0.78540], Jmin = 0.15759, eigenvalues 0.6 and 1.6 [memory; computed]", () => {
    const R = [
      [1.1, 0.5],
      [0.5, 1.1],
    ];
    const s = wienerSolve(R, [0.5272, -0.4458], 0.9486);
    expect(Math.abs(s.w[0] - 0.83627)).toBeLessThan(1e-4);
    expect(Math.abs(s.w[1] - -0.7854)).toBeLessThan(1e-4);
    expect(Math.abs(s.jMin - 0.15759)).toBeLessThan(1e-4);
    const b = lmsStepBounds(R);
    expect(Math.abs(b.eigenvalues[0] - 0.6)).toBeLessThan(1e-4);
    expect(Math.abs(b.eigenvalues[1] - 1.6)).toBeLessThan(1e-4);
    // [memory] Haykin, LMS chapter: mean convergence for 0 < μ < 2/λmax; conservative 2/tr(R).
    expect(b.meanBound).toBeCloseTo(1.25, 12);
    expect(b.traceBound).toBeCloseTo(2 / 2.2, 12);
  });

  it("edges: non-square, mismatched, singular and non-finite inputs", () => {
    expect(() => wienerSolve([[1, 2]], [1], 1)).toThrow(/square/);
    expect(() => wienerSolve([[1]], [1, 2], 1)).toThrow(/p must have 1/);
    expect(() =>
      wienerSolve(
        [
          [0, 0],
          [0, 0],
        ],
        [1, 1],
        1,
      ),
    ).toThrow(/singular/);
    expect(() => wienerSolve([[Number.NaN]], [1], 1)).toThrow(/R\[0\]\[0\]/);
    expect(() => wienerSolve([[1]], [1], Number.POSITIVE_INFINITY)).toThrow(/varianceD/);
    // Non-symmetric but regular: falls back to LU.
    expect(
      Array.from(
        wienerSolve(
          [
            [2, 1],
            [0, 1],
          ],
          [3, 1],
          5,
        ).w,
      ),
    ).toEqual([1, 1]);
  });
});

describe("mmseEqualizer", () => {
  it("analytic: one cursor a, one tap: c = a/(a² + σ²), MSE = σ²/(a² + σ²)", () => {
    const r = mmseEqualizer(cur([0.8], 0), 0, 0, 0.3);
    expect(r.taps[0]).toBeCloseTo(0.8 / (0.64 + 0.09), 14);
    expect(r.mse).toBeCloseTo(0.09 / 0.73, 14);
  });

  it("oracle: taps equal the regularized normal equations (seed 23, tol 1e-10)", () => {
    const rng = seededRandom(23);
    const h = Array.from({ length: 12 }, (_, i) => (i === 3 ? 1 : 0.3 * rng.normal()));
    const [pre, post, sigma] = [2, 5, 0.07];
    const r = mmseEqualizer(cur(h, 3), pre, post, sigma);
    const n = pre + 1 + post;
    const rows = Array.from({ length: h.length + n - 1 }, (_, i) => Array.from({ length: n }, (_, j) => h[i - j] ?? 0));
    const b = rows.map((_, i) => (i === 3 + pre ? 1 : 0));
    normalEquations(rows, b, sigma * sigma).forEach((v, j) => expect(r.taps[j]).toBeCloseTo(v, 10));
  });

  it("identities: Jmin = 1 − z(0) [textbook identity] = the directly computed MSE; any perturbation costs", () => {
    const c = cur([0.04, -0.12, 0.9, 0.42, 0.15, -0.06, 0.02], 2);
    const r = mmseEqualizer(c, 3, 6, 0.05);
    expect(r.mse).toBeCloseTo(1 - r.equalized.h[r.equalized.main], 12);
    expect(equalizerMse(c, r.taps, 3, 0.05)).toBeCloseTo(r.mse, 12);
    const rng = seededRandom(1);
    for (let t = 0; t < 20; t++) {
      const p = r.taps.map((v) => v + 1e-3 * rng.normal());
      expect(equalizerMse(c, p, 3, 0.05)).toBeGreaterThan(r.mse);
    }
    // More noise, smaller taps and larger MSE.
    const noisy = mmseEqualizer(c, 3, 6, 0.3);
    expect(noisy.mse).toBeGreaterThan(r.mse);
    expect(noisy.taps.reduce((s, v) => s + v * v, 0)).toBeLessThan(r.taps.reduce((s, v) => s + v * v, 0));
  });

  it("edges: zero noise, all-zero cursors, bad noise", () => {
    expect(mmseEqualizer(cur([1, 0.5], 0), 0, 30, 0).mse).toBeLessThan(1e-9);
    expect(() => mmseEqualizer(cur([0, 0], 0), 0, 1, 0)).toThrow(/singular/);
    expect(mmseEqualizer(cur([0, 0], 0), 0, 1, 0.1).taps.every((v) => v === 0)).toBe(true);
    expect(() => mmseEqualizer(cur([1], 0), 0, 0, -1)).toThrow(/noiseRms_V/);
    expect(() => mmseEqualizer(cur([1], 0), 0, 0, Number.NaN)).toThrow(/noiseRms_V/);
  });
});
