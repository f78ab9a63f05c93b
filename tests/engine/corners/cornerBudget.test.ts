// A budget at a corner: each factor scales its own fields and nothing else.
import { describe, expect, it } from "vitest";
import { cornerSchema, type BudgetInput } from "@lib/contract";
import { cornerBudget } from "@lib/corners";

const nominal: BudgetInput = {
  modulation: "nrz",
  txSwing_Vppd: 0.8,
  noiseRms_V: 0.002,
  inputNoiseRms_V: 0.001,
  limiterSensitivity_V: 0.015,
  requiredHeadroom_V: 0.005,
  jitter: { rjRms_UI: 0.01, djPp_UI: 0.05 },
  tx: { pre: 1, post: 1, step: 0.05 },
  ctle: { gDc_dB: [-12, 0, 1], fz_Hz: 7e9, fp1_Hz: 7e9, fp2_Hz: 28e9 },
  dfe: { taps: 2 },
};

describe("cornerBudget", () => {
  it("analytic: swing, both noises, RJ and DJ, and sensitivity are multiplied by their factors", () => {
    const b = cornerBudget(nominal, {
      name: "hot, slow",
      txSwingScale: 0.9,
      noiseScale: 1.2,
      jitterScale: 1.5,
      sensitivityScale: 2,
    });
    expect(b.txSwing_Vppd).toBeCloseTo(0.72, 12);
    expect(b.noiseRms_V).toBeCloseTo(0.0024, 12);
    expect(b.inputNoiseRms_V).toBeCloseTo(0.0012, 12);
    expect(b.jitter?.rjRms_UI).toBeCloseTo(0.015, 12);
    expect(b.jitter?.djPp_UI).toBeCloseTo(0.075, 12);
    expect(b.limiterSensitivity_V).toBeCloseTo(0.03, 12);
  });

  it("identities: a corner with no factors (or loss only) is the nominal budget; grids and targets never move", () => {
    const base = cornerBudget(nominal, { name: "nominal" });
    expect(cornerBudget(nominal, { name: "lossy", lossScale: 1.3 })).toEqual(base);
    const moved = cornerBudget(nominal, {
      name: "all",
      txSwingScale: 1.1,
      noiseScale: 0,
      jitterScale: 0,
      sensitivityScale: 0.5,
    });
    expect(moved.ctle).toEqual(base.ctle);
    expect(moved.tx).toEqual(base.tx);
    expect(moved.dfe).toEqual(base.dfe);
    expect(moved.requiredHeadroom_V).toBe(base.requiredHeadroom_V);
    expect(moved.targetBer).toBe(base.targetBer);
    // A budget without jitter stays without jitter.
    expect(cornerBudget({ ...nominal, jitter: undefined }, { name: "j", jitterScale: 2 }).jitter).toBeUndefined();
  });

  it("edges: a factor that takes a field out of the budget's range names the corner and the field", () => {
    expect(() => cornerBudget(nominal, { name: "wild", jitterScale: 4, txSwingScale: 1 })).not.toThrow();
    expect(() => cornerBudget({ ...nominal, txSwing_Vppd: 4 }, { name: "loud", txSwingScale: 3 })).toThrow(
      /corner "loud": budget.txSwing_Vppd/,
    );
    expect(() => cornerBudget({ ...nominal, jitter: { rjRms_UI: 0.2 } }, { name: "shaky", jitterScale: 3 })).toThrow(
      /corner "shaky": budget.jitter.rjRms_UI/,
    );
  });

  it("edges: the corner schema refuses factors ≤ 0 where they make no sense, above 4, and nameless corners", () => {
    expect(cornerSchema.safeParse({ name: "ok", lossScale: 1.1, noiseScale: 0 }).success).toBe(true);
    const bad = (c: unknown) => cornerSchema.safeParse(c).error?.issues[0];
    expect(bad({ name: "x", lossScale: 0 })?.path).toEqual(["lossScale"]);
    expect(bad({ name: "x", txSwingScale: -1 })?.path).toEqual(["txSwingScale"]);
    expect(bad({ name: "x", jitterScale: 5 })?.message).toMatch(/at most 4/);
    expect(bad({ name: "  " })?.message).toMatch(/needs a name/);
  });
});
