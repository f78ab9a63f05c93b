// The quantile bound that spares the optimizer a convolution: never below the computed law's
// quantile, and close to it when noise and many small cursors make the tail.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { qFromBer } from "@lib/analysis/ber";
import { isiParts } from "@lib/analysis/isiParts";
import { lawStep } from "@lib/analysis/lawStep";
import { residualIsi } from "@lib/analysis/phaseLaws";
import { quantileBound } from "@lib/analysis/quantileBound";
import { sampleDistribution } from "@lib/analysis/sampleDistribution";
import { statisticalEye } from "@lib/analysis/statisticalEye";
import { seededRandom } from "@lib/signal/seededRandom";
import { cursorPulse } from "./helpers.ts";

/** An equalized residual: one large cursor and a long, small, decaying tail (as after a CTLE + FIR). */
function residual(seed: number, big: number, tail: number, length = 100): Float64Array {
  const rng = seededRandom(seed);
  const isi = new Float64Array(length);
  for (let i = 0; i < length; i++) isi[i] = (rng.uniform() - 0.5) * tail * Math.exp(-i / 25);
  isi[2] += big;
  return isi;
}

describe("quantileBound", () => {
  it("analytic: noise alone gives −Q(p)·σ rounded up to the grid [computed, BER = ½·erfc(Q/√2)], tol one step", () => {
    const sigma = 0.002;
    const step = lawStep(new Float64Array(3), sigma);
    for (const p of [1e-3, 1e-6, 1e-12, 1e-20]) {
      const b = quantileBound(new Float64Array(3), sigma, p);
      const q = -qFromBer(p) * sigma;
      expect(b).toBeGreaterThanOrEqual(q - 1e-6 * sigma);
      expect(b - q).toBeLessThanOrEqual(step + 1e-6 * sigma);
    }
  });

  it("oracle: never below sampleDistribution's quantile (property, NRZ and PAM4, 1e-2 … 1e-30)", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 1_000_000 }),
        fc.integer({ min: 1, max: 140 }),
        fc.constantFrom(0, 0.01, 0.03, 0.08),
        fc.constantFrom(0.0005, 0.002, 0.008),
        fc.constantFrom(0.0002, 0.001, 0.004),
        fc.constantFrom("nrz" as const, "pam4" as const),
        fc.double({ min: 2, max: 30, noNaN: true }),
        fc.constantFrom(undefined, 1e-12, 1e-4),
        (seed, length, big, tail, sigma, mod, exp10, designTail) => {
          const parts = isiParts(residual(seed, big, tail, length), mod);
          const p = 10 ** -exp10;
          const q = sampleDistribution(parts, sigma, { designTail }).quantile(p);
          return quantileBound(parts, sigma, p, { designTail }) >= q;
        },
      ),
      { seed: 2024, numRuns: 300 },
    );
  });

  it("oracle: within 0.5·σ of the quantile for an equalized residual at 1e-12 … 1e-6 [computed]", () => {
    for (const [seed, big] of [
      [1, 0.03],
      [2, 0],
      [3, 0.012],
    ] as const) {
      for (const mod of ["nrz", "pam4"] as const) {
        const parts = isiParts(residual(seed, big, 0.004), mod);
        for (const p of [1e-12, 3e-9, 1e-6]) {
          const q = sampleDistribution(parts, 0.002, { designTail: p }).quantile(p);
          const b = quantileBound(parts, 0.002, p, { designTail: p });
          expect(b).toBeGreaterThanOrEqual(q);
          expect(b - q).toBeLessThan(0.5 * 0.002);
        }
      }
    }
  });

  it("identities: the signs of the cursors do not matter; the statistical eye's bound is the quantile once the law exists", () => {
    const isi = residual(5, 0.02, 0.003);
    const flipped = isi.map((v, i) => (i % 3 === 0 ? -v : v));
    expect(quantileBound(isiParts(flipped, "nrz"), 0.002, 1e-12)).toBe(
      quantileBound(isiParts(isi, "nrz"), 0.002, 1e-12),
    );

    const pulse = cursorPulse([0, 0.03, 0.4, 0.08, 0.02, 0.01, 0], 2, 8);
    const eye = statisticalEye(pulse, { modulation: "nrz", noiseRms_V: 0.003, dfeTaps: [0.05] });
    const light = eye.quantileBound(1, 1e-10);
    const law = eye.distribution(1);
    expect(light).toBeGreaterThanOrEqual(law.quantile(1e-10));
    expect(eye.quantileBound(1, 1e-10)).toBe(law.quantile(1e-10));
  });

  it("residualIsi: pre-cursors, then post-cursors less the DFE taps (a tap beyond the cursors leaves −tap)", () => {
    const isi = residualIsi(Float64Array.of(0.1, 1, 0.3, 0.2), 1, [0.25, 0.1, 0.05]);
    expect(Array.from(isi).map((v) => Math.round(v * 1e12) / 1e12)).toEqual([0.1, 0.05, 0.1, -0.05]);
  });

  it("edges: no noise and nothing lumped gives Infinity; bad p, noise or parts are refused by name", () => {
    expect(quantileBound(Float64Array.of(0.01), 0, 1e-12)).toBe(Number.POSITIVE_INFINITY);
    expect(() => quantileBound(Float64Array.of(0.01), 0.001, 0.5)).toThrow(/p must/);
    expect(() => quantileBound(Float64Array.of(0.01), 0.001, 0)).toThrow(/p must/);
    expect(() => quantileBound(Float64Array.of(0.01), -1, 1e-6)).toThrow(/noiseRms_V/);
    expect(() => quantileBound(Float64Array.of(Number.NaN), 0.001, 1e-6)).toThrow(/parts\[0\]/);
    expect(() => quantileBound([0.01] as unknown as Float64Array, 0.001, 1e-6)).toThrow(TypeError);
  });
});
