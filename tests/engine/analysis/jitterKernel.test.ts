// Dual-Dirac jitter as phase-mixing weights: closed forms, a quadrature oracle, identities, edges.
import { describe, expect, it } from "vitest";
import { jitterKernel } from "@lib/analysis/jitterKernel";

const weightAt = (k: ReturnType<typeof jitterKernel>, m: number) => {
  const i = m - k.first;
  return i >= 0 && i < k.weights.length ? k.weights[i] : 0;
};

describe("jitterKernel", () => {
  it("analytic: no jitter is linear interpolation between the two neighbouring phases", () => {
    expect(jitterKernel(undefined, 16, 0)).toEqual({ first: 0, weights: Float64Array.of(1) });
    const k = jitterKernel({ rjRms_UI: 0, djPp_UI: 0 }, 16, 0.25);
    expect(weightAt(k, 0)).toBeCloseTo(0.75, 15);
    expect(weightAt(k, 1)).toBeCloseTo(0.25, 15);
  });

  it("analytic: DJ alone of 4 samples peak-to-peak puts ½ at ±2 samples (dual Dirac)", () => {
    const k = jitterKernel({ rjRms_UI: 0, djPp_UI: 0.25 }, 16);
    expect(weightAt(k, -2)).toBeCloseTo(0.5, 15);
    expect(weightAt(k, 2)).toBeCloseTo(0.5, 15);
    expect(weightAt(k, 0)).toBe(0);
  });

  it("oracle: RJ weights equal E[hat(τ·spu − m)] integrated by Simpson's rule (abs 1e-10)", () => {
    const spu = 32;
    const rj = 0.02; // 0.64 samples
    const frac = 0.3;
    const k = jitterKernel({ rjRms_UI: rj, djPp_UI: 0.1 }, spu, frac);
    const s = rj * spu;
    const oracle = (m: number) => {
      let total = 0;
      for (const mu of [frac - 1.6, frac + 1.6]) {
        const n = 20_000;
        const a = m - 1;
        const h = 2 / n;
        const f = (y: number) =>
          ((1 - Math.abs(y - m)) * Math.exp(-0.5 * ((y - mu) / s) ** 2)) / (s * Math.sqrt(2 * Math.PI));
        let acc = f(a) + f(a + 2);
        for (let i = 1; i < n; i++) acc += (i % 2 === 1 ? 4 : 2) * f(a + i * h);
        total += 0.5 * ((acc * h) / 3);
      }
      return total;
    };
    for (let m = -5; m <= 6; m++) expect(Math.abs(weightAt(k, m) - oracle(m))).toBeLessThan(1e-10);
  });

  it("identities: weights sum to 1 and their mean is the evaluation point (the hat keeps the mean)", () => {
    for (const [rj, dj, frac] of [
      [0.01, 0.05, 0],
      [0.03, 0, 0.7],
      [0.005, 0.2, -3.4],
    ]) {
      const k = jitterKernel({ rjRms_UI: rj, djPp_UI: dj }, 32, frac);
      let s = 0;
      let mean = 0;
      k.weights.forEach((w, i) => {
        s += w;
        mean += w * (k.first + i);
        expect(w).toBeGreaterThanOrEqual(0);
      });
      expect(s).toBeCloseTo(1, 12);
      expect(mean).toBeCloseTo(frac, 9);
    }
  });

  it("edges: out-of-range jitter and bad grids throw naming the field", () => {
    expect(() => jitterKernel({ rjRms_UI: -0.1, djPp_UI: 0 }, 16)).toThrow(/rjRms_UI/);
    expect(() => jitterKernel({ rjRms_UI: 0, djPp_UI: 2 }, 16)).toThrow(/djPp_UI/);
    expect(() => jitterKernel(undefined, 0)).toThrow(/samplesPerUi/);
    expect(() => jitterKernel(undefined, 8, Number.NaN)).toThrow(/frac/);
  });
});
