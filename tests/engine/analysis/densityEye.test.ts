// Time-domain density eyes and symbol streams: exact levels, a direct-superposition oracle,
// conservation and periodicity identities, edges.
import { describe, expect, it } from "vitest";
import { densityEye } from "@lib/analysis/densityEye";
import { grayPam4, symbolStream } from "@lib/analysis/symbolStream";
import { cursorPulse, rectPulse } from "./helpers.ts";

describe("symbolStream", () => {
  it("analytic: PRBS7 NRZ starts with the pattern 1111111000000100 as ±1 (ITU-T O.150; shared/references.md)", () => {
    const s = symbolStream("nrz", { kind: "prbs", order: 7 });
    expect(s.length).toBe(127);
    const bits = "1111111000000100";
    for (let i = 0; i < bits.length; i++) expect(s[i]).toBe(bits[i] === "1" ? 1 : -1);
  });

  it("analytic: Gray-coded PAM4 maps 00, 01, 11, 10 to −1, −1/3, +1/3, +1 (IEEE 802.3 Clause 120 [memory])", () => {
    expect([grayPam4(0, 0), grayPam4(0, 1), grayPam4(1, 1), grayPam4(1, 0)]).toEqual([-1, -1 / 3, 1 / 3, 1]);
    const s = symbolStream("pam4", { kind: "prbs", order: 13 });
    expect(s.length).toBe(8191); // two periods of bits, one period of symbols
    // PRBS13 starts with thirteen ones: the first six symbols are "11" → +1/3.
    for (let i = 0; i < 6; i++) expect(s[i]).toBeCloseTo(1 / 3, 15);
  });

  it("identities: a PRBS period holds 2^(n−1) ones; random streams are reproducible and balanced", () => {
    const s = symbolStream("nrz", { kind: "prbs", order: 9 });
    expect(s.filter((v) => v === 1).length).toBe(256);
    const a = symbolStream("pam4", { kind: "random", seed: 5, length: 4000 });
    const b = symbolStream("pam4", { kind: "random", seed: 5, length: 4000 });
    expect(a).toEqual(b);
    for (const level of [-1, -1 / 3, 1 / 3, 1]) {
      const share = a.filter((v) => v === level).length / a.length;
      expect(Math.abs(share - 0.25)).toBeLessThan(0.03);
    }
  });

  it("edges: bad order, seed, length and modulation throw naming the field", () => {
    expect(() => symbolStream("nrz", { kind: "prbs", order: 8 as 7 })).toThrow(/order/);
    expect(() => symbolStream("nrz", { kind: "random", seed: 1.5, length: 4 })).toThrow(/seed/);
    expect(() => symbolStream("nrz", { kind: "random", seed: 1, length: 0 })).toThrow(/length/);
    expect(() => symbolStream("pam8" as "nrz", { kind: "random", seed: 1, length: 4 })).toThrow(/modulation/);
  });
});

describe("densityEye", () => {
  it("analytic: a rectangular pulse paints only ±A away from the transitions, and transitions elsewhere", () => {
    const A = 0.25;
    const spu = 16;
    const eye = densityEye(rectPulse(A, spu), symbolStream("nrz", { kind: "prbs", order: 7 }), {
      width: 32,
      height: 40,
      voltageRange_V: [-0.5, 0.5],
    });
    const rowOf = (v: number) => Math.floor((0.5 - v) / (1 / 40));
    let between = 0;
    for (let c = 0; c < 32; c++) {
      for (let r = 0; r < 40; r++) {
        const n = eye.counts[r * 32 + c];
        // The rectangle's edges lie half a sample outside ±½ UI of its centre; columns well inside
        // the UI see only the two levels.
        if (n > 0 && Math.abs(eye.time_UI[c]) < 0.4) expect([rowOf(A), rowOf(-A)]).toContain(r);
        if (n > 0 && r !== rowOf(A) && r !== rowOf(-A)) between += n;
      }
    }
    expect(between).toBeGreaterThan(0);
  });

  it("oracle: the histogram equals one built from a direct superposition of every symbol's pulse", () => {
    const pulse = cursorPulse([0, 0.05, 0.3, 0.12, -0.04, 0.02, 0], 2, 8);
    const symbols = symbolStream("pam4", { kind: "random", seed: 9, length: 200 });
    const W = 16;
    const H = 24;
    const range: [number, number] = [-0.6, 0.6];
    const eye = densityEye(pulse, symbols, { width: W, height: H, voltageRange_V: range, pointsPerColumn: 2 });
    // Oracle: periodic waveform by direct superposition, then the same folding.
    const spu = 8;
    const N = symbols.length;
    const y = new Float64Array(N * spu);
    for (let k = 0; k < N; k++) {
      for (let i = 0; i < pulse.values_V.length; i++) y[(k * spu + i) % (N * spu)] += symbols[k] * pulse.values_V[i];
    }
    const counts = new Float64Array(W * H);
    for (let n = 0; n < N; n++) {
      for (let c = 0; c < W; c++) {
        for (let q = 0; q < 2; q++) {
          const x = n * spu + pulse.mainIndex + (-1 + ((c + (q + 0.5) / 2) * 2) / W) * spu;
          const xm = ((x % y.length) + y.length) % y.length;
          const i0 = Math.floor(xm);
          const v = y[i0] + (xm - i0) * (y[(i0 + 1) % y.length] - y[i0]);
          const r = Math.floor((0.6 - v) / (1.2 / H));
          if (r >= 0 && r < H) counts[r * W + c]++;
        }
      }
    }
    expect(eye.counts).toEqual(counts);
  });

  it("identities: every point lands when the range covers the waveform; rotating the stream changes nothing", () => {
    const pulse = cursorPulse([0, 0.1, 0.35, 0.1, 0], 2, 8);
    const s = symbolStream("nrz", { kind: "prbs", order: 7 });
    const eye = densityEye(pulse, s, { width: 20, height: 30, pointsPerColumn: 3 });
    expect(eye.counts.reduce((a, b) => a + b, 0)).toBe(127 * 20 * 3);
    const rotated = Float64Array.from(s, (_, i) => s[(i + 17) % s.length]);
    expect(densityEye(pulse, rotated, { width: 20, height: 30, pointsPerColumn: 3 }).counts).toEqual(eye.counts);
    expect(eye.time_UI[0]).toBeCloseTo(-1 + 1 / 20, 15);
    expect(eye.voltage_V[0]).toBeGreaterThan(eye.voltage_V[29]);
  });

  it("edges: empty symbols, bad sizes and ranges throw naming the field", () => {
    const pulse = rectPulse(0.3, 8);
    expect(() => densityEye(pulse, new Float64Array(0))).toThrow(/symbols/);
    expect(() => densityEye(pulse, Float64Array.of(1), { width: 1 })).toThrow(/width/);
    expect(() => densityEye(pulse, Float64Array.of(1), { voltageRange_V: [1, 0] })).toThrow(/voltageRange_V/);
    expect(() => densityEye(pulse, Float64Array.of(Number.NaN))).toThrow(/symbols\[0\]/);
  });
});
