// Q ↔ BER conversion: the Gaussian tail and its inverse.
import { describe, expect, it } from "vitest";
import { berFromQ, qFromBer } from "@lib/analysis/ber";

/** Gaussian tail ∫_q^∞ φ(x) dx by composite Simpson's rule — a test oracle independent of erfc. */
function tailBySimpson(q: number): number {
  const upper = q + 40;
  const n = 200_000;
  const h = (upper - q) / n;
  const phi = (x: number) => Math.exp(-0.5 * x * x) / Math.sqrt(2 * Math.PI);
  let s = phi(q) + phi(upper);
  for (let i = 1; i < n; i++) s += (i % 2 === 1 ? 4 : 2) * phi(q + i * h);
  return (s * h) / 3;
}

describe("qFromBer / berFromQ", () => {
  // [computed] from BER = ½·erfc(Q/√2), table in shared/references.md, tol 1e-4.
  it.each([
    [1e-3, 3.0902],
    [1e-6, 4.7534],
    [1e-9, 5.9978],
    [1e-12, 7.0345],
    [1e-15, 7.9413],
  ])("Q table [computed, BER = ½·erfc(Q/√2)]: BER %s → Q %s", (ber, q) => {
    expect(Math.abs(qFromBer(ber) - q)).toBeLessThan(1e-4);
  });

  it("analytic: Q = 0 gives BER ½; Q = 1 gives ½·erfc(1/√2) = 0.158655…", () => {
    expect(berFromQ(0)).toBe(0.5);
    // Φ(−1) = 0.15865525393145707 (standard normal table value).
    expect(Math.abs(berFromQ(1) - 0.15865525393145707)).toBeLessThan(1e-15);
  });

  it("oracle: matches the Gaussian tail integrated by Simpson's rule (rel 1e-9)", () => {
    for (const q of [0.5, 1.7, 3, 4.75, 6, 7.03]) {
      const want = tailBySimpson(q);
      expect(Math.abs(berFromQ(q) - want) / want).toBeLessThan(1e-9);
    }
  });

  it("identities: inverse pair (rel 1e-12) and symmetry BER(−q) = 1 − BER(q)", () => {
    for (const ber of [0.4, 0.1, 1e-2, 1e-5, 1e-10, 1e-14, 1e-20]) {
      expect(Math.abs(berFromQ(qFromBer(ber)) - ber) / ber).toBeLessThan(1e-12);
    }
    for (const q of [0.3, 1, 2.5]) {
      expect(Math.abs(berFromQ(-q) - (1 - berFromQ(q)))).toBeLessThan(1e-15);
    }
    // Monotone: larger Q, smaller BER.
    let last = 1;
    for (let q = -5; q <= 10; q += 0.25) {
      const b = berFromQ(q);
      expect(b).toBeLessThan(last);
      last = b;
    }
  });

  it("edges: refuses BER outside (0, 1) and non-finite inputs, naming the parameter", () => {
    for (const bad of [0, 1, -1e-3, 2, Number.NaN, Number.POSITIVE_INFINITY]) {
      expect(() => qFromBer(bad)).toThrow(RangeError);
      expect(() => qFromBer(bad)).toThrow(/ber/);
    }
    for (const bad of [Number.NaN, Number.POSITIVE_INFINITY, Number.NEGATIVE_INFINITY]) {
      expect(() => berFromQ(bad)).toThrow(/q must be/);
    }
    // Deep tails stay positive and finite.
    expect(berFromQ(30)).toBeGreaterThan(0);
    expect(qFromBer(1e-300)).toBeGreaterThan(37);
    expect(qFromBer(0.5)).toBe(0);
  });
});
