// Numbers in engine messages: three significant digits, an SI prefix, the unit.
import { describe, expect, it } from "vitest";
import { formatQuantity } from "@lib/contract";

describe("formatQuantity", () => {
  it("analytic: rates, times and voltages people read at a glance", () => {
    expect(formatQuantity(53.125e9, "b/s")).toBe("53.1 Gb/s");
    expect(formatQuantity(28e9, "b/s")).toBe("28.0 Gb/s");
    expect(formatQuantity(1 / 28e9, "s")).toBe("35.7 ps");
    expect(formatQuantity(0.0015, "V")).toBe("1.50 mV");
    expect(formatQuantity(-0.25, "V")).toBe("-250 mV");
  });
  it("edges: zero, the prefix boundary after rounding, values beyond the table, non-finite", () => {
    expect(formatQuantity(0, "V")).toBe("0 V");
    expect(formatQuantity(999.9e6, "Hz")).toBe("1.00 GHz");
    expect(formatQuantity(5e15, "Hz")).toBe("5.00e+3 THz");
    expect(formatQuantity(Number.NaN, "s")).toBe("NaN s");
  });
});
