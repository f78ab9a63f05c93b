// Port reference impedances: re-referencing S-parameters to the system's 50 Ω.
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { renormalizeNetwork, sParameter, type NetworkData } from "@lib/channel";
import { seededRandom } from "@lib/signal";

type C = [number, number];
const div = (a: C, b: C): C => {
  const d = b[0] * b[0] + b[1] * b[1];
  return [(a[0] * b[0] + a[1] * b[1]) / d, (a[1] * b[0] - a[0] * b[1]) / d];
};
const gammaOf = (z: C, r: number): C => div([z[0] - r, z[1]], [z[0] + r, z[1]]);

/** A network from per-frequency complex matrices. */
const network = (refs: number[], mats: C[][][], freqs: number[]): NetworkData => {
  const n = refs.length;
  const s = new Float64Array(freqs.length * n * n * 2);
  mats.forEach((m, f) =>
    m.forEach((row, r) =>
      row.forEach(([re, im], c) => {
        s[2 * ((f * n + r) * n + c)] = re;
        s[2 * ((f * n + r) * n + c) + 1] = im;
      }),
    ),
  );
  return { ports: n, freqs_Hz: Float64Array.from(freqs), s, referenceOhms: Float64Array.from(refs) };
};
const at = (net: NetworkData, o: number, i: number, f: number): C => {
  const x = sParameter(net, o, i);
  return [x.re[f], x.im[f]];
};
const close = (a: C, b: C, tol: number) => {
  expect(Math.abs(a[0] - b[0])).toBeLessThan(tol);
  expect(Math.abs(a[1] - b[1])).toBeLessThan(tol);
};

describe("renormalizeNetwork — analytic cases", () => {
  // Γ = (Z − Z0)/(Z + Z0) [source: Pozar, Microwave Engineering, ch. 2, from memory].
  it("a known mismatch: loads Z = 30 + 20j Ω and 120 − 45j Ω stated in 75 Ω and 30 Ω become (Z − 50)/(Z + 50) in 50 Ω", () => {
    const z1: C = [30, 20];
    const z2: C = [120, -45];
    const net = network(
      [75, 30],
      [
        [
          [gammaOf(z1, 75), [0, 0]],
          [[0, 0], gammaOf(z2, 30)],
        ],
      ],
      [1e9],
    );
    const out = renormalizeNetwork(net);
    close(at(out, 1, 1, 0), gammaOf(z1, 50), 1e-12);
    close(at(out, 2, 2, 0), gammaOf(z2, 50), 1e-12);
    close(at(out, 2, 1, 0), [0, 0], 1e-15);
    expect(Array.from(out.referenceOhms)).toEqual([50, 50]);
  });

  // A line of impedance Zc and electrical length θ in a Z0 system, z = Zc/Z0:
  // S11 = j(z² − 1)·sinθ / D, S21 = 2z / D, D = 2z·cosθ + j(z² + 1)·sinθ
  // [computed from the line's ABCD matrix and the ABCD→S table of Pozar, Microwave Engineering, from memory].
  it("a matched 100 Ω line (file in 100 Ω: S11 = 0, S21 = e^(−jθ)) re-referenced to 50 Ω gives the closed form at θ = 0…π", () => {
    const thetas = [0, 0.3, Math.PI / 4, Math.PI / 2, 2, Math.PI];
    const e = (t: number): C => [Math.cos(t), -Math.sin(t)];
    const net = network(
      [100, 100],
      thetas.map((t) => [
        [[0, 0], e(t)],
        [e(t), [0, 0]],
      ]),
      thetas.map((_, i) => (i + 1) * 1e9),
    );
    const out = renormalizeNetwork(net, 50);
    const z = 2;
    thetas.forEach((t, f) => {
      const d: C = [2 * z * Math.cos(t), (z * z + 1) * Math.sin(t)];
      close(at(out, 1, 1, f), div([0, (z * z - 1) * Math.sin(t)], d), 1e-12);
      close(at(out, 2, 1, f), div([2 * z, 0], d), 1e-12);
      close(at(out, 1, 2, f), at(out, 2, 1, f), 1e-12);
    });
    // Quarter wave: |S11| = (z² − 1)/(z² + 1) = 0.6.
    expect(Math.hypot(...at(out, 1, 1, 3))).toBeCloseTo(0.6, 12);
  });

  // A direct connection of a 50 Ω port to a 100 Ω port: S11 = (100 − 50)/150 = 1/3, S22 = −1/3,
  // S21 = 2√(50·100)/150 = 2√2/3 [computed from Γ = (Z − Z0)/(Z + Z0) and the waves' definition].
  it("a junction stated in 50 Ω / 100 Ω (S11 = 1/3, S21 = 2√2/3, S22 = −1/3) is a perfect thru in 50 Ω / 50 Ω, and back", () => {
    const t = (2 * Math.SQRT2) / 3;
    const junction = network(
      [50, 100],
      [
        [
          [
            [1 / 3, 0],
            [t, 0],
          ],
          [
            [t, 0],
            [-1 / 3, 0],
          ],
        ],
      ],
      [1e9],
    );
    const thru = renormalizeNetwork(junction, 50);
    close(at(thru, 1, 1, 0), [0, 0], 1e-12);
    close(at(thru, 2, 2, 0), [0, 0], 1e-12);
    close(at(thru, 2, 1, 0), [1, 0], 1e-12);
    close(at(thru, 1, 2, 0), [1, 0], 1e-12);
    const again = renormalizeNetwork(thru, [50, 100]);
    for (let i = 0; i < junction.s.length; i++) expect(Math.abs(again.s[i] - junction.s[i])).toBeLessThan(1e-12);
  });
});

describe("renormalizeNetwork — identities and edges", () => {
  it("identities: r → 50 Ω → r returns the network, reciprocity is kept, and a network already in 50 Ω is returned as is (random 4-ports, seed 5)", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 1e6 }),
        fc.array(fc.double({ min: 20, max: 150, noNaN: true }), { minLength: 4, maxLength: 4 }),
        (seed, refs) => {
          const rnd = seededRandom(seed);
          // A random symmetric matrix scaled so its largest row sum is 0.95 (so ‖S‖₂ < 1: passive).
          const m: C[][] = Array.from({ length: 4 }, () => Array.from({ length: 4 }, (): C => [0, 0]));
          for (let r = 0; r < 4; r++)
            for (let c = r; c < 4; c++) {
              const v: C = [rnd.normal(), rnd.normal()];
              m[r][c] = v;
              m[c][r] = v;
            }
          const norm = Math.max(...m.map((row) => row.reduce((a, x) => a + Math.hypot(...x), 0)));
          const net = network(
            refs,
            [m.map((row) => row.map(([a, b]): C => [(0.95 * a) / norm, (0.95 * b) / norm]))],
            [1e9],
          );
          const there = renormalizeNetwork(net);
          const back = renormalizeNetwork(there, refs);
          for (let i = 0; i < net.s.length; i++) expect(Math.abs(back.s[i] - net.s[i])).toBeLessThan(1e-9);
          for (let r = 1; r <= 4; r++)
            for (let c = 1; c <= 4; c++) close(at(there, r, c, 0), at(there, c, r, 0), 1e-12);
          expect(renormalizeNetwork(there)).toBe(there);
        },
      ),
      { seed: 5, numRuns: 40 },
    );
  });

  it("edges: a bad target is refused by name", () => {
    const net = network(
      [50, 50],
      [
        [
          [
            [0, 0],
            [1, 0],
          ],
          [
            [1, 0],
            [0, 0],
          ],
        ],
      ],
      [1e9],
    );
    expect(() => renormalizeNetwork(net, 0)).toThrow(/referenceOhms/);
    expect(() => renormalizeNetwork(net, Number.NaN)).toThrow(/referenceOhms/);
    expect(() => renormalizeNetwork(net, [50])).toThrow(/2 impedances/);
  });
});
