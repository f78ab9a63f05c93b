// Bathtub curves and eye width: the dual-Dirac closed form, symmetry, thresholds, edges.
import { describe, expect, it } from "vitest";
import { LOG10_BER_FLOOR, bathtub, decisionThresholds, eyeWidth, log10Ber, thresholdBer } from "@lib/analysis/bathtub";
import { qFromBer } from "@lib/analysis/ber";
import { statisticalEye } from "@lib/analysis/statisticalEye";
import { cursorPulse, rectPulse } from "./helpers.ts";

const BER = 1e-12;

describe("eyeWidth", () => {
  // Dual-Dirac TJ(BER) = DJ + 2·Q(BER)·RJ, so TJ(1e-12) = DJ + 14.069·RJ for a single-sided tail of
  // 1e-12 (T11.2 MJSQ; industry jitter notes; references.md) [memory: recalled, not re-read].
  // Convention here (Tapwright's): random data (transition density ½), each Dirac carries half the
  // jitter law, and the BER of a threshold is the average over the two levels of their conditional
  // error. Near an edge of a rectangular (ISI-free) pulse a level errs when the neighbour differs (½)
  // and the jittered instant crosses the edge (½·Q_tail from the nearer Dirac): BER = ¼·Q_tail, so
  // the single-sided tail is 4·BER and the width is 1 − DJ − 2·Q(4·BER)·RJ; with RJ alone (no Dirac
  // split) BER = ½·Q_tail and the width is 1 − 2·Q(2·BER)·RJ. Tolerance: one sample of the phase grid.
  it.each([
    [0.02, 0.2],
    [0.01, 0.05],
    [0.015, 0.1],
  ])(
    "dual-Dirac rectangle: at the BER whose single-sided tail is 1e-12, width = 1 − DJ − 14.069·RJ (RJ %s UI, DJ %s UI) [computed]",
    (rj, dj) => {
      const spu = 128;
      const ber = 1e-12 / 4;
      const eye = statisticalEye(rectPulse(0.3, spu), {
        modulation: "nrz",
        noiseRms_V: 0.001,
        jitter: { rjRms_UI: rj, djPp_UI: dj },
        targetBer: ber,
      });
      expect(2 * qFromBer(1e-12)).toBeCloseTo(14.069, 3);
      const w = eyeWidth(eye, 0, ber).eyeWidth_UI;
      expect(Math.abs(w - (1 - dj - 14.069 * rj))).toBeLessThan(1 / spu);
      expect(Math.abs(eyeWidth(eye, 0, 1e-9).eyeWidth_UI - (1 - dj - 2 * qFromBer(4e-9) * rj))).toBeLessThan(1 / spu);
    },
  );

  it("RJ alone: width = 1 − 2·Q(2·BER)·RJ, 1 − 14.069·RJ at a single-sided tail of 1e-12 [computed]", () => {
    const spu = 128;
    const eye = statisticalEye(rectPulse(0.3, spu), {
      modulation: "nrz",
      noiseRms_V: 0.001,
      jitter: { rjRms_UI: 0.03, djPp_UI: 0 },
      targetBer: 5e-13,
    });
    expect(Math.abs(eyeWidth(eye, 0, 5e-13).eyeWidth_UI - (1 - 14.069 * 0.03))).toBeLessThan(1 / spu);
  });

  it("without jitter the rectangle's eye spans the whole UI to within one sample", () => {
    const eye = statisticalEye(rectPulse(0.3, 64), { modulation: "nrz", noiseRms_V: 0.001 });
    const w = eyeWidth(eye, 0, BER);
    expect(Math.abs(w.eyeWidth_UI - 1)).toBeLessThanOrEqual(1 / 64);
    expect(w.left).toBeLessThan(0);
    expect(w.right).toBeGreaterThan(0);
  });

  it("more jitter never widens the eye; a closed eye has width 0", () => {
    const pulse = cursorPulse([0, 0.05, 0.4, 0.1, 0], 2, 32);
    let prev = Infinity;
    for (const rj of [0, 0.01, 0.02, 0.04]) {
      const eye = statisticalEye(pulse, {
        modulation: "nrz",
        noiseRms_V: 0.004,
        jitter: { rjRms_UI: rj, djPp_UI: 0.05 },
      });
      const w = eyeWidth(eye, 0, BER).eyeWidth_UI;
      expect(w).toBeLessThanOrEqual(prev + 1e-9);
      prev = w;
    }
    const closed = statisticalEye(cursorPulse([0, 0.1, 0.3, 0], 1), { modulation: "nrz", noiseRms_V: 0.01 });
    expect(eyeWidth(closed, 0, BER)).toEqual({ eyeWidth_UI: 0, left: 0, right: 0 });
  });
});

describe("bathtub", () => {
  it("is symmetric for a symmetric pulse and lowest at the centre", () => {
    const eye = statisticalEye(cursorPulse([0, 0.1, 0.5, 0.1, 0], 2, 16), {
      modulation: "nrz",
      noiseRms_V: 0.01,
      jitter: { rjRms_UI: 0.01, djPp_UI: 0.1 },
    });
    const b = bathtub(eye, 0);
    const n = b.phase_UI.length;
    expect(n).toBe(17);
    expect(b.phase_UI[0]).toBeCloseTo(-0.5, 15);
    for (let i = 0; i < n; i++) expect(b.log10Ber[i]).toBeCloseTo(b.log10Ber[n - 1 - i], 6);
    const mid = (n - 1) / 2;
    for (let i = 0; i < n; i++) expect(b.log10Ber[i]).toBeGreaterThanOrEqual(b.log10Ber[mid] - 1e-9);
  });

  it("decision thresholds: NRZ 0; PAM4 at −2/3, 0, +2/3 of the main cursor; PAM4 takes the worst eye, as a bit error ratio (⅛ of the two tails)", () => {
    const pulse = cursorPulse([0, 0.3, 0.05, 0], 1);
    const nrz = statisticalEye(pulse, { modulation: "nrz", noiseRms_V: 0.01 });
    expect(Array.from(decisionThresholds(nrz, 0))).toEqual([0]);
    const pam4 = statisticalEye(pulse, { modulation: "pam4", noiseRms_V: 0.01 });
    const th = decisionThresholds(pam4, 0);
    expect(th[0]).toBeCloseTo(-0.2, 15);
    expect(th[1]).toBeCloseTo(0, 15);
    expect(th[2]).toBeCloseTo(0.2, 15);
    const each = [0, 1, 2].map((i) => pam4.probBelow(i + 1, 0, th[i]) + pam4.probAbove(i, 0, th[i]));
    expect(thresholdBer(pam4, 0, th)).toBeCloseTo(Math.max(...each) / 8, 15);
    expect(thresholdBer(nrz, 0, Float64Array.of(0))).toBeCloseTo(
      (nrz.probBelow(1, 0, 0) + nrz.probAbove(0, 0, 0)) / 2,
      15,
    );
  });

  it("log10 values are floored (an open noiseless eye has BER 0, JSON has no −Infinity)", () => {
    expect(log10Ber(0)).toBe(LOG10_BER_FLOOR);
    expect(log10Ber(1e-50)).toBe(LOG10_BER_FLOOR);
    expect(log10Ber(1e-3)).toBeCloseTo(-3, 12);
    const eye = statisticalEye(rectPulse(0.3, 8), { modulation: "nrz", noiseRms_V: 0 });
    expect(bathtub(eye, 0).log10Ber.every((v) => Number.isFinite(v))).toBe(true);
  });

  it("edges: fractional t0, bad span and bad BER throw", () => {
    const eye = statisticalEye(rectPulse(0.3, 8), { modulation: "nrz", noiseRms_V: 0.01 });
    expect(() => bathtub(eye, 0.5)).toThrow(/t0/);
    expect(() => bathtub(eye, 0, 0)).toThrow(/span_UI/);
    expect(() => eyeWidth(eye, 0, 0)).toThrow(/ber/);
  });
});
