// BER maps and their contour lines: agreement with the eye's own BER, contour positions, edges.
import { describe, expect, it } from "vitest";
import { qFromBer } from "@lib/analysis/ber";
import { berContours } from "@lib/analysis/berContours";
import { berMap } from "@lib/analysis/berMap";
import { log10Ber } from "@lib/analysis/bathtub";
import { statisticalEye } from "@lib/analysis/statisticalEye";
import { cursorPulse } from "./helpers.ts";

const grid = (a: number, b: number, n: number) =>
  Float64Array.from({ length: n }, (_, i) => a + ((b - a) * i) / (n - 1));

describe("berMap", () => {
  it("oracle: every cell equals log10 of eye.ber at that phase and threshold (jitter, fractional phases)", () => {
    const eye = statisticalEye(cursorPulse([0, 0.05, 0.4, 0.12, -0.03, 0], 2, 8), {
      modulation: "pam4",
      noiseRms_V: 0.008,
      jitter: { rjRms_UI: 0.02, djPp_UI: 0.1 },
    });
    const phases = grid(-8, 8, 13);
    const volts = grid(-0.6, 0.6, 11);
    const map = berMap(eye, phases, volts);
    for (let r = 0; r < volts.length; r++) {
      for (let c = 0; c < phases.length; c++) {
        expect(map.values[r * phases.length + c]).toBeCloseTo(log10Ber(eye.ber(phases[c], volts[r])), 9);
      }
    }
  });

  it("edges: a non-finite axis value throws", () => {
    const eye = statisticalEye(cursorPulse([0, 0.4, 0], 1), { modulation: "nrz", noiseRms_V: 0.01 });
    expect(() => berMap(eye, Float64Array.of(0, Number.NaN), Float64Array.of(0, 1))).toThrow(/phases\[1\]/);
    expect(() => berMap(eye, Float64Array.of(0, 1), Float64Array.of(Number.POSITIVE_INFINITY, 1))).toThrow(
      /voltage_V\[0\]/,
    );
  });
});

describe("berContours", () => {
  it("analytic: the 1e-12 contour of a clean eye crosses the centre column at ±(A − Q(2·BER)·σ), as the eye height's edges [computed]", () => {
    const A = 0.4;
    const sigma = 0.01;
    const eye = statisticalEye(cursorPulse([0, A, 0], 1, 16), { modulation: "nrz", noiseRms_V: sigma });
    const phases = grid(-8, 8, 17);
    const volts = grid(0.6, -0.6, 241); // descending rows, like a picture
    const map = berMap(eye, phases, volts);
    const [c12] = berContours(map, [-12], 1 / 16);
    expect(c12.log10Ber).toBe(-12);
    const edge = A - qFromBer(2e-12) * sigma;
    // Points of the contour on the centre column (phase 0 UI).
    const onCentre = c12.paths
      .flat()
      .filter(([t]) => Math.abs(t) < 1e-9)
      .map(([, v]) => v);
    expect(onCentre.length).toBeGreaterThanOrEqual(2);
    const inner = onCentre.filter((v) => Math.abs(v) < A).sort((a, b) => a - b);
    expect(Math.abs(inner[inner.length - 1] - edge)).toBeLessThan(0.005); // one row of the grid
    expect(Math.abs(inner[0] + edge)).toBeLessThan(0.005);
  });

  it("identities: every path is closed and stays inside the map's extent; lower BER contours enclose less", () => {
    const eye = statisticalEye(cursorPulse([0, 0.05, 0.4, 0.1, 0], 2, 16), { modulation: "nrz", noiseRms_V: 0.01 });
    const map = berMap(eye, grid(-16, 16, 33), grid(0.6, -0.6, 61));
    const cs = berContours(map, [-3, -9]);
    for (const c of cs) {
      for (const path of c.paths) {
        expect(path[0]).toEqual(path[path.length - 1]);
        for (const [t, v] of path) {
          expect(t).toBeGreaterThanOrEqual(-16);
          expect(t).toBeLessThanOrEqual(16);
          expect(Math.abs(v)).toBeLessThanOrEqual(0.6 + 1e-12);
        }
      }
    }
    const area = (c: (typeof cs)[0]) =>
      c.paths.reduce(
        (s, p) =>
          s + Math.abs(p.reduce((a, [x, y], i) => (i === 0 ? a : a + (p[i - 1][0] * y - x * p[i - 1][1])), 0)) / 2,
        0,
      );
    expect(area(cs[1])).toBeLessThan(area(cs[0]));
  });

  it("edges: tiny maps and non-finite levels throw", () => {
    const eye = statisticalEye(cursorPulse([0, 0.4, 0], 1), { modulation: "nrz", noiseRms_V: 0.01 });
    const one = berMap(eye, Float64Array.of(0), Float64Array.of(0, 1));
    expect(() => berContours(one, [-12])).toThrow(/at least 2 × 2/);
    const map = berMap(eye, Float64Array.of(0, 1), Float64Array.of(0, 1));
    expect(() => berContours(map, [Number.NaN])).toThrow(/levels/);
  });
});
