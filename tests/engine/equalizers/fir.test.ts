// Transmit FIR / receive FFE: application to pulses and cursors, responses, levels, constraints, enumeration.
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import {
  applyFir,
  convolveCursors,
  countTxFirs,
  enumerateTxFirs,
  firLevels,
  firNoiseGain,
  firResponse,
  isLegalTxFir,
  normalizePeakSwing,
  peakSwing,
  quantizeTaps,
  type TxFirSpec,
} from "@lib/equalizers";
import { cursorsAt, pulseArea } from "@lib/pulse";
import { seededRandom } from "@lib/signal";
import type { Pulse } from "@lib/types";

const UI = 1 / 25.78125e9;
const randomPulse = (seed: number, spu = 8, n = 120): Pulse => {
  const r = seededRandom(seed);
  return { ui_s: UI, samplesPerUi: spu, values_V: Float64Array.from({ length: n }, r.normal), mainIndex: 40 };
};

describe("firLevels and firResponse: outside checks", () => {
  // [memory] PCI Express Base Specification 3.0 preset table, recalled, not re-read (shared/references.md).
  it("[0, 0.75, −0.25] gives de-emphasis −6.021 dB [memory: PCIe 3.0 presets, recalled not re-read]", () => {
    const l = firLevels([0, 0.75, -0.25], 1);
    expect(l.deEmphasis_dB).toBeCloseTo(-6.021, 3);
    expect(l.preShoot_dB).toBeCloseTo(0, 12);
  });
  it("[0, 0.833, −0.167] gives de-emphasis −3.531 dB [memory: PCIe 3.0 presets; FPGA application notes]", () => {
    expect(firLevels([0, 0.833, -0.167], 1).deEmphasis_dB).toBeCloseTo(-3.531, 3);
  });
  it("[−0.1, 0.7, −0.2] gives pre-shoot 3.522 dB and de-emphasis −6.021 dB [memory: PCIe 3.0 presets]", () => {
    const l = firLevels([-0.1, 0.7, -0.2], 1);
    expect(l.preShoot_dB).toBeCloseTo(3.522, 3);
    expect(l.deEmphasis_dB).toBeCloseTo(-6.021, 3);
    expect(l.vd).toBeCloseTo(1, 15);
    expect(l.boost_dB).toBeCloseTo(20 * Math.log10(1 / 0.4), 12);
  });
  it("[practice] symmetric 3-tap (−0.15, 0.7, −0.15): DC gain 0.4, Nyquist gain 1.0, ratio ≈ −8 dB", () => {
    const r = firResponse([-0.15, 0.7, -0.15], 1, UI, [0, 1 / (2 * UI)]);
    expect(r.re[0]).toBeCloseTo(0.4, 14);
    expect(r.re[1]).toBeCloseTo(1.0, 14);
    expect(r.magnitude_dB[0] - r.magnitude_dB[1]).toBeCloseTo(20 * Math.log10(0.4), 10);
    expect(r.magnitude_dB[0] - r.magnitude_dB[1]).toBeCloseTo(-7.96, 2);
    // Symmetric about the main tap: real response, zero phase below the first zero.
    expect(Math.abs(r.im[0]) + Math.abs(r.im[1])).toBeLessThan(1e-15);
  });
});

describe("firResponse", () => {
  it("oracle: equals the DTFT of the taps at f·UI, times exp(+i2πf·pre·UI) (seed 3)", () => {
    const r = seededRandom(3);
    const taps = Float64Array.from({ length: 6 }, r.normal);
    const pre = 2;
    const freqs = [0, 1.3e9, 5e9, 12.9e9, 20e9];
    const got = firResponse(taps, pre, UI, freqs);
    freqs.forEach((f, k) => {
      let sr = 0;
      let si = 0;
      for (let n = 0; n < taps.length; n++) {
        sr += taps[n] * Math.cos(2 * Math.PI * f * UI * n);
        si -= taps[n] * Math.sin(2 * Math.PI * f * UI * n);
      }
      const a = 2 * Math.PI * f * pre * UI; // undo the reference shift
      const wr = sr * Math.cos(a) - si * Math.sin(a);
      const wi = sr * Math.sin(a) + si * Math.cos(a);
      expect(got.re[k]).toBeCloseTo(wr, 12);
      expect(got.im[k]).toBeCloseTo(wi, 12);
      expect(got.phase_rad[k]).toBeCloseTo(Math.atan2(wi, wr), 12);
    });
  });
  it("identities: periodic in f with period 1/UI; DC gain Σc; |H| ≤ Σ|c|", () => {
    const taps = [-0.1, 0.65, -0.2, -0.05];
    const f = [0.7e9, 3.3e9, 11e9];
    const a = firResponse(taps, 1, UI, f);
    const b = firResponse(
      taps,
      1,
      UI,
      f.map((x) => x + 1 / UI),
    );
    for (let k = 0; k < f.length; k++) {
      expect(b.magnitude_dB[k]).toBeCloseTo(a.magnitude_dB[k], 9);
      expect(10 ** (a.magnitude_dB[k] / 20)).toBeLessThanOrEqual(peakSwing(taps) + 1e-12);
    }
    expect(firResponse(taps, 1, UI, [0]).re[0]).toBeCloseTo(0.3, 14);
  });
  it("edges: a zero response reads −400 dB at most (finite for JSON); bad inputs are refused by name", () => {
    const z = firResponse([0.5, 0.5], 0, UI, [1 / (2 * UI)]).magnitude_dB[0];
    expect(z).toBeLessThan(-250);
    expect(z).toBeGreaterThanOrEqual(-400);
    expect(() => firResponse([], 0, UI, [0])).toThrow(/taps/);
    expect(() => firResponse([1, Number.NaN], 0, UI, [0])).toThrow(/taps\[1\]/);
    expect(() => firResponse([1], 1, UI, [0])).toThrow(/pre/);
    expect(() => firResponse([1], 0, 0, [0])).toThrow(/ui_s/);
    expect(() => firResponse([1], 0, UI, [Number.POSITIVE_INFINITY])).toThrow(/freqs_Hz\[0\]/);
    expect(() => firLevels([0.1, 0.1, 0.6, -0.2], 2)).toThrow(/at most one/);
    expect(() => firLevels([-0.3, 0.4, -0.3], 1)).toThrow(/steady level/);
    expect(firLevels([1], 0).deEmphasis_dB).toBe(0);
  });
});

describe("applyFir / convolveCursors / firNoiseGain", () => {
  it("analytic: a two-tap FIR on a one-UI rectangle gives a step of c0 then c1", () => {
    const p: Pulse = { ui_s: UI, samplesPerUi: 4, values_V: new Float64Array(4).fill(1), mainIndex: 2 };
    const y = applyFir(p, [0.75, -0.25], 0);
    expect(Array.from(y.values_V)).toEqual([0.75, 0.75, 0.75, 0.75, -0.25, -0.25, -0.25, -0.25]);
    expect(y.mainIndex).toBe(2);
    const z = applyFir(p, [-0.1, 0.9], 1);
    expect(z.mainIndex).toBe(6);
  });
  it("identity: cursors of the filtered pulse equal the cursors convolved with the taps (seed 8)", () => {
    const p = randomPulse(8);
    const taps = [-0.08, 0.62, -0.22, -0.08];
    const pre = 1;
    const y = applyFir(p, taps, pre);
    const direct = cursorsAt(y, y.mainIndex, 3, 6);
    const h = cursorsAt(p, p.mainIndex, 3 + (taps.length - 1 - pre), 6 + pre);
    const g = convolveCursors(h, taps, pre);
    for (let k = -3; k <= 6; k++) expect(direct.h[direct.main + k]).toBeCloseTo(g.h[g.main + k], 12);
    expect(pulseArea(y)).toBeCloseTo(pulseArea(p) * taps.reduce((s, c) => s + c, 0), 18);
  });
  it("oracle: convolveCursors equals the textbook sum g[i] = Σ c[j]·h[i−j]", () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -1, max: 1, noNaN: true }), { minLength: 1, maxLength: 12 }),
        fc.array(fc.double({ min: -1, max: 1, noNaN: true }), { minLength: 1, maxLength: 6 }),
        (h, c) => {
          const g = convolveCursors({ h: Float64Array.from(h), main: 0 }, c, 0);
          for (let i = 0; i < g.h.length; i++) {
            let s = 0;
            for (let j = 0; j < c.length; j++) if (i - j >= 0 && i - j < h.length) s += c[j] * h[i - j];
            expect(g.h[i]).toBeCloseTo(s, 12);
          }
        },
      ),
      { seed: 2, numRuns: 100 },
    );
  });
  it("edges: noise gain Σc²; bad cursors and taps", () => {
    expect(firNoiseGain([0.5, -0.5, 1])).toBeCloseTo(1.5, 15);
    expect(() => convolveCursors({ h: Float64Array.of(1), main: 1 }, [1], 0)).toThrow(/cursors.main/);
    expect(() => applyFir(randomPulse(1), [1, 2], 2)).toThrow(/pre/);
  });
});

describe("transmit FIR constraints and enumeration", () => {
  const spec: TxFirSpec = { pre: 1, post: 2, step: 0.05 };

  /** Oracle: brute force over every grid vector (main included), keeping the largest legal main. */
  const bruteForce = (s: TxFirSpec) => {
    const step = s.step;
    const n = s.pre + 1 + s.post;
    const kmax = Math.round(1 / step);
    const found = new Map<string, number>();
    const idx = new Array(n).fill(-kmax);
    for (;;) {
      const taps = idx.map((k) => k * step);
      if (isLegalTxFir(taps, s)) {
        const key = idx.filter((_, j) => j !== s.pre).join(",");
        found.set(key, Math.max(found.get(key) ?? -Infinity, taps[s.pre]));
      }
      let j = n - 1;
      while (j >= 0 && ++idx[j] > kmax) idx[j--] = -kmax;
      if (j < 0) break;
    }
    return found;
  };

  it("oracle: enumeration equals a brute force over the whole grid (main at its largest legal value)", () => {
    const small: TxFirSpec = {
      pre: 1,
      post: 1,
      step: 0.1,
      ranges: [
        [-0.3, 0],
        [0.2, 1],
        [-0.4, 0.1],
      ],
    };
    const want = bruteForce(small);
    const got = [...enumerateTxFirs(small)];
    expect(got.length).toBe(want.size);
    for (const t of got) {
      const key = [t[0], t[2]].map((v) => Math.round(v / 0.1)).join(",");
      expect(t[1]).toBeCloseTo(want.get(key)!, 12);
    }
  });

  it("identities: every setting is legal, distinct, full-swing when the grid allows", () => {
    const all = [...enumerateTxFirs(spec)];
    expect(all.length).toBe(countTxFirs(spec));
    // Side taps on [−0.5, 0] in 0.05 steps (11 values each); main = 1 − Σ|side| must stay ≥ 0.
    let want = 0;
    for (let a = 0; a <= 10; a++)
      for (let b = 0; b <= 10; b++) for (let c = 0; c <= 10; c++) if (a + b + c <= 20) want++;
    expect(all.length).toBe(want);
    const keys = new Set(all.map((t) => Array.from(t, (v) => Math.round(v / 0.05)).join(",")));
    expect(keys.size).toBe(all.length);
    for (const t of all) {
      expect(isLegalTxFir(t, spec)).toBe(true);
      expect(peakSwing(t)).toBeCloseTo(1, 9);
    }
  });

  it("analytic: quantize, normalize, legality", () => {
    expect(Array.from(quantizeTaps([-0.126, 0.74, -0.0249], 0.025))).toEqual([-0.125, 0.75, -0.025]);
    expect(Array.from(normalizePeakSwing([-1, 3]))).toEqual([-0.25, 0.75]);
    expect(isLegalTxFir([-0.1, 0.7, -0.2], spec)).toBe(false); // wrong length (spec has 4 taps)
    expect(isLegalTxFir([-0.1, 0.7, -0.2, 0], spec)).toBe(true);
    expect(isLegalTxFir([-0.1, 0.75, -0.2, 0], spec)).toBe(false); // Σ|c| = 1.05
    expect(isLegalTxFir([-0.1, 0.7, -0.2, 0.05], spec)).toBe(false); // post tap out of [−0.5, 0]
    expect(isLegalTxFir([-0.1, 0.69, -0.2, 0], spec)).toBe(false); // off the grid
  });

  it("edges: no taps but the main; empty when ranges exclude the grid; bad specs", () => {
    expect([...enumerateTxFirs({ pre: 0, post: 0, step: 0.1 })].map((t) => Array.from(t))).toEqual([[1]]);
    expect(
      countTxFirs({
        pre: 0,
        post: 1,
        step: 0.1,
        ranges: [
          [0.95, 1],
          [-0.5, -0.1],
        ],
      }),
    ).toBe(0);
    expect(
      countTxFirs({
        pre: 0,
        post: 1,
        step: 0.3,
        ranges: [
          [0, 1],
          [-0.2, -0.1],
        ],
      }),
    ).toBe(0);
    expect(() => countTxFirs({ pre: -1, post: 0, step: 0.1 })).toThrow(/spec.pre/);
    expect(() => countTxFirs({ pre: 0, post: 0, step: 0 })).toThrow(/spec.step/);
    expect(() => countTxFirs({ pre: 0, post: 1, step: 0.1, ranges: [[0, 1]] })).toThrow(/2 ranges/);
    expect(() => countTxFirs({ pre: 0, post: 0, step: 0.1, ranges: [[1, 0]] })).toThrow(/ranges\[0\]/);
    expect(() => normalizePeakSwing([0, 0])).toThrow(/zero/);
    expect(() => quantizeTaps([1], -1)).toThrow(/step/);
  });
});
