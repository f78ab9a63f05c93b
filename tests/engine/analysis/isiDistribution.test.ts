// The ISI law on a grid: exact two-/four-point laws, the moment-keeping split, lumping, a brute-force
// oracle, identities, edges.
import { describe, expect, it } from "vitest";
import { isiDistribution, lumpedVariance, peakDistortion, splitWeight } from "@lib/analysis/isiDistribution";
import { isiParts } from "@lib/analysis/isiParts";
import { seededRandom } from "@lib/signal/seededRandom";
import { enumerateIsi } from "./helpers.ts";

const massAt = (d: ReturnType<typeof isiDistribution>, j: number) => d.pmf[d.halfBins + j];

describe("isiDistribution", () => {
  it("analytic: one NRZ part on a grid node gives ½ at ±r", () => {
    const d = isiDistribution(Float64Array.of(0.3), 0.1);
    expect(massAt(d, 3)).toBeCloseTo(0.5, 15);
    expect(massAt(d, -3)).toBeCloseTo(0.5, 15);
    expect(massAt(d, 0)).toBe(0);
    expect(d.lumpedVariance_V2).toBe(0);
  });

  it("analytic: one PAM4 cursor (parts 2r/3 and r/3) gives ¼ at ±r and ±r/3", () => {
    const d = isiDistribution(isiParts(Float64Array.of(0.3), "pam4"), 0.1 - 1e-15);
    for (const j of [-3, -1, 1, 3]) expect(massAt(d, j)).toBeCloseTo(0.25, 12);
    expect(massAt(d, 0) + massAt(d, 2) + massAt(d, -2)).toBeCloseTo(0, 12);
  });

  it("analytic: a part between nodes keeps its variance — 1.25 steps puts (1.25² − 1)/3 on ±2", () => {
    const d = isiDistribution(Float64Array.of(0.125), 0.1);
    const w = (1.25 ** 2 - 1) / 3;
    expect(massAt(d, 1)).toBeCloseTo(0.5 * (1 - w), 14);
    expect(massAt(d, 2)).toBeCloseTo(0.5 * w, 14);
    expect(massAt(d, -2)).toBe(massAt(d, 2));
    let v = 0;
    for (let j = d.lo; j <= d.hi; j++) v += massAt(d, j) * (j * 0.1) ** 2;
    expect(v).toBeCloseTo(0.125 ** 2, 15);
  });

  it("analytic: with a tilt the split matches the part's moment generating function there", () => {
    for (const [m, x] of [
      [1.25, 0.3],
      [7.6, 0.4],
      [300.5, 0.2],
      [2.01, 1e-3],
    ]) {
      const s = Math.floor(m);
      const w = splitWeight(m, s, x);
      const lhs = Math.log((1 - w) * Math.cosh(x * s) + w * Math.cosh(x * (s + 1)));
      expect(lhs / Math.log(Math.cosh(x * m))).toBeCloseTo(1, 9);
    }
    expect(splitWeight(1.25, 1, 0)).toBeCloseTo((1.25 ** 2 - 1) / 3, 15);
    expect(splitWeight(1.25, 1, 1e-7)).toBeCloseTo((1.25 ** 2 - 1) / 3, 9);
  });

  it("analytic: parts below one step leave the grid as variance (m² untilted, 2·log cosh(λm)/λ² tilted)", () => {
    const d = isiDistribution(Float64Array.of(0.05, 0.03, 0.3), 0.1);
    expect(d.lumpedVariance_V2).toBeCloseTo(0.05 ** 2 + 0.03 ** 2, 15);
    expect(d.gridParts).toBe(1);
    const t = isiDistribution(Float64Array.of(0.05), 0.1, 20);
    expect(t.lumpedVariance_V2).toBeCloseTo((2 * Math.log(Math.cosh(20 * 0.05))) / 400, 14);
    expect(lumpedVariance(0.05, 0)).toBe(0.05 ** 2);
  });

  it("oracle: mean and variance exact against brute-force enumeration of all 2^8 patterns; CDF within one node per part", () => {
    const rng = seededRandom(7);
    const isi = Array.from({ length: 8 }, () => (rng.uniform() - 0.5) * 0.2);
    const step = 0.002;
    const d = isiDistribution(isiParts(Float64Array.from(isi), "nrz"), step);
    const { values, prob } = enumerateIsi(isi, [-1, 1]);
    let m2 = d.lumpedVariance_V2;
    let m2Exact = 0;
    for (let j = d.lo; j <= d.hi; j++) m2 += massAt(d, j) * (j * step) ** 2;
    for (const v of values) m2Exact += prob * v * v;
    expect(m2 / m2Exact).toBeCloseTo(1, 12);
    for (const u of [-0.15, -0.05, 0.01, 0.08]) {
      let cdf = 0;
      for (let j = d.lo; j <= d.hi; j++) if (j * step <= u) cdf += massAt(d, j);
      const lowEnough = values.filter((v) => v <= u - 8 * step).length * prob;
      const highEnough = values.filter((v) => v <= u + 8 * step).length * prob;
      expect(cdf).toBeGreaterThanOrEqual(lowEnough - 1e-12);
      expect(cdf).toBeLessThanOrEqual(highEnough + 1e-12);
    }
  });

  it("identities: mass 1, exact symmetry, mean 0, support inside ±Σm plus one node per part", () => {
    const rng = seededRandom(3);
    const isi = Float64Array.from({ length: 40 }, () => (rng.uniform() - 0.5) * 0.05);
    for (const mod of ["nrz", "pam4"] as const) {
      for (const tilt of [0, 300]) {
        const parts = isiParts(isi, mod);
        const d = isiDistribution(parts, 0.001, tilt);
        let s = 0;
        let mean = 0;
        for (let j = -d.halfBins; j <= d.halfBins; j++) {
          s += massAt(d, j);
          mean += j * massAt(d, j);
          expect(massAt(d, j)).toBe(massAt(d, -j));
        }
        expect(s).toBeCloseTo(1, 12);
        expect(Math.abs(mean)).toBeLessThan(1e-12);
        expect(d.hi).toBeLessThanOrEqual(Math.ceil(peakDistortion(parts) / 0.001) + d.gridParts);
        expect(d.lo).toBe(-d.hi);
      }
    }
  });

  it("edges: no parts → δ(0); zero parts change nothing; bad input throws naming the parameter", () => {
    const d = isiDistribution(new Float64Array(0), 1);
    expect(d.pmf).toEqual(Float64Array.of(1));
    const z = isiDistribution(Float64Array.of(0, 0), 1);
    expect(massAt(z, 0)).toBe(1);
    expect(z.lumpedVariance_V2).toBe(0);
    expect(() => isiDistribution(Float64Array.of(Number.NaN), 1)).toThrow(/parts\[0\]/);
    expect(() => isiDistribution(Float64Array.of(-0.1), 1)).toThrow(/parts\[0\]/);
    expect(() => isiDistribution(Float64Array.of(0.5), 0)).toThrow(/step_V/);
    expect(() => isiDistribution(Float64Array.of(0.5), 0.1, -1)).toThrow(/tilt_perV/);
    expect(() => isiDistribution([0.5] as unknown as Float64Array, 0.1)).toThrow(TypeError);
  });
});

describe("isiParts", () => {
  it("analytic: NRZ |r|; PAM4 levels ±1, ±x are the sums ±(1+x)/2 ± (1−x)/2", () => {
    expect(Array.from(isiParts(Float64Array.of(-0.3, 0.1), "nrz"))).toEqual([0.3, 0.1]);
    const p = isiParts(Float64Array.of(-0.3), "pam4");
    expect(p[0]).toBeCloseTo(0.2, 15);
    expect(p[1]).toBeCloseTo(0.1, 15);
    const rlm = isiParts(Float64Array.of(1), "pam4", 0.3);
    const sums = [-1, 1].flatMap((a) => [-1, 1].map((b) => a * rlm[0] + b * rlm[1])).sort((a, b) => a - b);
    sums.forEach((v, i) => expect(v).toBeCloseTo([-1, -0.3, 0.3, 1][i], 15));
  });

  it("edges: bad input throws naming the parameter", () => {
    expect(() => isiParts(Float64Array.of(Number.NaN), "nrz")).toThrow(/isi\[0\]/);
    expect(() => isiParts(Float64Array.of(0.1), "qam" as "nrz")).toThrow(/modulation/);
    expect(() => isiParts(Float64Array.of(0.1), "pam4", 1)).toThrow(/innerLevel/);
  });
});
