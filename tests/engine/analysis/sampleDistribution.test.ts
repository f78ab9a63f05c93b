// ISI plus Gaussian noise at one phase: quantiles against the Q function, brute-force enumeration and
// the independent Laplace-inversion reference; identities; edges.
import { describe, expect, it } from "vitest";
import { berFromQ, qFromBer } from "@lib/analysis/ber";
import { isiParts } from "@lib/analysis/isiParts";
import { lawStep } from "@lib/analysis/lawStep";
import { sampleDistribution } from "@lib/analysis/sampleDistribution";
import { tailTilt } from "@lib/analysis/tailTilt";
import { seededRandom } from "@lib/signal/seededRandom";
import { enumerateIsi, normalCdfOracle } from "./helpers.ts";
import { referenceQuantile } from "./tailReference.ts";

/** The exact lower p-quantile of an enumerated ISI law plus Gaussian noise (bisection). */
function enumeratedQuantile(values: number[], prob: number, sigma: number, p: number): number {
  const below = (u: number) => values.reduce((s, v) => s + prob * berFromQ((v - u) / sigma), 0);
  let lo = -1;
  let hi = 1;
  for (let i = 0; i < 80; i++) {
    const m = (lo + hi) / 2;
    if (below(m) < p) lo = m;
    else hi = m;
  }
  return lo;
}

describe("sampleDistribution", () => {
  it("analytic: noise alone gives the Gaussian quantile −Q(p)·σ [computed, BER = ½·erfc(Q/√2)], tol 1e-3·σ", () => {
    const sigma = 0.004;
    const d = sampleDistribution(new Float64Array(0), sigma);
    for (const p of [1e-3, 1e-6, 1e-9, 1e-12, 1e-15]) {
      expect(Math.abs(d.quantile(p) + qFromBer(p) * sigma)).toBeLessThan(1e-3 * sigma);
    }
    expect(d.probBelow(-3 * sigma) / berFromQ(3)).toBeCloseTo(1, 3);
  });

  it("analytic: one NRZ part r on a grid node: P(Y < −r − x) = ½Φ(−x/σ) + ½Φ(−(x+2r)/σ), rel 1e-3", () => {
    const sigma = 0.01;
    const r = 200 * lawStep(Float64Array.of(0.01), sigma); // the step does not depend on r until r is large
    const d = sampleDistribution(Float64Array.of(r), sigma);
    expect((r / d.isi.step_V) % 1).toBeCloseTo(0, 9);
    for (const x of [0.02, 0.04, 0.06]) {
      const want = 0.5 * normalCdfOracle(-x / sigma) + 0.5 * normalCdfOracle(-(x + 2 * r) / sigma);
      expect(Math.abs(d.probBelow(-r - x) / want - 1)).toBeLessThan(1e-3);
    }
  });

  it("oracle: quantiles match brute-force enumeration (off-grid cursors) within 2 µV at the design tail, NRZ and PAM4", () => {
    const rng = seededRandom(11);
    const isi = Array.from({ length: 9 }, () => (rng.uniform() - 0.5) * 0.08);
    const sigma = 0.006;
    for (const mod of ["nrz", "pam4"] as const) {
      const used = isi.slice(0, mod === "nrz" ? 9 : 6);
      const alphabet = mod === "nrz" ? [-1, 1] : [-1, -1 / 3, 1 / 3, 1];
      const { values, prob } = enumerateIsi(used, alphabet);
      for (const p of [1e-4, 1e-9, 1e-13]) {
        const d = sampleDistribution(isiParts(Float64Array.from(used), mod), sigma, { designTail: p });
        expect(Math.abs(d.quantile(p) - enumeratedQuantile(values, prob, sigma, p))).toBeLessThan(2e-6);
      }
    }
  });

  it("oracle: a 250-part equalized residual against the Laplace-inversion reference, within 0.02 mV at 1e-12 and 0.05 mV at 1e-6 … 1e-15", () => {
    const rng = seededRandom(5);
    const isi = Float64Array.from({ length: 250 }, (_, i) => (rng.uniform() - 0.5) * 0.004 * Math.exp(-i / 40));
    isi[1] = 0.007;
    isi[3] = -0.003;
    const parts = isiParts(isi, "nrz");
    const sigma = 0.0015;
    const d = sampleDistribution(parts, sigma, { designTail: 1e-12 });
    const m = Array.from(parts);
    expect(Math.abs(d.quantile(1e-12) - referenceQuantile(m, sigma, 1e-12))).toBeLessThan(2e-5);
    for (const p of [1e-6, 1e-9, 1e-15])
      expect(Math.abs(d.quantile(p) - referenceQuantile(m, sigma, p))).toBeLessThan(5e-5);
  }, 60_000);

  it("identities: P(Y<u) + P(Y>u) = 1, monotone, symmetric; quantile inverts probBelow", () => {
    const d = sampleDistribution(isiParts(Float64Array.of(0.02, -0.01, 0.005), "pam4"), 0.003);
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

  it("identities: halving the step moves a 1e-12 quantile by less than 10 µV; the Gaussian holds σ² plus the lumped variance", () => {
    const rng = seededRandom(9);
    const parts = Float64Array.from(
      { length: 120 },
      (_, i) => Math.abs(rng.uniform() - 0.5) * 0.01 * Math.exp(-i / 20),
    );
    const a = sampleDistribution(parts, 0.002, { designTail: 1e-12 });
    const b = sampleDistribution(parts, 0.002, { designTail: 1e-12, refine: 2 });
    expect(b.isi.step_V).toBeCloseTo(a.isi.step_V / 2, 15);
    expect(Math.abs(a.quantile(1e-12) - b.quantile(1e-12))).toBeLessThan(1e-5);
    expect(a.gaussianRms_V ** 2).toBeCloseTo(0.002 ** 2 + a.isi.lumpedVariance_V2, 15);
  });

  it("edges: σ = 0 gives the discrete law (point mass, two points); bad arguments throw", () => {
    const point = sampleDistribution(new Float64Array(0), 0);
    expect(point.quantile(1e-12)).toBe(0);
    expect(point.probBelow(1e-9)).toBe(1);
    expect(point.probBelow(0)).toBe(0);
    const two = sampleDistribution(Float64Array.of(0.1), 0);
    expect(two.quantile(1e-12)).toBeCloseTo(-0.1, 12);
    expect(two.quantile(0.7)).toBeCloseTo(0.1, 12);
    expect(two.probBelow(0)).toBeCloseTo(0.5, 15);
    expect(() => sampleDistribution(new Float64Array(0), -1)).toThrow(/noiseRms_V/);
    expect(() => sampleDistribution(new Float64Array(0), 0.1, { refine: 0.5 })).toThrow(/refine/);
    expect(() => sampleDistribution(Float64Array.of(0.1), 0.1, { designTail: 0.7 })).toThrow(/designTail/);
    expect(() => point.quantile(0)).toThrow(/p must/);
    expect(() => sampleDistribution(Float64Array.of(Number.POSITIVE_INFINITY), 0.1)).toThrow(/not finite/);
  });
});

describe("sampleDistribution — a design tail below the smallest atom", () => {
  it("no noise, two parts a hair apart, tail 2e-12 below the atom ¼: the tilt is capped and the lowest node is the quantile (−Σm), not NaN", () => {
    const d = sampleDistribution(Float64Array.of(0.05000000000000002, 0.05), 0, { designTail: 2e-12 });
    expect(d.quantile(2e-12)).toBeCloseTo(-0.1, 9);
    expect(d.isi.pmf.every((x) => Number.isFinite(x))).toBe(true);
    expect(Number.isFinite(tailTilt(Float64Array.of(0.05, 0.05), 0, 2e-12))).toBe(true);
  });
});
