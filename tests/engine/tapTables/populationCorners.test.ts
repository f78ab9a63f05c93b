// Population defaults over channels at corners: each member searched and evaluated under its own
// budget (swing, noise, jitter, sensitivity), the minimax exact against brute force over the grid,
// the identities that tie a corner to the nominal budget, own optima handed in, and the edges.
import { describe, expect, it } from "vitest";
import { cornerBudget } from "@lib/corners";
import { enumerateTxFirs } from "@lib/equalizers/enumerateTxFirs";
import { evaluateSetting } from "@lib/optimize/evaluateSetting";
import { jointSearch } from "@lib/optimize/jointSearch";
import { prepareChannels } from "@lib/optimize/prepareChannels";
import { searchSpace } from "@lib/optimize/searchSpace";
import { scalePulse } from "@lib/pulse";
import { ownOptimum, populationDefault } from "@lib/tapTables";
import { stepwisePulse } from "../optimize/fixtures.ts";

const pulses = [
  stepwisePulse([0, 0.03, 1, 0.25, 0.1, 0.04, 0], 2),
  stepwisePulse([0, 0.1, 0.8, 0.5, 0.3, 0.16, 0.08, 0.03, 0], 2),
];
const budget = {
  txSwing_Vppd: 0.8,
  noiseRms_V: 0.003,
  limiterSensitivity_V: 0.01,
  jitter: { rjRms_UI: 0.01, djPp_UI: 0.04 },
  tx: { pre: 1, post: 1, step: 0.1 },
  ctle: { gDc_dB: [-6, 0, 6] as [number, number, number], fz_Hz: 2e9, fp1_Hz: 2e9, fp2_Hz: 1e10 },
  dfe: { taps: 1, limits_V: 0.15 },
  clocking: { scheme: "recovered" as const, policy: "max-height" as const },
};
const corners = [
  { name: "nominal" },
  { name: "slow", txSwingScale: 0.85, noiseScale: 1.3, jitterScale: 1.5, sensitivityScale: 1.4 },
];
// Members: every channel at every corner.
const members = pulses.flatMap((p) => corners.map((c) => ({ pulse: p, budget: cornerBudget(budget, c) })));

// Brute force with jitter over every member is the slow part: generous on a loaded machine.
const SLOW = 60_000;

describe("populationDefault with a budget per member (corners)", () => {
  it(
    "oracle: the worst member's headroom equals the brute-force minimax over the grid, each member under its own budget",
    () => {
      const r = populationDefault(
        members.map((m) => m.pulse),
        budget,
        { memberBudgets: members.map((m) => m.budget) },
      );
      const spaces = members.map((m) => searchSpace(m.pulse, m.budget));
      const prepared = members.map((m, i) => prepareChannels(m.pulse, spaces[i]));
      let best = Number.NEGATIVE_INFINITY;
      for (let k = 0; k < spaces[0].ctleSettings.length; k++) {
        for (const f of enumerateTxFirs(spaces[0].firSpec)) {
          best = Math.max(
            best,
            Math.min(...prepared.map((pc, i) => evaluateSetting(pc.channels[k], spaces[i], f, 1).limiterHeadroom_V)),
          );
        }
      }
      expect(r.worstHeadroom_V).toBeCloseTo(best, 12);
      expect(r.channels[r.worstChannel].defaultHeadroom_V).toBe(r.worstHeadroom_V);
      // The slow corner binds here: less swing, more noise, jitter and sensitivity.
      expect(corners[r.worstChannel % corners.length].name).toBe("slow");
    },
    SLOW,
  );

  it("identities: nominal budgets for every member change nothing; a swing corner is the pulse scaled by its factor; a sensitivity corner lowers headroom by exactly the added sensitivity", () => {
    const plain = populationDefault(pulses, budget);
    const same = populationDefault(pulses, budget, { memberBudgets: pulses.map(() => budget) });
    expect(same).toEqual(plain);

    const swing = populationDefault([pulses[1]], budget, {
      memberBudgets: [cornerBudget(budget, { name: "s", txSwingScale: 0.9 })],
    });
    const scaled = populationDefault([scalePulse(pulses[1], 0.9)], budget);
    expect(swing.worstHeadroom_V).toBeCloseTo(scaled.worstHeadroom_V, 12);
    expect(swing.setting.tx).toEqual(scaled.setting.tx);
    expect(swing.setting.ctle).toEqual(scaled.setting.ctle);
    swing.setting.dfe.taps.forEach((t, k) => expect(t).toBeCloseTo(scaled.setting.dfe.taps[k], 12));

    const space = searchSpace(pulses[0], budget);
    const hot = cornerBudget(budget, { name: "hot", sensitivityScale: 1.5 });
    const k = 0;
    const f = [...enumerateTxFirs(space.firSpec)][3];
    const nominal = evaluateSetting(prepareChannels(pulses[0], space).channels[k], space, f, 1).limiterHeadroom_V;
    const hotSpace = searchSpace(pulses[0], hot);
    const atHot = evaluateSetting(prepareChannels(pulses[0], hotSpace).channels[k], hotSpace, f, 1).limiterHeadroom_V;
    expect(nominal - atHot).toBeCloseTo(0.5 * budget.limiterSensitivity_V, 12);
  });

  it(
    "own optima handed in give the same result as computed ones",
    () => {
      const memberBudgets = members.map((m) => m.budget);
      const own = members.map((m) => ownOptimum(m.pulse, m.budget));
      const computed = populationDefault(
        members.map((m) => m.pulse),
        budget,
        { memberBudgets },
      );
      const handed = populationDefault(
        members.map((m) => m.pulse),
        budget,
        { memberBudgets, own },
      );
      expect(handed).toEqual(computed);
      computed.channels.forEach((c, i) => expect(c.ownHeadroom_V).toBe(own[i].limiterHeadroom_V));
    },
    SLOW,
  );

  it("edges: one budget per member, sharing the grids; own optima one per member", () => {
    expect(() => populationDefault(pulses, budget, { memberBudgets: [budget] })).toThrow(
      /memberBudgets must hold one budget per pulse \(2\)/,
    );
    const otherGrid = { ...budget, ctle: { ...budget.ctle, gDc_dB: [-9, 0, 3] as [number, number, number] } };
    expect(() => populationDefault(pulses, budget, { memberBudgets: [budget, otherGrid] })).toThrow(
      /memberBudgets\[1\]\.ctle differs/,
    );
    const otherDfe = { ...budget, dfe: { taps: 2 } };
    expect(() => populationDefault(pulses, budget, { memberBudgets: [otherDfe, budget] })).toThrow(
      /memberBudgets\[0\]\.dfe differs/,
    );
    expect(() => populationDefault(pulses, budget, { own: [] })).toThrow(/own must hold one optimum per pulse/);
    // The joint search itself refuses a member prepared under other grids.
    const space = searchSpace(pulses[0], budget);
    const other = prepareChannels(pulses[1], searchSpace(pulses[1], { ...budget, dfe: { taps: 1, limits_V: 0.2 } }));
    expect(() => jointSearch(pulses[0], space, { dfeCounts: [1] }, [prepareChannels(pulses[0], space), other])).toThrow(
      /prepared\[1\] was prepared under a budget whose dfe differs/,
    );
  });
});
