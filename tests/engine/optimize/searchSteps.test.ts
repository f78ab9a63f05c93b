// The joint search's steps on their own: the FIR grid's one main-tap rule against the enumeration,
// the result bookkeeping (top list, thresholds, feasibility), and re-entrancy (no shared scratch).
import { describe, expect, it } from "vitest";
import { enumerateTxFirs } from "@lib/equalizers/enumerateTxFirs";
import { jointSearch } from "@lib/optimize/jointSearch";
import { prepareChannels } from "@lib/optimize/prepareChannels";
import { firGrid, mainTapFor, settingAt } from "@lib/optimize/search/firGrid";
import { type EyeFigures, SearchResults } from "@lib/optimize/search/searchResults";
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

describe("firGrid — identities", () => {
  it.each([
    {
      pre: 1,
      post: 1,
      step: 0.05,
      ranges: [
        [-0.25, 0],
        [0.5, 1],
        [-0.35, 0.1],
      ] as [number, number][],
    },
    { pre: 1, post: 2, step: 0.04 },
    {
      pre: 0,
      post: 1,
      step: 0.1,
      ranges: [
        [0.5, 0.8],
        [-0.6, 0],
      ] as [number, number][],
    },
    { pre: 2, post: 1, step: 1 / 24 },
  ])("every grid position through the one main-tap rule gives exactly enumerateTxFirs' settings (%o)", (spec) => {
    const grid = firGrid(spec);
    const seen: string[] = [];
    const positions = new Int32Array(grid.sides.length);
    const taps = new Float64Array(grid.tapCount);
    const walk = (s: number): void => {
      if (s === grid.sides.length) {
        if (settingAt(grid, positions, taps)) seen.push(Array.from(taps).join(","));
        return;
      }
      for (let i = 0; i < grid.sideSteps[s].length; i++) {
        positions[s] = i;
        walk(s + 1);
      }
    };
    walk(0);
    const expected = [...enumerateTxFirs(spec)].map((t) => Array.from(t).join(","));
    expect(seen.sort()).toEqual(expected.sort());
  });

  it("edges: the main tap is the largest grid value the swing and its range allow, or none", () => {
    const grid = firGrid({
      pre: 1,
      post: 1,
      step: 0.05,
      ranges: [
        [-0.5, 0],
        [0.6, 0.9],
        [-0.5, 0],
      ],
    });
    expect(mainTapFor(grid, 0)).toBeCloseTo(0.9, 12); // capped by its range
    expect(mainTapFor(grid, 3)).toBeCloseTo(0.85, 12); // 1 − 3·0.05
    expect(mainTapFor(grid, 8)).toBeCloseTo(0.6, 12); // exactly its minimum
    expect(mainTapFor(grid, 9)).toBeNull(); // 0.55 < 0.6
  });
});

/** The figures of an eye with a given headroom (what the bookkeeping keeps). */
function eye(headroom_V: number): EyeFigures {
  return {
    phase: 0,
    dfeTaps: new Float64Array(0),
    dfeClipped: [],
    eyeHeight_V: headroom_V + 0.01,
    limiterHeadroom_V: headroom_V,
  };
}

describe("SearchResults — bookkeeping", () => {
  const ctle = { gDc_dB: 0, gDc2_dB: 0 };
  const taps = Float64Array.of(0, 1, 0);

  it("keeps the top list best first, its k-th best as the first objective's threshold, the best for the others", () => {
    const r = new SearchResults([2, 0], 3, 3, undefined);
    expect(r.threshold(0)).toBe(Number.NEGATIVE_INFINITY);
    for (const [ci, v] of [
      [0, 0.01],
      [1, 0.05],
      [2, 0.03],
      [0, 0.02],
      [1, 0.04],
    ] as const)
      r.record(ci, ctle, 0, taps, eye(v), 0);
    expect(r.top.map((c) => c.limiterHeadroom_V)).toEqual([0.05, 0.04, 0.03]);
    expect(r.kthBest()).toBe(0.03);
    expect(r.canEnter(0, 0.03)).toBe(false);
    expect(r.canEnter(0, 0.031)).toBe(true);
    r.record(2, ctle, 1, taps, eye(0.02), 0);
    expect(r.threshold(1)).toBe(0.02);
    const out = r.result();
    expect(out.best.map((c) => c?.limiterHeadroom_V)).toEqual([0.05, 0.02]);
    expect(out.perCtle[0].map((o) => o.best?.limiterHeadroom_V)).toEqual([0.02, 0.05, 0.03]);
  });

  it("a pruned bound above a CTLE setting's best makes that setting inexact, with the bound as its upper bound", () => {
    const r = new SearchResults([0], 2, 1, undefined);
    r.record(0, ctle, 0, taps, eye(0.02), 0);
    r.prune(0, 0, 0.015);
    r.prune(1, 0, 0.01);
    r.prune(0, 0, 0.025);
    const [a, b] = r.result().perCtle[0];
    expect([a.exact, a.upperBound_V]).toEqual([false, 0.025]);
    expect([b.best, b.exact, b.upperBound_V]).toEqual([null, false, 0.01]);
  });

  it("feasibility: the target is every threshold, reaching it stops the search, and a best below it is dropped", () => {
    const r = new SearchResults([1], 1, 1, 0.02);
    expect(r.canEnter(0, 0.02)).toBe(true);
    expect(r.stopAt(0)).toBe(0.02 - Number.EPSILON);
    r.record(0, ctle, 0, taps, eye(0.019), 0);
    expect(r.targetReached).toBe(false);
    expect(r.result().best[0]).toBeNull();
    r.record(0, ctle, 0, taps, eye(0.021), 0);
    expect(r.targetReached).toBe(true);
    expect(r.result().best[0]?.limiterHeadroom_V).toBe(0.021);
  });
});

describe("jointSearch — re-entrancy", () => {
  it("a search run inside another's progress callback leaves both answers (and work) exactly as when run alone", () => {
    const space = searchSpace(channel, budget);
    const prepared = prepareChannels(channel, space);
    const options = { dfeCounts: [2, 0], topCount: 3 };
    const alone = jointSearch(channel, space, options, prepared);
    const inner: ReturnType<typeof jointSearch>[] = [];
    const outer = jointSearch(
      channel,
      space,
      { ...options, onProgress: () => void inner.push(jointSearch(channel, space, options, prepared)) },
      prepared,
    );
    const figures = (r: ReturnType<typeof jointSearch>) => ({
      best: r.best.map((c) => [c?.limiterHeadroom_V, c && Array.from(c.taps), c?.ctleIndex]),
      top: r.top.map((c) => c.limiterHeadroom_V),
      perCtle: r.perCtle.map((per) => per.map((o) => [o.upperBound_V, o.exact])),
      stats: r.stats,
    });
    expect(figures(outer)).toEqual(figures(alone));
    expect(inner.length).toBe(space.ctleSettings.length);
    for (const r of inner) expect(figures(r)).toEqual(figures(alone));
  });
});
