// The ISI law on a grid: exact two-/four-point laws, brute-force oracle, identities, edges.
import { describe, expect, it } from "vitest";
import { isiDistribution, peakDistortion } from "@lib/analysis/isiDistribution";
import { seededRandom } from "@lib/signal/seededRandom";
import { enumerateIsi } from "./helpers.ts";

const massAt = (d: ReturnType<typeof isiDistribution>, j: number) => d.pmf[d.halfBins + j];

describe("isiDistribution", () => {
  it("analytic: one NRZ cursor on a grid node gives ½ at ±r", () => {
    const d = isiDistribution(Float64Array.of(0.3), "nrz", 0.1, 8);
    expect(massAt(d, 3)).toBeCloseTo(0.5, 15);
    expect(massAt(d, -3)).toBeCloseTo(0.5, 15);
    expect(massAt(d, 0)).toBe(0);
  });

  it("analytic: one PAM4 cursor gives ¼ at ±r and ±r/3", () => {
    const d = isiDistribution(Float64Array.of(0.3), "pam4", 0.1, 8);
    for (const j of [-3, -1, 1, 3]) expect(massAt(d, j)).toBeCloseTo(0.25, 15);
    expect(massAt(d, 0) + massAt(d, 2) + massAt(d, -2)).toBeCloseTo(0, 15);
  });

  it("analytic: a point between nodes is split in proportion (linear binning)", () => {
    const d = isiDistribution(Float64Array.of(0.125), "nrz", 0.1, 4);
    expect(massAt(d, 1)).toBeCloseTo(0.5 * 0.75, 12);
    expect(massAt(d, 2)).toBeCloseTo(0.5 * 0.25, 12);
    expect(massAt(d, -1)).toBeCloseTo(0.5 * 0.75, 12);
  });

  it("oracle: matches brute-force enumeration of all 2^8 patterns in mean, variance and CDF (within one node)", () => {
    const rng = seededRandom(7);
    const isi = Array.from({ length: 8 }, () => (rng.uniform() - 0.5) * 0.2);
    const step = 0.002;
    const d = isiDistribution(Float64Array.from(isi), "nrz", step, 400);
    const { values, prob } = enumerateIsi(isi, [-1, 1]);
    let m2 = 0;
    let m2Exact = 0;
    for (let j = -d.halfBins; j <= d.halfBins; j++) m2 += massAt(d, j) * (j * step) ** 2;
    for (const v of values) m2Exact += prob * v * v;
    // Linear binning adds at most step²/4 of variance per component.
    expect(m2 - m2Exact).toBeGreaterThanOrEqual(-1e-15);
    expect(m2 - m2Exact).toBeLessThanOrEqual((8 * step * step) / 4);
    for (const u of [-0.15, -0.05, 0.01, 0.08]) {
      let cdf = 0;
      for (let j = -d.halfBins; j <= d.halfBins; j++) if (j * step <= u) cdf += massAt(d, j);
      const lowEnough = values.filter((v) => v <= u - 8 * step).length * prob;
      const highEnough = values.filter((v) => v <= u + 8 * step).length * prob;
      expect(cdf).toBeGreaterThanOrEqual(lowEnough - 1e-12);
      expect(cdf).toBeLessThanOrEqual(highEnough + 1e-12);
    }
  });

  it("identities: mass 1, exact symmetry, mean 0, support inside ±Σ|r| plus one node per component", () => {
    const rng = seededRandom(3);
    const isi = Float64Array.from({ length: 40 }, () => (rng.uniform() - 0.5) * 0.05);
    for (const mod of ["nrz", "pam4"] as const) {
      const d = isiDistribution(isi, mod, 0.001, 1200);
      let s = 0;
      let mean = 0;
      for (let j = -d.halfBins; j <= d.halfBins; j++) {
        s += massAt(d, j);
        mean += j * massAt(d, j);
        expect(massAt(d, j)).toBe(massAt(d, -j));
      }
      expect(s).toBeCloseTo(1, 12);
      expect(Math.abs(mean)).toBeLessThan(1e-12);
      const parts = mod === "nrz" ? 40 : 80;
      expect(d.hi).toBeLessThanOrEqual(Math.ceil(peakDistortion(isi) / 0.001) + parts);
      expect(d.lo).toBe(-d.hi);
    }
  });

  it("edges: no cursors → δ(0); zero cursors change nothing; bad input throws naming the parameter", () => {
    const d = isiDistribution(new Float64Array(0), "nrz", 1, 0);
    expect(d.pmf).toEqual(Float64Array.of(1));
    const z = isiDistribution(Float64Array.of(0, 0), "pam4", 1, 2);
    expect(massAt(z, 0)).toBe(1);
    expect(() => isiDistribution(Float64Array.of(Number.NaN), "nrz", 1, 4)).toThrow(/isi\[0\]/);
    expect(() => isiDistribution(Float64Array.of(0.5), "nrz", 0.1, 2)).toThrow(/halfBins/);
    expect(() => isiDistribution(Float64Array.of(0.5), "nrz", 0, 2)).toThrow(/step_V/);
    expect(() => isiDistribution(Float64Array.of(0.5), "qam" as "nrz", 0.1, 8)).toThrow(/modulation/);
  });
});
