// The density eye with noise and jitter: Gaussian row masses against a Simpson-integrated normal CDF,
// dual-Dirac columns, conservation identities and edges.
import { describe, expect, it } from "vitest";
import { densityEye, type DensityEye } from "@lib/analysis/densityEye";
import { noisyDensityEye } from "@lib/analysis/noisyDensityEye";
import { symbolStream } from "@lib/analysis/symbolStream";
import { normalCdfOracle, rectPulse } from "./helpers.ts";

const sum = (a: Float64Array) => a.reduce((s, x) => s + x, 0);

/** An image with one hit count `n` at (row, column), on 1 mV rows from +50 mV, 64 columns. */
function pointImage(row: number, col: number, n: number): DensityEye {
  const W = 64;
  const H = 100;
  const counts = new Float64Array(W * H);
  counts[row * W + col] = n;
  return {
    width: W,
    height: H,
    counts,
    time_UI: Float64Array.from({ length: W }, (_, c) => -1 + ((c + 0.5) * 2) / W),
    voltage_V: Float64Array.from({ length: H }, (_, r) => 0.05 - (r + 0.5) * 1e-3),
    symbols: n,
  };
}

describe("noisyDensityEye — analytic", () => {
  it("noise: a point's hits spread over the rows as the Gaussian's mass per row (Simpson-integrated normal CDF, helpers.ts)", () => {
    const img = noisyDensityEye(pointImage(50, 10, 1000), 0.0025);
    for (const d of [-6, -3, -1, 0, 1, 2, 5]) {
      // Row 50 + d is d mV lower; its cell spans [d − ½, d + ½] mV around the point.
      const want = 1000 * (normalCdfOracle((d + 0.5) / 2.5) - normalCdfOracle((d - 0.5) / 2.5));
      expect(img.counts[(50 + d) * 64 + 10]).toBeCloseTo(want, 6);
    }
    expect(img.counts[50 * 64 + 11]).toBe(0); // noise moves voltage only
  });

  it("jitter: DJ alone splits a column's hits between ±DJ/2 (linearly across cells), wrapping at the edges; RJ spreads them as a Gaussian", () => {
    // Columns are 2/64 UI wide: DJ 0.125 UI puts ½ at ±2 columns exactly.
    const dj = noisyDensityEye(pointImage(20, 0, 64), 0, { rjRms_UI: 0, djPp_UI: 0.125 });
    expect(dj.counts[20 * 64 + 2]).toBeCloseTo(32, 12);
    expect(dj.counts[20 * 64 + 62]).toBeCloseTo(32, 12); // column −2 wraps to 62
    const rj = noisyDensityEye(pointImage(20, 30, 1), 0, { rjRms_UI: 1 / 32, djPp_UI: 0 });
    const want = normalCdfOracle(0.5) - normalCdfOracle(-0.5); // cell ±1/64 UI, σ = 1/32 UI
    expect(rj.counts[20 * 64 + 30]).toBeCloseTo(want, 8);
  });
});

describe("noisyDensityEye — identities and edges", () => {
  it("keeps every hit when the image has room; nothing changes without noise or jitter", () => {
    const pulse = rectPulse(0.1, 16);
    const symbols = symbolStream("nrz", { kind: "prbs", order: 7 });
    const base = densityEye(pulse, symbols, { voltageRange_V: [-0.2, 0.2] });
    expect(noisyDensityEye(base, 0).counts).toEqual(base.counts);
    const noisy = noisyDensityEye(base, 0.01, { rjRms_UI: 0.02, djPp_UI: 0.1 });
    expect(Math.abs(sum(noisy.counts) / sum(base.counts) - 1)).toBeLessThan(1e-9);
    expect(noisy.time_UI).toEqual(base.time_UI);
    expect(() => noisyDensityEye(base, -1)).toThrow(RangeError);
  });
});
