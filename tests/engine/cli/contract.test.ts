// Shared zod building blocks of the requests (lib/contract/common.ts) and the command registry.
import { describe, expect, it } from "vitest";
import { z } from "zod";
import {
  cursorWindowShape,
  checkMainInCursors,
  fieldError,
  finiteNumber,
  formatPath,
  freqsSchema,
  positiveInt,
  pulseJsonSchema,
  pulseSchema,
} from "@lib/contract/common";
import { commands } from "@lib/cli/commands";
import { libErrorPath } from "@lib/cli/libErrorPath";
import { toJsonValue } from "@lib/cli/toJsonValue";

describe("contract building blocks", () => {
  it("analytic: a valid pulse becomes a Pulse with a Float64Array; the index is checked against the values", () => {
    const p = pulseSchema.parse({ ui_s: 1e-10, samplesPerUi: 2, values_V: [0.1, 0.9, 0.2], mainIndex: 1, extra: true });
    expect(p.values_V).toBeInstanceOf(Float64Array);
    expect(Array.from(p.values_V)).toEqual([0.1, 0.9, 0.2]);
    const bad = pulseJsonSchema.safeParse({ ui_s: 1e-10, samplesPerUi: 2, values_V: [1], mainIndex: 1 });
    expect(bad.success).toBe(false);
    expect(bad.error?.issues[0].path).toEqual(["mainIndex"]);
  });

  it("identities: formatPath joins with dots; fieldError says 'required' only for missing input", () => {
    expect(formatPath(["source", "values", 3])).toBe("source.values.3");
    expect(formatPath([])).toBe("");
    const f = fieldError("expected x");
    expect(f({ input: undefined })).toBe("this field is required");
    expect(f({ input: "y" })).toBe("expected x");
    const s = z.object(cursorWindowShape).superRefine(checkMainInCursors);
    expect(s.safeParse({ cursors: [1, 2], main: 1, pre: 0, post: 0 }).success).toBe(true);
    expect(s.safeParse({ cursors: [1, 2], main: 2, pre: 0, post: 0 }).error?.issues[0].path).toEqual(["main"]);
  });

  it("edges: NaN, Infinity, fractions, empty and negative frequencies are refused", () => {
    expect(finiteNumber.safeParse(Number.NaN).success).toBe(false);
    expect(finiteNumber.safeParse(Number.POSITIVE_INFINITY).success).toBe(false);
    expect(positiveInt.safeParse(1.5).success).toBe(false);
    expect(positiveInt.safeParse(0).success).toBe(false);
    expect(freqsSchema.safeParse([]).success).toBe(false);
    expect(freqsSchema.safeParse([0, -1]).success).toBe(false);
    expect(freqsSchema.safeParse([0, 1e9]).success).toBe(true);
  });
});

describe("command line plumbing", () => {
  it("the registry lists each command once, with the names of shared/engine-cli.md", () => {
    const names = commands.map((c) => c.name);
    expect(new Set(names).size).toBe(names.length);
    for (const n of ["pulse", "fir-response", "ctle-response", "zf", "mmse", "lms", "prbs", "ber"])
      expect(names).toContain(n);
  });

  it("libErrorPath maps the parameter an engine message starts with to the request field", () => {
    const req = { cursors: [1], mu: 1, source: {} };
    expect(libErrorPath("mu = 5 makes it diverge", req, {}, "x")).toBe("mu");
    expect(libErrorPath("cursors.h[3] must be finite", req, { "cursors.h": "cursors" }, "x")).toBe("cursors.3");
    expect(libErrorPath("pairs.outN must be a port 1…4", req, { pairs: "source.pairs" }, "source")).toBe(
      "source.pairs.outN",
    );
    expect(libErrorPath("the record is too long", req, {}, "source")).toBe("source");
    expect(libErrorPath("", req, {}, "f")).toBe("f");
  });

  it("toJsonValue turns typed arrays into arrays and refuses non-finite numbers by field", () => {
    expect(toJsonValue({ a: Float64Array.of(1, 2), b: [Uint8Array.of(3)], c: undefined, d: "x" })).toEqual({
      a: [1, 2],
      b: [[3]],
      d: "x",
    });
    expect(() => toJsonValue({ a: { b: [1, Number.NaN] } })).toThrow(/a\.b\.1/);
    expect(() => toJsonValue(Number.POSITIVE_INFINITY)).toThrow(/\(root\)/);
    expect(() => toJsonValue({ f: () => 1 })).toThrow(/function/);
  });
});
