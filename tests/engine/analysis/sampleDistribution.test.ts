// ISI plus Gaussian noise at one phase: quantiles against the Q function and a brute-force oracle.
import { describe, expect, it } from "vitest";
import { berFromQ, qFromBer } from "@lib/analysis/ber";
import { sampleDistribution } from "@lib/analysis/sampleDistribution";
import { seededRandom } from "@lib/signal/seededRandom";
import { enumerateIsi, normalCdfOracle } from "./helpers.ts";

describe("sampleDistribution", () => {
  it("analytic: noise alone gives the Gaussian quantile −Q(p)·σ [computed, BER = ½·erfc(Q/√2)], tol 1e-3·σ", () => {
    const sigma = 0.004;
    const d = sampleDistribution(new Float64Array(0), "nrz", sigma);
    for (const p of [1e-3, 1e-6, 1e-9, 1e-12, 1e-15]) {
      expect(Math.abs(d.quantile(p) + qFromBer(p) * sigma)).toBeLessThan(1e-3 * sigma);
    }
    expect(d.probBelow(-3 * sigma) / berFromQ(3)).toBeCloseTo(1, 3);
  });

  it("analytic: one NRZ cursor r on a grid node: P(Y < −r − x) = ½Φ(−x/σ) + ½Φ(−(x+2r)/σ), rel 1e-3", () => {
    const sigma = 0.01;
    const r = (13 * sigma * 64) / 192; // r/step = 256·r/(r + 13σ) = 64, a node of the default grid
    const d = sampleDistribution(Float64Array.of(r), "nrz", sigma);
    for (const x of [0.02, 0.04, 0.06]) {
      const want = 0.5 * normalCdfOracle(-x / sigma) + 0.5 * normalCdfOracle(-(x + 2 * r) / sigma);
      expect(Math.abs(d.probBelow(-r - x) / want - 1)).toBeLessThan(1e-3);
    }
  });

  it("oracle: quantiles match brute-force enumeration with exact Gaussian tails within one grid node", () => {
    const rng = seededRandom(11);
    const isi = Array.from({ length: 9 }, () => (rng.uniform() - 0.5) * 0.08);
    const sigma = 0.006;
    for (const mod of ["nrz", "pam4"] as const) {
      const d = sampleDistribution(Float64Array.from(isi), mod, sigma);
      const alphabet = mod === "nrz" ? [-1, 1] : [-1, -1 / 3, 1 / 3, 1];
      const { values, prob } = enumerateIsi(isi.slice(0, mod === "nrz" ? 9 : 6), alphabet);
      const dd = mod === "nrz" ? d : sampleDistribution(Float64Array.from(isi.slice(0, 6)), mod, sigma);
      const exact = (u: number) => values.reduce((s, v) => s + prob * berFromQ((v - u) / sigma), 0);
      for (const p of [1e-4, 1e-9, 1e-13]) {
        let lo = -1;
        let hi = 1;
        for (let i = 0; i < 80; i++) {
          const m = (lo + hi) / 2;
          if (exact(m) < p) lo = m;
          else hi = m;
        }
        expect(Math.abs(dd.quantile(p) - lo)).toBeLessThan(dd.isi.step_V);
      }
    }
  });

  it("identities: P(Y<u) + P(Y>u) = 1, monotone, symmetric; quantile inverts probBelow", () => {
    const d = sampleDistribution(Float64Array.of(0.02, -0.01, 0.005), "pam4", 0.003);
    let prev = 0;
    for (let u = -0.08; u <= 0.08; u += 0.0007) {
      const b = d.probBelow(u);
      expect(b).toBeGreaterThanOrEqual(prev - 1e-15);
      prev = b;
      expect(b + d.probAbove(u)).toBeCloseTo(1, 3);
      expect(d.probAbove(-u)).toBe(b);
    }
    for (const p of [1e-12, 1e-5, 0.2]) expect(d.probBelow(d.quantile(p)) / p).toBeCloseTo(1, 6);
  });

  it("edges: σ = 0 gives the discrete law (point mass, two points); bad arguments throw", () => {
    const point = sampleDistribution(new Float64Array(0), "nrz", 0);
    expect(point.quantile(1e-12)).toBe(0);
    expect(point.probBelow(1e-9)).toBe(1);
    expect(point.probBelow(0)).toBe(0);
    const two = sampleDistribution(Float64Array.of(0.1), "nrz", 0);
    expect(two.quantile(1e-12)).toBeCloseTo(-0.1, 12);
    expect(two.quantile(0.7)).toBeCloseTo(0.1, 12);
    expect(two.probBelow(0)).toBeCloseTo(0.5, 15);
    expect(() => sampleDistribution(new Float64Array(0), "nrz", -1)).toThrow(/noiseRms_V/);
    expect(() => sampleDistribution(new Float64Array(0), "nrz", 0.1, 3)).toThrow(/halfBins/);
    expect(() => point.quantile(0)).toThrow(/p must/);
    expect(() => sampleDistribution(Float64Array.of(Number.POSITIVE_INFINITY), "nrz", 0.1)).toThrow(/not finite/);
  });
});
