// FFT plan over fft.js: checked against a naive DFT, identities and analytic inputs.
import { describe, expect, it } from "vitest";
import { createFftPlan, nextPowerOfTwo, seededRandom, type ComplexArray } from "@lib/signal";

/** Test oracle only: the O(N²) DFT straight from its definition. */
function naiveDft(x: ComplexArray, sign: -1 | 1): ComplexArray {
  const n = x.re.length;
  const re = new Float64Array(n);
  const im = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    let sr = 0;
    let si = 0;
    for (let t = 0; t < n; t++) {
      const a = (sign * 2 * Math.PI * ((k * t) % n)) / n;
      sr += x.re[t] * Math.cos(a) - x.im[t] * Math.sin(a);
      si += x.re[t] * Math.sin(a) + x.im[t] * Math.cos(a);
    }
    re[k] = sr;
    im[k] = si;
  }
  return { re, im };
}

const randomComplex = (n: number, seed: number): ComplexArray => {
  const r = seededRandom(seed);
  return { re: Float64Array.from({ length: n }, r.normal), im: Float64Array.from({ length: n }, r.normal) };
};
const maxDiff = (a: Float64Array, b: Float64Array) => a.reduce((m, v, i) => Math.max(m, Math.abs(v - b[i])), 0);

describe("FftPlan", () => {
  it.each([2, 4, 8, 16, 32, 64, 128, 512])("oracle: forward matches the naive DFT at N = %i (tol 1e-9)", (n) => {
    const x = randomComplex(n, 100 + n);
    const got = createFftPlan(n).forward(x);
    const want = naiveDft(x, -1);
    expect(maxDiff(got.re, want.re)).toBeLessThan(1e-9);
    expect(maxDiff(got.im, want.im)).toBeLessThan(1e-9);
  });

  it.each([2, 4, 8, 32, 256])("oracle: realForward matches the naive DFT's half spectrum at N = %i", (n) => {
    const r = seededRandom(7 * n);
    const x = Float64Array.from({ length: n }, r.normal);
    const half = createFftPlan(n).realForward(x);
    const want = naiveDft({ re: x, im: new Float64Array(n) }, -1);
    expect(half.re.length).toBe(n / 2 + 1);
    expect(maxDiff(half.re, want.re.slice(0, n / 2 + 1))).toBeLessThan(1e-9);
    expect(maxDiff(half.im, want.im.slice(0, n / 2 + 1))).toBeLessThan(1e-9);
  });

  it("identities: inverse∘forward = id, realInverse∘realForward = id, Parseval (N = 1024)", () => {
    const n = 1024;
    const plan = createFftPlan(n);
    const x = randomComplex(n, 3);
    const back = plan.inverse(plan.forward(x));
    expect(maxDiff(back.re, x.re)).toBeLessThan(1e-12);
    expect(maxDiff(back.im, x.im)).toBeLessThan(1e-12);
    const xr = x.re;
    expect(maxDiff(plan.realInverse(plan.realForward(xr)), xr)).toBeLessThan(1e-12);
    const X = plan.forward(x);
    let et = 0;
    let ef = 0;
    for (let i = 0; i < n; i++) {
      et += x.re[i] ** 2 + x.im[i] ** 2;
      ef += X.re[i] ** 2 + X.im[i] ** 2;
    }
    expect(Math.abs(ef / n - et) / et).toBeLessThan(1e-12);
  });

  it("analytic: a unit impulse has a flat spectrum; a cosine at bin 3 has two lines of N/2", () => {
    const n = 16;
    const plan = createFftPlan(n);
    const d = new Float64Array(n);
    d[0] = 1;
    const D = plan.realForward(d);
    expect(Array.from(D.re)).toEqual(new Array(n / 2 + 1).fill(1));
    const c = Float64Array.from({ length: n }, (_, t) => Math.cos((2 * Math.PI * 3 * t) / n));
    const C = plan.realForward(c);
    for (let k = 0; k <= n / 2; k++) {
      expect(Math.abs(C.re[k] - (k === 3 ? n / 2 : 0))).toBeLessThan(1e-12);
      expect(Math.abs(C.im[k])).toBeLessThan(1e-12);
    }
    // A delayed impulse has phase −2πk·d/N (the sign convention exp(−i2πkn/N)).
    const s = new Float64Array(n);
    s[1] = 1;
    const S = plan.realForward(s);
    expect(S.im[1]).toBeCloseTo(-Math.sin((2 * Math.PI) / n), 14);
  });

  it("edges: short real input is zero-padded; the plan is reusable; bad sizes are refused", () => {
    const plan = createFftPlan(8);
    const a = plan.realForward(Float64Array.of(1, 1));
    const b = plan.realForward(Float64Array.of(1, 1, 0, 0, 0, 0, 0, 0));
    expect(Array.from(a.re)).toEqual(Array.from(b.re));
    expect(() => createFftPlan(12)).toThrow(/size/);
    expect(() => createFftPlan(1)).toThrow(/size/);
    expect(() => plan.realForward(new Float64Array(9))).toThrow(/length/);
    expect(() => plan.realInverse({ re: new Float64Array(4), im: new Float64Array(4) })).toThrow(/bins/);
    expect(() => plan.forward({ re: new Float64Array(4), im: new Float64Array(8) })).toThrow(/length 8/);
    expect(nextPowerOfTwo(0)).toBe(2);
    expect(nextPowerOfTwo(1025)).toBe(2048);
    expect(nextPowerOfTwo(1024)).toBe(1024);
  });
});
