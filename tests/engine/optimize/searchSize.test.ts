// The search-size estimate against the grids the search really walks (the FIR grid's side-tap
// positions, the search space's CTLE settings), by hand for a small budget, and its refusal message.
import { describe, expect, it } from "vitest";
import { firGrid } from "@lib/optimize/search/firGrid";
import { MAX_SEARCH_SIZE, searchSize, searchSizeProblem } from "@lib/optimize/searchSize";
import { searchSpace } from "@lib/optimize/searchSpace";
import { cursorPulse } from "../analysis/helpers.ts";

const channel = cursorPulse([0, 0.04, 0.12, 0.55, 0.3, 0.16, 0.09, 0.05, 0.03, 0.02, 0.01, 0], 3, 8, 1e-10);
const budget = {
  modulation: "nrz" as const,
  txSwing_Vppd: 0.8,
  noiseRms_V: 0.003,
  limiterSensitivity_V: 0.01,
  targetBer: 1e-10,
  jitter: { rjRms_UI: 0.02, djPp_UI: 0.1 },
  tx: {
    pre: 1,
    post: 1,
    step: 0.05,
    ranges: [
      [-0.25, 0],
      [0.5, 1],
      [-0.35, 0.1],
    ] as [number, number][],
  },
  ctle: { gDc_dB: [-6, 0, 3] as [number, number, number], fz_Hz: 2.5e9, fp1_Hz: 2.5e9, fp2_Hz: 1e10 },
  dfe: { taps: 2, limits_V: [0.08, 0.03] },
};

describe("searchSize — analytic", () => {
  it("counts a small budget by hand: 3 CTLE × (6 × 10) FIR × 8 phases", () => {
    // gDc_dB −6…0 in 3 dB steps: 3 settings; pre-tap −0.25…0 at 0.05: 6 positions; post-tap −0.35…0.1: 10.
    const s = searchSize(budget, { samplesPerUi: 8 });
    expect(s).toEqual({ ctleSettings: 3, firSettings: 60, phases: 8, aggressors: 0, members: 1, total: 1440 });
  });

  it("multiplies by (1 + aggressors) and by the channels searched together", () => {
    expect(searchSize(budget, { samplesPerUi: 8, aggressors: 2, members: 5 }).total).toBe(1440 * 3 * 5);
  });
});

describe("searchSize — oracle: the grids the search walks", () => {
  it.each([
    budget,
    { ...budget, tx: { pre: 1, post: 2, step: 0.04 } },
    {
      ...budget,
      tx: { pre: 2, post: 1, step: 1 / 24 },
      ctle: { ...budget.ctle, gDc_dB: [-12, 0, 1] as [number, number, number] },
    },
    { ...budget, ctle: { ...budget.ctle, fLf_Hz: 1e8, gDc2_dB: [-6, 0, 2] as [number, number, number] } },
  ])("FIR settings = product of the side taps' grid positions; CTLE settings = the search space's (%#)", (b) => {
    const s = searchSize(b, { samplesPerUi: channel.samplesPerUi });
    const grid = firGrid(b.tx);
    expect(s.firSettings).toBe(grid.sideSteps.reduce((n, g) => n * g.length, 1));
    expect(s.ctleSettings).toBe(searchSpace(channel, b).ctleSettings.length);
    expect(s.phases).toBe(channel.samplesPerUi);
  });
});

describe("searchSizeProblem — identities and edges", () => {
  it("is null at or under the limit and a sentence naming every factor above it", () => {
    const s = searchSize(budget, { samplesPerUi: 8, members: 3 });
    expect(searchSizeProblem(budget, s, s.total)).toBeNull();
    expect(searchSizeProblem(budget, s)).toBeNull();
    const msg = searchSizeProblem(budget, s, s.total - 1);
    expect(msg).toBe(
      "The search is too large: 3 CTLE settings × 60 transmit FIR settings (1 pre, 1 post taps at step 0.05) × 8 sampling phases × 3 channels together = 4 320, above the limit of 4 319. " +
        "Coarsen it: a transmit FIR step of 0.0625 or more, or fewer transmit FIR taps or narrower tap ranges, or a coarser CTLE grid (a larger gDc_dB step), or fewer channels per class.",
    );
  });

  it("suggests a step that really fits, and none when no step does", () => {
    const wide = { ...budget, tx: { pre: 2, post: 4, step: 0.01 } };
    const s = searchSize(wide, { samplesPerUi: 32 });
    expect(s.total).toBeGreaterThan(MAX_SEARCH_SIZE);
    const step = Number(/a transmit FIR step of ([\d.]+) or more/.exec(searchSizeProblem(wide, s)!)![1]);
    expect(searchSize({ ...wide, tx: { ...wide.tx, step } }, { samplesPerUi: 32 }).total).toBeLessThanOrEqual(
      MAX_SEARCH_SIZE,
    );
    const coarser = [0.0125, 0.02, 0.025, 0.04].filter((x) => x < step);
    for (const x of coarser)
      expect(searchSize({ ...wide, tx: { ...wide.tx, step: x } }, { samplesPerUi: 32 }).total).toBeGreaterThan(
        MAX_SEARCH_SIZE,
      );
    expect(searchSizeProblem(budget, searchSize(budget, { samplesPerUi: 8 }), 10)).not.toMatch(/transmit FIR step of/);
  });

  it("refuses counts that are not whole and positive", () => {
    expect(() => searchSize(budget, { samplesPerUi: 0 })).toThrow(/samplesPerUi must be an integer ≥ 1/);
    expect(() => searchSize(budget, { samplesPerUi: 8, aggressors: -1 })).toThrow(/aggressors must be an integer ≥ 0/);
    expect(() => searchSize(budget, { samplesPerUi: 8, members: 1.5 })).toThrow(/members must be an integer ≥ 1/);
  });
});
