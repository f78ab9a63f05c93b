// The budget form's model: a budget written into the form's text (display units) and read back is
// the same budget, for every preset and for the fields the presets leave out; text that is not a
// number reaches the schema as text, so the error names the field; error paths find their field; the
// package, front-end and receive FFE sections survive the round trip, and a package at "None" drops
// its detail fields.
import { describe, expect, it } from "vitest";
import { budgetSchema } from "@lib/contract/budget";
import { budgetForm, budgetFromDraft, draftFromBudget, fieldForPath } from "@/features/budgets/budgetForm";
import { budgetPresets } from "@/features/budgets/budgetPresets";
import { budgetSummary } from "@/features/budgets/budgets";
import { ANNEX_93A_PACKAGE } from "@lib/package";
import { budget } from "../../support/budget";

describe("budget form round trip", () => {
  it.each(budgetPresets.map((p) => [p.key, p.budget] as const))(
    "preset %s comes back from its draft unchanged",
    (_key, preset) => {
      const back = budgetFromDraft(draftFromBudget(preset));
      expect(budgetSchema.parse(back)).toEqual(budgetSchema.parse(preset));
    },
  );

  it("a budget using every kind of field (ranges, a gain grid, per-tap limits, a tracking bandwidth) comes back unchanged", () => {
    const full = budget({
      tx: {
        pre: 1,
        post: 1,
        step: 0.05,
        ranges: [
          [-0.25, 0],
          [0.5, 1],
          [-0.4, 0],
        ],
      },
      ctle: { gDc2_dB: [-4, 0, 1], fLf_Hz: 0.7e9 },
      dfe: { taps: 3, limits_V: [0.1, 0.05, 0.05] },
      clocking: { scheme: "forwarded", bandwidth_Hz: 2.8e9, policy: "mueller-muller" },
      inputNoiseRms_V: 0.0004,
    });
    const back = budgetFromDraft(draftFromBudget(full));
    expect(budgetSchema.parse(back)).toEqual(budgetSchema.parse(full));
  });

  it("writes display units: mVppd, Gb/s, mV, GHz, BER as 1e-12, lists and grids in their own syntax", () => {
    const d = draftFromBudget(budget({ ctle: { gDc2_dB: [-4, 0, 1] }, dfe: { taps: 2, limits_V: [0.1, 0.05] } }));
    expect(d.txSwing_Vppd).toBe("800");
    expect(d.bitRate_bps).toBe("28");
    expect(d.noiseRms_V).toBe("1.5");
    expect(d.targetBer).toBe("1e-12");
    expect(d["ctle.fz_Hz"]).toBe("7");
    expect(d["ctle.gDc_dB.0"]).toBe("-9");
    expect(d["ctle.gDc2_dB"]).toBe("-4..0..1");
    expect(d["dfe.limits_V"]).toBe("100; 50");
  });

  it("every field of the form has a draft entry, empty when the budget leaves it out", () => {
    const d = draftFromBudget(budget());
    const paths = budgetForm.flatMap((g) => g.fields.map((f) => f.path));
    expect(Object.keys(d).sort()).toEqual([...paths].sort());
    expect(d["tx.ranges"]).toBe("");
    expect(d["ctle.gDc2_dB"]).toBe("");
  });

  it("reads a typographic minus, leaves optional blanks out and keeps non-numbers as text for the schema to name", () => {
    const d = { ...draftFromBudget(budget()), "ctle.gDc_dB.0": "−12", requiredHeadroom_V: "", noiseRms_V: "lots" };
    const out = budgetFromDraft(d);
    expect((out.ctle as { gDc_dB: number[] }).gDc_dB[0]).toBe(-12);
    expect("requiredHeadroom_V" in out).toBe(false);
    const parsed = budgetSchema.safeParse(out);
    expect(parsed.success).toBe(false);
    expect(parsed.error!.issues.map((i) => i.path.join("."))).toEqual(["noiseRms_V"]);
  });

  it("finds the field of an error path: itself, the field it lies inside, or the first field under it", () => {
    expect(fieldForPath("modulation")).toBe("modulation");
    expect(fieldForPath("tx.ranges.1.0")).toBe("tx.ranges");
    expect(fieldForPath("ctle.gDc_dB")).toBe("ctle.gDc_dB.0");
    expect(fieldForPath("jitter")).toBe("jitter.rjRms_UI");
    expect(fieldForPath("nowhere")).toBeUndefined();
  });
});

const base = budgetPresets[0].budget;

describe("budget form: packages, receiver bandwidth and receive FFE", () => {
  it("round trip: a budget with both packages, a bandwidth filter and an FFE comes back as it went in", () => {
    const budget = budgetSchema.parse({
      ...base,
      package: { tx: { dieCapacitance_F: 2e-13, traceLength_m: 0.015 }, rx: {} },
      frontEnd: { rxBandwidth_Hz: 21e9 },
      ffe: { pre: 1, post: 3 },
    });
    const draft = draftFromBudget(budget);
    expect(draft["package.tx"]).toBe("model");
    expect(draft["package.tx.dieCapacitance_F"]).toBe("200");
    expect(draft["package.tx.traceLength_m"]).toBe("15");
    expect(draft["frontEnd.rxBandwidth_Hz"]).toBe("21");
    expect(budgetSchema.parse(budgetFromDraft(draft))).toEqual(budget);
    expect(budgetSummary(budget)).toContain("FFE 1+1+3");
    expect(budgetSummary(budget)).toContain("packages");
  });

  it("a package at None leaves it out with its detail fields; empty detail fields take the Annex 93A values", () => {
    const draft = draftFromBudget(budgetSchema.parse(base));
    expect(draft["package.tx"]).toBe("");
    const none = budgetFromDraft({ ...draft, "package.tx.dieCapacitance_F": "300" });
    expect(none.package).toBeUndefined();
    const on = budgetSchema.parse(
      budgetFromDraft({ ...draft, "package.rx": "model", "package.rx.termination_Ohm": "45" }),
    );
    expect(on.package?.tx).toBeUndefined();
    expect(on.package?.rx).toEqual({ ...ANNEX_93A_PACKAGE, termination_Ohm: 45 });
    expect(on.ffe).toBeUndefined();
    expect(on.frontEnd).toBeUndefined();
  });
});
