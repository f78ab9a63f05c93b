// The budget form's conversions for the package, front-end and receive FFE sections: a budget with
// them survives the round trip through the form's text, a package left at "None" drops its detail
// fields, and empty detail fields take the schema's Annex 93A values.
import { describe, expect, it } from "vitest";
import { budgetSchema } from "@lib/contract/budget";
import { ANNEX_93A_PACKAGE } from "@lib/package";
import { budgetFromDraft, draftFromBudget } from "@/features/budgets/budgetForm";
import { budgetPresets } from "@/features/budgets/budgetPresets";
import { budgetSummary } from "@/features/budgets/budgets";

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
    const on = budgetSchema.parse(budgetFromDraft({ ...draft, "package.rx": "model", "package.rx.termination_Ohm": "45" }));
    expect(on.package?.tx).toBeUndefined();
    expect(on.package?.rx).toEqual({ ...ANNEX_93A_PACKAGE, termination_Ohm: 45 });
    expect(on.ffe).toBeUndefined();
    expect(on.frontEnd).toBeUndefined();
  });
});
