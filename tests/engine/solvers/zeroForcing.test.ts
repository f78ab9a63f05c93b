// Zero-forcing: the textbook examples, least squares over a wider window, normalization.
import { describe, expect, it } from "vitest";
import { zeroForcing } from "@lib/solvers";
import { firNoiseGain } from "@lib/equalizers";
import { seededRandom } from "@lib/signal";
import { normalEquations } from "./oracle.ts";

const cur = (h: number[], main: number) => ({ h: Float64Array.from(h), main });

describe("zeroForcing", () => {
  // [source] Sklar, Digital Communications, 2nd ed., ch. 3, three-tap zero-forcing example (shared/references.md).
  it("Sklar's three-tap example: c = −180/841, 810/841, 10/29 and z(−3…3) [source: Sklar, 2nd ed., ch. 3]", () => {
    const r = zeroForcing(cur([0.0, 0.2, 0.9, -0.3, 0.1], 2), 1, 1);
    const want = [-180 / 841, 810 / 841, 10 / 29];
    want.forEach((w, j) => expect(Math.abs(r.taps[j] - w)).toBeLessThan(1e-4));
    expect(Math.abs(r.taps[0] - -0.214)).toBeLessThan(1e-4);
    expect(Math.abs(r.taps[1] - 0.9631)).toBeLessThan(1e-4);
    expect(Math.abs(r.taps[2] - 0.3448)).toBeLessThan(1e-4);
    const z = [0, -0.0428, 0, 1, 0, -0.0071, 0.0345];
    expect(r.equalized.main).toBe(3);
    z.forEach((w, i) => expect(Math.abs(r.equalized.h[i] - w)).toBeLessThan(1e-4));
  });

  // [source] Proakis & Salehi, Communication Systems Engineering, 2nd ed., Problem 10.32; answer [computed].
  it("Proakis & Salehi Problem 10.32: c = −15/44, 25/22, −5/22; z(±2) [source + computed]", () => {
    const r = zeroForcing(cur([0.3, 1, 0.2], 1), 1, 1);
    [-15 / 44, 25 / 22, -5 / 22].forEach((w, j) => expect(Math.abs(r.taps[j] - w)).toBeLessThan(1e-5));
    expect(Math.abs(r.equalized.h[r.equalized.main - 2] - -0.10227)).toBeLessThan(1e-5);
    expect(Math.abs(r.equalized.h[r.equalized.main + 2] - -0.04545)).toBeLessThan(1e-5);
  });

  // [memory] Barry, Lee & Messerschmitt, Digital Communication, 3rd ed.: noise enhancement 1/(1 − a²), recalled, not re-read.
  it.each([
    [0.5, 1.249],
    [0.9, 7.212],
  ])(
    "long ZF on 1 + a·z⁻¹ (a = %s) enhances noise by 1/(1 − a²) = %s dB [memory: Barry, Lee & Messerschmitt]",
    (a, db) => {
      const r = zeroForcing(cur([1, a], 0), 0, 400);
      expect(Math.abs(10 * Math.log10(firNoiseGain(r.taps)) - db)).toBeLessThan(1e-3);
      for (let k = 0; k < 10; k++) expect(r.taps[k]).toBeCloseTo((-a) ** k, 10);
    },
  );

  it("oracle: the least-squares window solution equals the normal equations (seed 17, tol 1e-9)", () => {
    const rng = seededRandom(17);
    const h = [0.05, 0.2, 1, 0.45, -0.1, 0.08, 0.03].map((v) => v + 0.02 * rng.normal());
    const main = 2;
    const [pre, post] = [2, 4];
    const win = { pre: 4, post: 10 };
    const r = zeroForcing(cur(h, main), pre, post, { window: win });
    const rows: number[][] = [];
    const b: number[] = [];
    for (let k = -win.pre; k <= win.post; k++) {
      rows.push(Array.from({ length: pre + 1 + post }, (_, j) => h[main + pre + k - j] ?? 0));
      b.push(k === 0 ? 1 : 0);
    }
    const x = normalEquations(rows, b);
    const scale = r.equalized.h[r.equalized.main] / 1; // the solver rescales to a unit main cursor
    const g0 = rows[win.pre].reduce((s, v, j) => s + v * x[j], 0);
    x.forEach((v, j) => expect(r.taps[j]).toBeCloseTo(v / g0, 9));
    expect(scale).toBeCloseTo(1, 12);
  });

  it("identities: forced window is exact; default window = square; peak-swing scales to Σ|c| = 1", () => {
    const h = cur([0.1, -0.25, 1, 0.5, 0.2, -0.1], 2);
    const sq = zeroForcing(h, 2, 3);
    for (let n = -2; n <= 3; n++) expect(sq.equalized.h[sq.equalized.main + n]).toBeCloseTo(n === 0 ? 1 : 0, 12);
    const same = zeroForcing(h, 2, 3, { window: { pre: 2, post: 3 } });
    expect(Array.from(same.taps)).toEqual(Array.from(sq.taps));
    const ps = zeroForcing(h, 2, 3, { normalize: "peak-swing" });
    expect(ps.taps.reduce((s, c) => s + Math.abs(c), 0)).toBeCloseTo(1, 14);
    const ratio = ps.taps[0] / sq.taps[0];
    ps.taps.forEach((c, j) => expect(c).toBeCloseTo(ratio * sq.taps[j], 14));
    expect(ratio).toBeGreaterThan(0);
  });

  it("edges: single tap, singular systems, bad windows and indices", () => {
    expect(Array.from(zeroForcing(cur([0.5], 0), 0, 0).taps)).toEqual([2]);
    expect(() => zeroForcing(cur([0, 0, 0], 1), 1, 1)).toThrow(/singular/);
    expect(() => zeroForcing(cur([1, 0.5], 0), 1, 1, { window: { pre: 0, post: 1 } })).toThrow(/window/);
    expect(() => zeroForcing(cur([1, 0.5], 2), 1, 1)).toThrow(/main/);
    expect(() => zeroForcing(cur([1, Number.NaN], 0), 1, 1)).toThrow(/cursors.h\[1\]/);
    expect(() => zeroForcing(cur([1, 0.5], 0), -1, 1)).toThrow(/pre/);
    expect(() => zeroForcing(cur([1, 0.5], 0), 0, 1, { normalize: "x" as "peak-swing" })).toThrow(/normalize/);
  });
});
