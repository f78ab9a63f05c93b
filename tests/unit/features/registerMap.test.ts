// The register map of a tap table: the default map follows the architecture and the budget (widths
// from the ranges and LSBs worked out here by hand), the app's field rules are stricter than the
// engine's, and a map that cannot encode the architecture is refused with the path at fault.
import { describe, expect, it } from "vitest";
import { codeRange } from "@lib/tapTables/registerMap";
import {
  defaultRegisterMap,
  formatFieldValue,
  formatLsb,
  registerMapProblem,
  registerMapSchema,
  requiredParameters,
  type RegisterField,
} from "@/features/tapTables/registerMap";
import type { Architecture } from "@/features/studies/architecture";
import { budget } from "../../support/budget";

const txCtleDfe2: Architecture = {
  key: "tx-ctle-dfe2",
  label: "TX FIR + CTLE + DFE 2",
  tx: { pre: 1, post: 1 },
  ctle: true,
  dfeTaps: 2,
  ffe: null,
};
const b = budget();

describe("default register map", () => {
  const map = defaultRegisterMap(txCtleDfe2, b);

  it("has one field per parameter, with the budget's steps and the smallest widths holding the ranges", () => {
    // tx step 0.05: pre −0.25…0 is codes −5…0 (3 magnitude bits + sign), main 0.5…1 is 10…20 (5 bits),
    // post −0.5…0 is −10…0 (4 + sign); CTLE −9…0 dB in 3 dB steps is −3…0 (2 + sign); the DFE limit
    // 100 mV needs the 1 mV LSB (0.5 mV would take 200 codes, over 127): −100…100 (7 + sign).
    expect(map.map((f) => [f.name, f.parameter, f.unit, f.lsb, f.min, f.max, f.bits, f.signed])).toEqual([
      ["tx_pre1", "tx[-1]", "fraction", 0.05, -0.25, 0, 4, true],
      ["tx_main", "tx[0]", "fraction", 0.05, 0.5, 1, 5, false],
      ["tx_post1", "tx[1]", "fraction", 0.05, -0.5, 0, 5, true],
      ["ctle_gdc", "ctle.gDc_dB", "dB", 3, -9, 0, 3, true],
      ["dfe_tap1", "dfe[1]", "V", 0.001, -0.1, 0.1, 8, true],
      ["dfe_tap2", "dfe[2]", "V", 0.001, -0.1, 0.1, 8, true],
    ]);
    expect(map.map((f) => codeRange(f))).toEqual([
      { lo: -5, hi: 0 },
      { lo: 10, hi: 20 },
      { lo: -10, hi: 0 },
      { lo: -3, hi: 0 },
      { lo: -100, hi: 100 },
      { lo: -100, hi: 100 },
    ]);
    expect(registerMapSchema.safeParse(map).success).toBe(true);
    expect(registerMapProblem(map, txCtleDfe2, b)).toBeNull();
  });

  it("follows the budget: its per-tap ranges, a second CTLE stage's grid, per-tap DFE limits", () => {
    const other = budget({
      tx: {
        pre: 1,
        post: 1,
        step: 0.025,
        ranges: [
          [-0.2, 0],
          [0.6, 1],
          [-0.4, 0],
        ],
      },
      ctle: { gDc2_dB: [-4, 0, 1], fLf_Hz: 0.7e9 },
      dfe: { taps: 2, limits_V: [0.2, 0.02] },
    });
    const m = defaultRegisterMap(txCtleDfe2, other);
    expect(m.find((f) => f.name === "tx_main")).toMatchObject({ lsb: 0.025, min: 0.6, max: 1 });
    expect(m.find((f) => f.name === "ctle_gdc2")).toMatchObject({
      parameter: "ctle.gDc2_dB",
      lsb: 1,
      min: -4,
      max: 0,
      bits: 4,
      signed: true,
    });
    expect(m.find((f) => f.name === "dfe_tap1")).toMatchObject({ lsb: 0.002, min: -0.2, max: 0.2 });
    expect(m.find((f) => f.name === "dfe_tap2")).toMatchObject({ lsb: 0.00025, min: -0.02, max: 0.02 });
  });

  it("has no transmit fields without a transmit FIR", () => {
    const ctleOnly: Architecture = { key: "ctle", label: "CTLE only", tx: null, ctle: true, dfeTaps: 0, ffe: null };
    expect(requiredParameters(ctleOnly, b)).toEqual(["ctle.gDc_dB"]);
  });
});

describe("register map checks", () => {
  const map = defaultRegisterMap(txCtleDfe2, b);

  it("names a missing field, a stray field and a field with no code in its range", () => {
    expect(registerMapProblem(map.slice(0, -1), txCtleDfe2, b)).toEqual({
      message: "The register map has no field for dfe[2] (the architecture “TX FIR + CTLE + DFE 2” needs one).",
      path: "registerMap",
    });
    const stray: RegisterField = { ...map[0], name: "ffe_pre1", parameter: "ffe[-1]" };
    expect(registerMapProblem([...map, stray], txCtleDfe2, b)).toMatchObject({ path: "registerMap.6.parameter" });
    const narrow = map.map((f) => (f.name === "tx_main" ? { ...f, bits: 3, signed: false } : f));
    expect(registerMapProblem(narrow, txCtleDfe2, b)).toMatchObject({
      path: "registerMap.1",
      message: expect.stringMatching(/widen the field/),
    });
  });

  it("the app's field rules: a C name in lowercase, at most 16 bits, signed below 0, unique names and parameters", () => {
    const issues = (fields: RegisterField[]) => {
      const r = registerMapSchema.safeParse(fields);
      return r.success ? [] : r.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`);
    };
    expect(issues([{ ...map[0], name: "Tx Pre" }])[0]).toMatch(/^0\.name: A field name is a C identifier/);
    expect(issues([{ ...map[0], bits: 17 }])[0]).toMatch(/^0\.bits: A field has at most 16 bits/);
    expect(issues([{ ...map[0], signed: false }])).toEqual([
      "0.signed: tx_pre1: the range goes below 0, so the field must be signed.",
    ]);
    expect(issues([map[0], { ...map[1], name: "tx_pre1" }])).toEqual([
      ": Two fields have the same name; names must be unique.",
    ]);
    expect(issues([map[0], { ...map[1], parameter: "tx[-1]" }])).toEqual([": Two fields hold the same parameter."]);
  });

  it("shows values and LSBs in each field's unit", () => {
    expect(formatFieldValue({ unit: "V" }, 0.0125)).toBe("12.50 mV");
    expect(formatFieldValue({ unit: "dB" }, -7.5)).toBe("-7.5 dB");
    expect(formatFieldValue({ unit: "fraction" }, 0.123456)).toBe("0.1235");
    expect(formatLsb({ unit: "fraction", lsb: 0.05 })).toBe("1/20");
    expect(formatLsb({ unit: "fraction", lsb: 0.03 })).toBe("0.03");
    expect(formatLsb({ unit: "V", lsb: 0.00025 })).toBe("0.25 mV");
    expect(formatLsb({ unit: "dB", lsb: 3 })).toBe("3 dB");
  });
});
