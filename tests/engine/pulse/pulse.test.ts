// Pulse helpers: cursors at a phase, framing, scaling, JSON form, area and peak.
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import {
  cursorsAt,
  peakIndex,
  pulseArea,
  pulseFromJson,
  pulseLoss_dB,
  pulseToJson,
  scalePulse,
  trimPulse,
} from "@lib/pulse";
import type { Pulse } from "@lib/types";
import { pulseFromLossModel } from "@lib/channel";

const make = (values: number[], samplesPerUi: number, mainIndex: number, ui_s = 1e-10): Pulse => ({
  ui_s,
  samplesPerUi,
  values_V: Float64Array.from(values),
  mainIndex,
});

describe("cursorsAt", () => {
  it("analytic: a ramp sampled every 4 samples around index 9", () => {
    const p = make(
      Array.from({ length: 20 }, (_, i) => i),
      4,
      9,
    );
    const { h, main } = cursorsAt(p, 9, 2, 3);
    expect(main).toBe(2);
    expect(Array.from(h)).toEqual([1, 5, 9, 13, 17, 0]); // the last one falls outside the pulse
  });

  it("analytic: a fractional phase interpolates linearly", () => {
    const p = make([0, 2, 4, 6, 8, 10], 2, 2);
    expect(Array.from(cursorsAt(p, 2.25, 1, 1).h)).toEqual([0.5, 4.5, 8.5]);
  });

  it("oracle: equals direct indexing for integer phases (random pulses, seed 11)", () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -1, max: 1, noNaN: true }), { minLength: 1, maxLength: 60 }),
        fc.integer({ min: 1, max: 8 }),
        fc.integer({ min: -20, max: 80 }),
        fc.integer({ min: 0, max: 5 }),
        fc.integer({ min: 0, max: 5 }),
        (vals, spu, phase, pre, post) => {
          const p = make(vals, spu, 0);
          const { h } = cursorsAt(p, phase, pre, post);
          for (let k = 0; k < h.length; k++) {
            const i = phase + (k - pre) * spu;
            expect(h[k]).toBe(i >= 0 && i < vals.length ? vals[i] : 0);
          }
        },
      ),
      { seed: 11, numRuns: 200 },
    );
  });

  it("edges: bad counts and phases are refused by name", () => {
    const p = make([1], 1, 0);
    expect(cursorsAt(p, 0, 0, 0).h[0]).toBe(1);
    expect(() => cursorsAt(p, Number.NaN, 0, 0)).toThrow(/phase_samples/);
    expect(() => cursorsAt(p, 0, -1, 0)).toThrow(/preCount/);
    expect(() => cursorsAt(p, 0, 0, 1.5)).toThrow(/postCount/);
    expect(() => cursorsAt({ ...p, mainIndex: 3 }, 0, 0, 0)).toThrow(/pulse.mainIndex/);
    expect(() => cursorsAt({ ...p, values_V: Float64Array.of(Number.NaN) }, 0, 0, 0)).toThrow(/values_V\[0\]/);
  });
});

describe("trimPulse / scalePulse / pulseArea / peakIndex", () => {
  it("analytic: trims and pads around the main cursor", () => {
    const p = make([1, 2, 3, 4, 5, 6, 7], 2, 3);
    const t = trimPulse(p, 1, 2);
    expect(Array.from(t.values_V)).toEqual([2, 3, 4, 5, 6, 7, 0]);
    expect(t.mainIndex).toBe(2);
    expect(Array.from(trimPulse(p, 0, 0).values_V)).toEqual([4]);
    expect(Array.from(trimPulse(p, 3, 0).values_V)).toEqual([0, 0, 0, 1, 2, 3, 4]);
  });

  it("identities: cursors survive framing; scaling scales area; inputs are not mutated", () => {
    const vals = Array.from({ length: 64 }, (_, i) => Math.sin(i / 5) * Math.exp(-i / 20));
    const p = make(vals, 8, 16);
    const before = Array.from(p.values_V);
    const c1 = cursorsAt(p, p.mainIndex, 2, 5).h;
    const t = trimPulse(p, 2, 5);
    const c2 = cursorsAt(t, t.mainIndex, 2, 5).h;
    expect(Array.from(c2)).toEqual(Array.from(c1));
    const s = scalePulse(p, -2.5);
    expect(pulseArea(s)).toBeCloseTo(-2.5 * pulseArea(p), 14);
    expect(Array.from(p.values_V)).toEqual(before);
  });

  it("analytic: a rectangle of height 1 over one UI has area ui_s", () => {
    const p = make(new Array(16).fill(1), 16, 8, 4e-11);
    expect(Math.abs(pulseArea(p) - 4e-11)).toBeLessThan(1e-24);
    expect(peakIndex(Float64Array.of(0.1, -0.7, 0.5))).toBe(1);
    expect(peakIndex(Float64Array.of(2, 2))).toBe(0);
  });

  it("edges: refuses bad arguments", () => {
    const p = make([1, 2], 1, 0);
    expect(() => trimPulse(p, -1, 0)).toThrow(/preUi/);
    expect(() => trimPulse(p, 0, 0.5)).toThrow(/postUi/);
    expect(() => scalePulse(p, Number.POSITIVE_INFINITY)).toThrow(/factor/);
    expect(() => peakIndex(new Float64Array(0))).toThrow(/values/);
    expect(() => peakIndex(Float64Array.of(1, Number.NaN))).toThrow(/NaN/);
    expect(() => pulseArea({ ...p, ui_s: 0 })).toThrow(/ui_s/);
    expect(() => pulseArea({ ...p, samplesPerUi: 0 })).toThrow(/samplesPerUi/);
  });
});

describe("pulseFromJson / pulseToJson", () => {
  it("identity: round trip keeps every field (random pulses, seed 5)", () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -10, max: 10, noNaN: true }), { minLength: 1, maxLength: 40 }),
        fc.integer({ min: 1, max: 64 }),
        (vals, spu) => {
          const json = { ui_s: 3.5e-11, samplesPerUi: spu, values_V: vals, mainIndex: vals.length - 1 };
          const back = pulseToJson(pulseFromJson(json));
          expect(back).toEqual(json);
        },
      ),
      { seed: 5, numRuns: 100 },
    );
  });

  it("edges: non-finite values and bad indices are refused", () => {
    expect(() => pulseFromJson({ ui_s: 1, samplesPerUi: 1, values_V: [1, Number.NaN], mainIndex: 0 })).toThrow(
      /values_V\[1\]/,
    );
    expect(() => pulseFromJson({ ui_s: 1, samplesPerUi: 1, values_V: [1], mainIndex: 1 })).toThrow(/mainIndex/);
    expect(() => pulseFromJson({ ui_s: -1, samplesPerUi: 1, values_V: [1], mainIndex: 0 })).toThrow(/ui_s/);
    expect(() => pulseFromJson({ ui_s: 1, samplesPerUi: 1, values_V: [], mainIndex: 0 })).toThrow(/empty/);
  });
});

describe("pulseLoss_dB", () => {
  const ui = 1e-10;
  const spu = 64;
  /** The pulse of a first-order low-pass (time constant tau) for a one-UI rectangle, sampled at the sample midpoints. */
  const rcPulse = (tau_s: number) => {
    const dt = ui / spu;
    const v = Float64Array.from({ length: 200 * spu }, (_, n) => {
      const t = (n + 0.5) * dt;
      return t < ui ? 1 - Math.exp(-t / tau_s) : (1 - Math.exp(-ui / tau_s)) * Math.exp(-(t - ui) / tau_s);
    });
    return { ui_s: ui, samplesPerUi: spu, values_V: v, mainIndex: peakIndex(v) };
  };

  it("analytic: a single pole loses 10·log10(1 + (2πfτ)²) [computed: |H| = 1/√(1 + (ωτ)²)]", () => {
    const tau = 2e-11;
    for (const f of [1e9, 5e9, 8e9]) {
      expect(pulseLoss_dB(rcPulse(tau), f)).toBeCloseTo(10 * Math.log10(1 + (2 * Math.PI * f * tau) ** 2), 2);
    }
  });

  it("oracle: the synthetic line's pulse gives back its loss at Nyquist (within 0.05 dB)", () => {
    for (const loss of [5, 20, 35]) {
      const p = pulseFromLossModel({ lossAtNyquist_dB: loss, delay_s: 1e-9 }, { ui_s: ui, samplesPerUi: 32 }).pulse;
      expect(Math.abs(pulseLoss_dB(p, 1 / (2 * ui)) - loss)).toBeLessThan(0.05);
    }
  });

  it("identities and edges: a bare rectangle loses nothing; scaling changes nothing; bad input is refused", () => {
    const rect = make(
      Array.from({ length: 3 * spu }, (_, i) => (i >= spu && i < 2 * spu ? 1 : 0)),
      spu,
      spu + 10,
      ui,
    );
    expect(pulseLoss_dB(rect, 3e9)).toBeCloseTo(0, 6);
    expect(pulseLoss_dB(scalePulse(rcPulse(2e-11), 0.3), 5e9)).toBeCloseTo(pulseLoss_dB(rcPulse(2e-11), 5e9), 10);
    expect(() => pulseLoss_dB(rect, 1 / ui)).toThrow(/freq_Hz/);
    expect(() => pulseLoss_dB(scalePulse(rect, -1), 1e9)).toThrow(/positive area/);
  });
});
