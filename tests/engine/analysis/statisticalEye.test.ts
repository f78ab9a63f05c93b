// The statistical eye: closed forms of clean and one-post-cursor pulses, DFE, PAM4, a brute-force
// oracle, monotonicity properties and edges.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { berFromQ, qFromBer } from "@lib/analysis/ber";
import { statisticalEye, symbolLevels } from "@lib/analysis/statisticalEye";
import { cursorPulse, enumerateIsi } from "./helpers.ts";

const BER = 1e-12;

describe("statisticalEye — analytic cases", () => {
  it("a clean pulse of height A gives eyeHeight = 2A − 2·Q(BER)·σ [computed, BER = ½·erfc(Q/√2)], tol 1e-3·σ", () => {
    for (const sigma of [0.001, 0.005, 0.02]) {
      const eye = statisticalEye(cursorPulse([0, 0.4, 0], 1), { modulation: "nrz", noiseRms_V: sigma });
      for (const ber of [1e-6, 1e-12, 1e-15]) {
        expect(Math.abs(eye.eyeHeight(0, ber) - (0.8 - 2 * qFromBer(ber) * sigma))).toBeLessThan(1e-3 * sigma);
      }
    }
  });

  it("one post-cursor r without DFE: 2(A − r) − 2·Q(2·BER)·σ (the adverse half of the symbols) [computed]", () => {
    const sigma = 0.01;
    const r = 0.13; // on a node of the default grid: 256·r/(r + 13σ) = 128
    const eye = statisticalEye(cursorPulse([0, 0.4, r, 0], 1), { modulation: "nrz", noiseRms_V: sigma });
    const want = 2 * (0.4 - r) - 2 * qFromBer(2 * BER) * sigma;
    expect(Math.abs(eye.eyeHeight(0, BER) - want)).toBeLessThan(1e-3 * sigma);
  });

  it("one post-cursor r with a DFE tap equal to r: back to the clean eye 2A − 2·Q(BER)·σ", () => {
    const sigma = 0.01;
    const eye = statisticalEye(cursorPulse([0, 0.4, 0.13, 0], 1), { modulation: "nrz", noiseRms_V: sigma, dfeTaps: [0.13] });
    expect(Math.abs(eye.eyeHeight(0, BER) - (0.8 - 2 * qFromBer(BER) * sigma))).toBeLessThan(1e-3 * sigma);
  });

  it("a clipped DFE tap leaves its residual: 2(A − (r − limit)) − 2·Q(2·BER)·σ", () => {
    const sigma = 0.01;
    const residual = (13 * sigma * 64) / 192; // a grid node again
    const r = 0.2;
    const eye = statisticalEye(cursorPulse([0, 0.4, r, 0], 1), {
      modulation: "nrz",
      noiseRms_V: sigma,
      dfeTaps: [r - residual],
    });
    const want = 2 * (0.4 - residual) - 2 * qFromBer(2 * BER) * sigma;
    expect(Math.abs(eye.eyeHeight(0, BER) - want)).toBeLessThan(1e-3 * sigma);
  });

  it("PAM4 eyes are a third of NRZ at equal swing (20·log10 3 = 9.542 dB [practice]); with noise 2A/3 − 2Qσ", () => {
    const pulse = cursorPulse([0, 0.45, 0], 1);
    const nrz = statisticalEye(pulse, { modulation: "nrz", noiseRms_V: 0 }).eyeHeight(0, BER);
    const pam4 = statisticalEye(pulse, { modulation: "pam4", noiseRms_V: 0 });
    expect(pam4.eyeHeight(0, BER)).toBeCloseTo(nrz / 3, 12);
    expect(20 * Math.log10(nrz / pam4.eyeHeight(0, BER))).toBeCloseTo(9.542, 3);
    const heights = pam4.eyeHeights(0, BER);
    expect(heights.length).toBe(3);
    const noisy = statisticalEye(pulse, { modulation: "pam4", noiseRms_V: 0.004 });
    expect(Math.abs(noisy.eyeHeight(0, BER) - (0.3 - 2 * qFromBer(BER) * 0.004))).toBeLessThan(4e-6);
  });

  it("levels: NRZ ±1 and PAM4 ±1, ±1/3 (the engine's symbol convention)", () => {
    expect(Array.from(symbolLevels("nrz"))).toEqual([-1, 1]);
    expect(Array.from(symbolLevels("pam4"))).toEqual([-1, -1 / 3, 1 / 3, 1]);
  });
});

describe("statisticalEye — oracle", () => {
  it("matches brute-force enumeration of 2^9 patterns with exact Gaussian tails (within two grid steps)", () => {
    const cursors = [0.03, -0.05, 0.5, 0.12, -0.06, 0.03, 0.02, -0.015, 0.01, 0.008];
    const main = 2;
    const sigma = 0.007;
    const eye = statisticalEye(cursorPulse(cursors, main), { modulation: "nrz", noiseRms_V: sigma });
    const isi = cursors.filter((_, i) => i !== main);
    const { values, prob } = enumerateIsi(isi, [-1, 1]);
    const below = (u: number) => values.reduce((s, v) => s + prob * berFromQ((v - u) / sigma), 0);
    let lo = -1;
    let hi = 0;
    for (let i = 0; i < 80; i++) {
      const m = (lo + hi) / 2;
      if (below(m) < BER) lo = m;
      else hi = m;
    }
    const want = 2 * (0.5 + lo);
    expect(Math.abs(eye.eyeHeight(0, BER) - want)).toBeLessThan(2 * eye.distribution(0).isi.step_V);
  });

  it("jitter mixes phases: with DJ alone of ±d samples the level tail is the mean of the two phase tails", () => {
    const pulse = cursorPulse([0, 0.1, 0.5, 0.2, 0.05, 0], 2, 16);
    const sigma = 0.005;
    const plain = statisticalEye(pulse, { modulation: "nrz", noiseRms_V: sigma });
    const jit = statisticalEye(pulse, { modulation: "nrz", noiseRms_V: sigma, jitter: { rjRms_UI: 0, djPp_UI: 0.25 } });
    for (const v of [0.1, 0.2, 0.3]) {
      const want = 0.5 * (plain.probBelow(1, -2, v) + plain.probBelow(1, 2, v));
      expect(jit.probBelow(1, 0, v)).toBeCloseTo(want, 14);
    }
    const top = jit.eyeEdges(0, BER)[1];
    expect(0.5 * (plain.probBelow(1, -2, top) + plain.probBelow(1, 2, top)) / BER).toBeCloseTo(1, 6);
  });
});

describe("statisticalEye — identities and properties", () => {
  it("the BER of a threshold is the sum of the two neighbouring levels' conditional tails", () => {
    const eye = statisticalEye(cursorPulse([0.02, 0.4, 0.1, -0.03], 1), { modulation: "pam4", noiseRms_V: 0.01 });
    const v = 0.05;
    const m = eye.main(0);
    expect(m).toBeCloseTo(0.4, 15);
    // v lies between the levels −1/3·m and +1/3·m (indices 1 and 2).
    expect(eye.ber(0, v)).toBeCloseTo(eye.probBelow(2, 0, v) + eye.probAbove(1, 0, v), 15);
  });

  it("property: a larger noise never raises the eye (beyond the grid resolution) [NRZ and PAM4]", () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -0.08, max: 0.08, noNaN: true }), { minLength: 1, maxLength: 8 }),
        fc.double({ min: 0.001, max: 0.02, noNaN: true }),
        fc.double({ min: 1.05, max: 3, noNaN: true }),
        fc.constantFrom("nrz" as const, "pam4" as const),
        (isi, s1, factor, mod) => {
          const pulse = cursorPulse([0, 0.5, ...isi, 0], 1);
          const e1 = statisticalEye(pulse, { modulation: mod, noiseRms_V: s1 });
          const e2 = statisticalEye(pulse, { modulation: mod, noiseRms_V: s1 * factor });
          const tol = e1.distribution(0).isi.step_V + e2.distribution(0).isi.step_V;
          return e2.eyeHeight(0, BER) <= e1.eyeHeight(0, BER) + tol;
        },
      ),
      { seed: 20261201, numRuns: 60 },
    );
  });

  it("property: cancelling one more post-cursor with a DFE tap never lowers the eye (beyond the grid resolution)", () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -0.1, max: 0.1, noNaN: true }), { minLength: 2, maxLength: 8 }),
        fc.integer({ min: 0, max: 7 }),
        (post, n) => {
          const taps = post.slice(0, Math.min(n, post.length - 1));
          const more = post.slice(0, taps.length + 1);
          const pulse = cursorPulse([0, 0.5, ...post, 0], 1);
          const a = statisticalEye(pulse, { modulation: "nrz", noiseRms_V: 0.004, dfeTaps: taps });
          const b = statisticalEye(pulse, { modulation: "nrz", noiseRms_V: 0.004, dfeTaps: more });
          const tol = a.distribution(0).isi.step_V + b.distribution(0).isi.step_V;
          return b.eyeHeight(0, BER) >= a.eyeHeight(0, BER) - tol;
        },
      ),
      { seed: 4, numRuns: 60 },
    );
  });

  it("the eye of a negated ISI pattern is the same (symmetric laws)", () => {
    const a = statisticalEye(cursorPulse([0.05, 0.4, 0.1, -0.02], 1), { modulation: "nrz", noiseRms_V: 0.006 });
    const b = statisticalEye(cursorPulse([-0.05, 0.4, -0.1, 0.02], 1), { modulation: "nrz", noiseRms_V: 0.006 });
    expect(a.eyeHeight(0, BER)).toBeCloseTo(b.eyeHeight(0, BER), 12);
  });
});

describe("statisticalEye — edges", () => {
  it("a closed eye reports 0 height; a negative main cursor closes every eye", () => {
    const eye = statisticalEye(cursorPulse([0, 0.1, 0.3, 0], 1), { modulation: "nrz", noiseRms_V: 0.01 });
    expect(eye.eyeHeight(0, BER)).toBe(0);
    const neg = statisticalEye(cursorPulse([0, -0.3, 0], 1), { modulation: "nrz", noiseRms_V: 0.01 });
    expect(neg.eyeHeight(0, BER)).toBe(0);
  });

  it("phases outside the record see a zero pulse; bad options throw naming the field", () => {
    const pulse = cursorPulse([0, 0.4, 0], 1, 8);
    const eye = statisticalEye(pulse, { modulation: "nrz", noiseRms_V: 0.01 });
    expect(eye.main(1000)).toBe(0);
    expect(() => statisticalEye(pulse, { modulation: "nrz", noiseRms_V: -1 })).toThrow(/noiseRms_V/);
    expect(() => statisticalEye(pulse, { modulation: "nrz", noiseRms_V: 0, dfeTaps: [Number.NaN] })).toThrow(/dfeTaps\[0\]/);
    expect(() => statisticalEye(pulse, { modulation: "nrz", noiseRms_V: 0, jitter: { rjRms_UI: 1, djPp_UI: 0 } })).toThrow(
      /rjRms_UI/,
    );
    expect(() => eye.eyeHeight(0, 0.7)).toThrow(/ber/);
    expect(() => eye.probBelow(2, 0, 0)).toThrow(/level/);
    expect(() => statisticalEye({ ...pulse, mainIndex: 99 }, { modulation: "nrz", noiseRms_V: 0 })).toThrow(/mainIndex/);
  });
});
