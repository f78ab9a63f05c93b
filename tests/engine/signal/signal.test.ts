// Convolution, interpolation, resampling, windows, decibels and the seeded generator.
import { describe, expect, it } from "vitest";
import {
  convolve,
  DB_FLOOR,
  dbToLinear,
  dbToPowerRatio,
  hannWindow,
  interpolateLinear,
  linearToDb,
  magnitudeDb,
  powerRatioToDb,
  raisedCosineRolloff,
  resampleLinear,
  seededRandom,
} from "@lib/signal";

const directConvolution = (a: Float64Array, b: Float64Array) => {
  const y = new Float64Array(a.length + b.length - 1);
  for (let i = 0; i < a.length; i++) for (let j = 0; j < b.length; j++) y[i + j] += a[i] * b[j];
  return y;
};

describe("convolve", () => {
  it("analytic: [1, 2, 3] * [0, 1, 0.5] = [0, 1, 2.5, 4, 1.5]", () => {
    expect(Array.from(convolve(Float64Array.of(1, 2, 3), Float64Array.of(0, 1, 0.5)))).toEqual([0, 1, 2.5, 4, 1.5]);
  });
  it("oracle: the FFT route matches the direct sum for long inputs (seed 21, tol 1e-10)", () => {
    const r = seededRandom(21);
    const a = Float64Array.from({ length: 700 }, r.normal);
    const b = Float64Array.from({ length: 333 }, r.normal);
    const got = convolve(a, b);
    const want = directConvolution(a, b);
    expect(got.length).toBe(1032);
    for (let i = 0; i < got.length; i++) expect(Math.abs(got[i] - want[i])).toBeLessThan(1e-10);
  });
  it("identities: commutative; a unit impulse is neutral; sums multiply", () => {
    const r = seededRandom(4);
    const a = Float64Array.from({ length: 300 }, r.normal);
    const b = Float64Array.from({ length: 200 }, r.normal);
    const ab = convolve(a, b);
    const ba = convolve(b, a);
    for (let i = 0; i < ab.length; i++) expect(Math.abs(ab[i] - ba[i])).toBeLessThan(1e-10);
    expect(Array.from(convolve(a, Float64Array.of(1)))).toEqual(Array.from(a));
    const sum = (x: Float64Array) => x.reduce((s, v) => s + v, 0);
    expect(Math.abs(sum(ab) - sum(a) * sum(b))).toBeLessThan(1e-8);
  });
  it("edges: single samples and empty inputs", () => {
    expect(Array.from(convolve(Float64Array.of(2), Float64Array.of(3)))).toEqual([6]);
    expect(() => convolve(new Float64Array(0), Float64Array.of(1))).toThrow(/a must/);
  });
});

describe("interpolateLinear / resampleLinear", () => {
  it("analytic: reproduces a straight line exactly and holds or zeroes outside", () => {
    const x = Float64Array.of(0, 1, 3);
    const y = Float64Array.of(1, 3, 7); // y = 2x + 1
    const q = Float64Array.of(-1, 0.5, 2, 3, 4);
    expect(Array.from(interpolateLinear(x, y, q))).toEqual([1, 2, 5, 7, 7]);
    expect(Array.from(interpolateLinear(x, y, q, "zero"))).toEqual([0, 2, 5, 7, 0]);
    expect(Array.from(interpolateLinear(x, y, Float64Array.of(2.5, 0.25)))).toEqual([6, 1.5]);
  });
  it("identity: resampling a ramp by any ratio stays on the ramp; same step returns the input", () => {
    const v = Float64Array.from({ length: 101 }, (_, i) => 0.5 * i);
    const r = resampleLinear(v, 1e-12, 0.37e-12);
    expect(r.length).toBe(Math.floor(100 / 0.37) + 1);
    for (let j = 0; j < r.length; j++) expect(Math.abs(r[j] - 0.5 * ((j * 0.37e-12) / 1e-12))).toBeLessThan(1e-9);
    expect(Array.from(resampleLinear(v, 2e-12, 2e-12))).toEqual(Array.from(v));
  });
  it("oracle: resampling a sine finely sampled stays within the linear-interpolation bound", () => {
    const dt = 1e-3;
    const v = Float64Array.from({ length: 2001 }, (_, i) => Math.sin(2 * Math.PI * 3 * i * dt));
    const r = resampleLinear(v, dt, 0.7e-3);
    // |error| ≤ dt²/8 · max|f''| = dt²/8 · (2π·3)²
    const bound = ((dt * dt) / 8) * (2 * Math.PI * 3) ** 2 + 1e-12;
    for (let j = 0; j < r.length; j++) {
      expect(Math.abs(r[j] - Math.sin(2 * Math.PI * 3 * j * 0.7e-3))).toBeLessThanOrEqual(bound);
    }
  });
  it("edges: refuses non-ascending abscissae, NaN and bad steps", () => {
    expect(() => interpolateLinear(Float64Array.of(0, 0), Float64Array.of(1, 2), Float64Array.of(0))).toThrow(/ascend/);
    expect(() => interpolateLinear(Float64Array.of(0), Float64Array.of(1, 2), Float64Array.of(0))).toThrow(/length/);
    expect(() => interpolateLinear(Float64Array.of(0, 1), Float64Array.of(1, Number.NaN), Float64Array.of(0))).toThrow(
      /finite/,
    );
    expect(() => interpolateLinear(Float64Array.of(0, 1), Float64Array.of(1, 2), Float64Array.of(Number.NaN))).toThrow(
      /NaN/,
    );
    expect(Array.from(interpolateLinear(Float64Array.of(5), Float64Array.of(2), Float64Array.of(5)))).toEqual([2]);
    expect(() => resampleLinear(Float64Array.of(1), 0, 1)).toThrow(/dtIn_s/);
    expect(() => resampleLinear(Float64Array.of(1), 1, -1)).toThrow(/dtOut_s/);
    expect(Array.from(resampleLinear(Float64Array.of(4), 1, 0.5))).toEqual([4]);
  });
});

describe("windows and decibels", () => {
  it("analytic: Hann endpoints, centre and symmetry; roll-off edges and midpoint", () => {
    const w = hannWindow(9);
    expect(w[0]).toBe(0);
    expect(w[4]).toBeCloseTo(1, 15);
    for (let i = 0; i < 9; i++) expect(w[i]).toBeCloseTo(w[8 - i], 15);
    expect(Array.from(hannWindow(1))).toEqual([1]);
    expect(raisedCosineRolloff(1, 2, 4)).toBe(1);
    expect(raisedCosineRolloff(3, 2, 4)).toBeCloseTo(0.5, 15);
    expect(raisedCosineRolloff(5, 2, 4)).toBe(0);
    expect(raisedCosineRolloff(2, 2, 2)).toBe(1);
    expect(() => raisedCosineRolloff(1, 3, 2)).toThrow(/stop/);
    expect(() => hannWindow(0)).toThrow(/n must/);
  });
  it("analytic and identities: dB pairs invert; 6.0206 dB doubles amplitude; −3.0103 dB halves power", () => {
    expect(dbToLinear(20 * Math.log10(2))).toBeCloseTo(2, 14);
    expect(linearToDb(0.5)).toBeCloseTo(-6.0206, 4);
    expect(powerRatioToDb(0.5)).toBeCloseTo(-3.0103, 4);
    for (const g of [-40, -3.2, 0, 7.5]) {
      expect(linearToDb(dbToLinear(g))).toBeCloseTo(g, 12);
      expect(powerRatioToDb(dbToPowerRatio(g))).toBeCloseTo(g, 12);
    }
    expect(linearToDb(0)).toBe(Number.NEGATIVE_INFINITY);
    expect(Array.from(magnitudeDb(Float64Array.of(3, 0, 0), Float64Array.of(4, 0.1, 0)))).toEqual([
      20 * Math.log10(5),
      -20,
      DB_FLOOR,
    ]);
    expect(() => magnitudeDb([Number.NaN], [0])).toThrow(/NaN/);
    expect(() => dbToLinear(Number.NaN)).toThrow(/gain_dB/);
    expect(() => powerRatioToDb(-1)).toThrow(/ratio/);
    expect(() => linearToDb(Number.NaN)).toThrow(/NaN/);
  });
});

describe("seededRandom", () => {
  it("identities: same seed same sequence; sample moments of uniform, normal and sign (seed 9)", () => {
    const a = seededRandom(9);
    const b = seededRandom(9);
    for (let i = 0; i < 100; i++) expect(a.uniform()).toBe(b.uniform());
    const r = seededRandom(9);
    const n = 200_000;
    let su = 0;
    let sn = 0;
    let sn2 = 0;
    let ss = 0;
    let outOfRange = 0;
    for (let i = 0; i < n; i++) {
      const u = r.uniform();
      if (!(u >= 0 && u < 1)) outOfRange++;
      su += u;
      const g = r.normal();
      sn += g;
      sn2 += g * g;
      ss += r.sign();
    }
    expect(outOfRange).toBe(0);
    expect(Math.abs(su / n - 0.5)).toBeLessThan(0.005);
    expect(Math.abs(sn / n)).toBeLessThan(0.01);
    expect(Math.abs(sn2 / n - 1)).toBeLessThan(0.01);
    expect(Math.abs(ss / n)).toBeLessThan(0.01);
    expect(() => seededRandom(1.5)).toThrow(/seed/);
  });
});
