// Register fields: codes ↔ values round trips and ranges (fast-check), quantization of settings.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { quantizeSetting } from "@lib/tapTables/quantizeSetting";
import { codeBits, codeRange, decodeField, encodeField, type RegisterField } from "@lib/tapTables/registerMap";

const field = (over: Partial<RegisterField> = {}): RegisterField => ({
  name: "tx_post1",
  parameter: "tx[1]",
  bits: 6,
  signed: true,
  lsb: 0.02,
  unit: "fraction",
  min: -0.5,
  max: 0,
  ...over,
});

const arbField = fc
  .record({
    bits: fc.integer({ min: 1, max: 12 }),
    signed: fc.boolean(),
    lsb: fc.constantFrom(0.01, 0.02, 0.25, 0.5, 1, 0.003),
    a: fc.integer({ min: -3000, max: 3000 }),
    b: fc.integer({ min: -3000, max: 3000 }),
  })
  .map(({ bits, signed, lsb, a, b }) => {
    const lo = signed ? Math.min(a, b) : Math.abs(Math.min(a, b));
    const hi = Math.max(lo, signed ? Math.max(a, b) : Math.abs(Math.max(a, b)));
    return field({ bits, signed, lsb, min: (lo * lsb) / 3, max: (hi * lsb) / 3 + lsb });
  });

describe("registerMap", () => {
  it("property: codes → values → codes is the identity on every code of the field", () => {
    fc.assert(
      fc.property(arbField, (f) => {
        let r: { lo: number; hi: number };
        try {
          r = codeRange(f);
        } catch {
          return true; // no code in range: refused, checked elsewhere
        }
        for (let c = r.lo; c <= r.hi; c += Math.max(1, Math.floor((r.hi - r.lo) / 50))) {
          if (encodeField(f, decodeField(f, c)) !== c) return false;
        }
        return true;
      }),
      { seed: 3, numRuns: 300 },
    );
  });

  it("property: encoding respects the range and the width; the value moves by at most half an LSB", () => {
    fc.assert(
      fc.property(arbField, fc.double({ min: 0, max: 1, noNaN: true }), (f, u) => {
        let r: { lo: number; hi: number };
        try {
          r = codeRange(f);
        } catch {
          return true;
        }
        const v = r.lo * f.lsb + u * (r.hi - r.lo) * f.lsb;
        const c = encodeField(f, v);
        const width = f.signed ? c >= -(2 ** (f.bits - 1)) && c < 2 ** (f.bits - 1) : c >= 0 && c < 2 ** f.bits;
        return c >= r.lo && c <= r.hi && width && Math.abs(decodeField(f, c) - v) <= f.lsb / 2 + 1e-12;
      }),
      { seed: 5, numRuns: 300 },
    );
  });

  it("analytic: a 6-bit signed tap at 0.02 holds −0.5 … 0 as codes −25 … 0; two's complement bits", () => {
    const f = field();
    expect(codeRange(f)).toEqual({ lo: -25, hi: 0 });
    expect(encodeField(f, -0.12)).toBe(-6);
    expect(decodeField(f, -6)).toBeCloseTo(-0.12, 15);
    expect(codeBits(f, -6)).toBe(58); // 64 − 6
    expect(codeBits(field({ signed: false, min: 0, max: 1, parameter: "tx[0]" }), 50)).toBe(50);
  });

  it("edges: out-of-range values, foreign codes, empty ranges and bad fields throw naming the field", () => {
    const f = field();
    expect(() => encodeField(f, 0.2)).toThrow(/tx_post1/);
    expect(() => encodeField(f, Number.NaN)).toThrow(/finite/);
    expect(() => decodeField(f, 3)).toThrow(/code 3/);
    expect(() => decodeField(f, -1.5)).toThrow(/code/);
    expect(() => codeRange(field({ bits: 2, min: -0.5, max: -0.3 }))).toThrow(/no 2-bit code/);
    expect(() => codeRange(field({ parameter: "rx[0]" }))).toThrow(/parameter/);
    expect(() => codeRange(field({ lsb: 0 }))).toThrow(/lsb/);
  });
});

describe("quantizeSetting", () => {
  const map: RegisterField[] = [
    field({ name: "tx_pre1", parameter: "tx[-1]", min: -0.25, max: 0 }),
    field({ name: "tx_main", parameter: "tx[0]", signed: false, min: 0, max: 1, bits: 7 }),
    field({ name: "tx_post1", parameter: "tx[1]" }),
    field({ name: "ctle_gdc", parameter: "ctle.gDc_dB", lsb: 0.5, unit: "dB", min: -15, max: 0 }),
    field({ name: "dfe1", parameter: "dfe[1]", lsb: 0.002, unit: "V", min: -0.2, max: 0.2, bits: 8 }),
  ];
  it("rounds each quantity to its code and keeps Σ|c| ≤ 1 by lowering the main tap", () => {
    const q = quantizeSetting(
      { tx: [-0.071, 0.718, -0.211], txPre: 1, ctle: { gDc_dB: -6.3, gDc2_dB: 0 }, dfe: [0.0531] },
      map,
    );
    expect(q.codes).toEqual({ tx_pre1: -4, tx_main: 35, tx_post1: -11, ctle_gdc: -13, dfe1: 27 });
    const s = q.setting.tx.reduce((a, c) => a + Math.abs(c), 0);
    expect(s).toBeLessThanOrEqual(1 + 1e-12);
    expect(q.setting.ctle.gDc_dB).toBeCloseTo(-6.5, 12);
    expect(q.setting.dfe[0]).toBeCloseTo(0.054, 12);
  });

  it("the peak-swing repair: rounding [−0.095, 0.72, −0.195] to [−0.10, 0.72, −0.20] lowers the main tap to 0.70", () => {
    const q = quantizeSetting(
      { tx: [-0.095, 0.72, -0.195], txPre: 1, ctle: { gDc_dB: 0, gDc2_dB: 0 }, dfe: [] },
      map.slice(0, 3),
    );
    expect(q.setting.tx.map((x) => Math.round(x * 100) / 100)).toEqual([-0.1, 0.7, -0.2]);
  });

  it("edges: a repeated parameter throws; quantities without a field stay", () => {
    expect(() =>
      quantizeSetting({ tx: [1], txPre: 0, ctle: { gDc_dB: 0, gDc2_dB: 0 }, dfe: [] }, [
        map[1],
        { ...map[1], name: "again" },
      ]),
    ).toThrow(/twice/);
    const q = quantizeSetting({ tx: [1], txPre: 0, ctle: { gDc_dB: -3.3, gDc2_dB: -1.1 }, dfe: [] }, [map[1]]);
    expect(q.setting.ctle).toEqual({ gDc_dB: -3.3, gDc2_dB: -1.1 });
  });
});
