// Sampling-phase policies and jitter tracking: closed forms on piecewise-linear pulses, an
// integration oracle for the tracking transfer, identities and edges.
import { describe, expect, it } from "vitest";
import { statisticalEye } from "@lib/analysis/statisticalEye";
import { defaultTrackingBandwidth, samplerJitter } from "@lib/clocking/jitterTransfer";
import { criterionPhase, defaultPhaseWindow, maxHeightPhase, samplingPhase } from "@lib/clocking/samplingPhase";
import { cursorPulse } from "../analysis/helpers.ts";

describe("sampling-phase policies", () => {
  // Pulse through cursors 0.1 (pre), 1 (main), 0.3 (post), linear in between.
  it("analytic: Mueller–Müller locks where h(−1) = h(+1): 0.1 + 0.9x = 0.3 − 0.3x → x = 1/6 UI", () => {
    const eye = statisticalEye(cursorPulse([0, 0.1, 1, 0.3, 0], 2, 12), { modulation: "nrz", noiseRms_V: 0.01 });
    expect(samplingPhase(eye, "mueller-muller", 1e-12)).toBe(2);
  });

  it("analytic: the centre (edge-locking) criterion p(t − ½) = p(t + ½): 0.55 + 0.9x = 0.65 − 0.7x → x = 1/16 UI", () => {
    const eye = statisticalEye(cursorPulse([0, 0.1, 1, 0.3, 0], 2, 16), { modulation: "nrz", noiseRms_V: 0.01 });
    expect(samplingPhase(eye, "centre", 1e-12)).toBe(1);
  });

  it("a symmetric pulse: every policy samples its peak", () => {
    const eye = statisticalEye(cursorPulse([0, 0.2, 0.8, 0.2, 0], 2, 16), { modulation: "nrz", noiseRms_V: 0.01 });
    for (const policy of ["centre", "max-height", "mueller-muller"] as const)
      expect(samplingPhase(eye, policy, 1e-12)).toBe(0);
  });

  it("identity: max-height returns the phase whose eye height is the window's maximum", () => {
    const eye = statisticalEye(cursorPulse([0, 0.15, 0.7, 0.35, 0.1, 0], 2, 16), {
      modulation: "nrz",
      noiseRms_V: 0.005,
    });
    const w = defaultPhaseWindow(16);
    const t = maxHeightPhase(eye, 1e-12, w);
    for (let p = w.lo; p <= w.hi; p++) expect(eye.eyeHeight(p, 1e-12)).toBeLessThanOrEqual(eye.eyeHeight(t, 1e-12));
  });

  it("edges: with no sign change the lock point is clamped to the window end; bad windows and policies throw", () => {
    // F(t) = e^(t−1) − e^(t+1) < 0 everywhere: sampling is early everywhere, so the high end.
    expect(criterionPhase(Math.exp, 1, { lo: -3, hi: 3 })).toBe(3);
    // F(t) = e^(−t+1) − e^(−t−1) > 0 everywhere: late everywhere, so the low end.
    expect(criterionPhase((t) => Math.exp(-t), 1, { lo: -3, hi: 3 })).toBe(-3);
    expect(() => criterionPhase((t) => t, 1, { lo: 2, hi: 1 })).toThrow(/window/);
    const eye = statisticalEye(cursorPulse([0, 1, 0], 1, 8), { modulation: "nrz", noiseRms_V: 0.01 });
    expect(() => samplingPhase(eye, "late" as "centre", 1e-12)).toThrow(/policy/);
    expect(() => defaultPhaseWindow(0)).toThrow(/samplesPerUi/);
  });
});

describe("samplerJitter", () => {
  const baud = 25e9;

  it("analytic: B = fN leaves √(1 − π/4) of white RJ; periodic DJ at f = B leaves 1/√2 [computed, first-order tracking]", () => {
    const j = samplerJitter({ rjRms_UI: 0.01, djPp_UI: 0.1, djFreq_Hz: 1e9 }, "forwarded", 1e9, 2e9);
    expect(j.rjFactor).toBeCloseTo(Math.sqrt(1 - Math.PI / 4), 12);
    expect(j.djFactor).toBeCloseTo(Math.SQRT1_2, 12);
    expect(j.rjRms_UI).toBeCloseTo(0.01 * j.rjFactor, 15);
  });

  it("oracle: the RJ factor equals √(mean of |1 − H|² over [0, fN]) by Simpson's rule (abs 1e-6)", () => {
    for (const B of [1e6, 1.5e7, 3e8, 5e9]) {
      const fN = baud / 2;
      const n = 20_000;
      const h = fN / n;
      const g = (f: number) => (f / B) ** 2 / (1 + (f / B) ** 2);
      let s = g(0) + g(fN);
      for (let i = 1; i < n; i++) s += (i % 2 === 1 ? 4 : 2) * g(i * h);
      const want = Math.sqrt((s * h) / 3 / fN);
      expect(
        Math.abs(samplerJitter({ rjRms_UI: 0.02, djPp_UI: 0 }, "recovered", B, baud).rjFactor - want),
      ).toBeLessThan(1e-6);
    }
  });

  it("identities: a wider tracking bandwidth never leaves more jitter; data-dependent DJ is never tracked", () => {
    let prev = Infinity;
    for (const B of [1e5, 1e6, 1e7, 1e8, 1e9]) {
      const j = samplerJitter({ rjRms_UI: 0.01, djPp_UI: 0.05 }, "recovered", B, baud);
      expect(j.rjRms_UI).toBeLessThanOrEqual(prev);
      expect(j.djPp_UI).toBe(0.05);
      prev = j.rjRms_UI;
    }
    // A CDR at baud/1667 tracks little of white RJ; a forwarded clock at baud/10 removes more of it.
    const rec = samplerJitter({ rjRms_UI: 0.01, djPp_UI: 0 }, "recovered", undefined, baud);
    const fwd = samplerJitter({ rjRms_UI: 0.01, djPp_UI: 0 }, "forwarded", undefined, baud);
    expect(rec.bandwidth_Hz).toBeCloseTo(baud / 1667, 6);
    expect(fwd.bandwidth_Hz).toBeCloseTo(baud / 10, 6);
    expect(fwd.rjRms_UI).toBeLessThan(rec.rjRms_UI);
    expect(rec.rjRms_UI).toBeGreaterThan(0.0099);
  });

  it("edges: no jitter gives zeros; bad scheme, bandwidth and baud throw naming the field", () => {
    const none = samplerJitter(undefined, "recovered", 1e6, baud);
    expect(none.rjRms_UI).toBe(0);
    expect(none.djPp_UI).toBe(0);
    expect(() => samplerJitter(undefined, "optical" as "recovered", 1e6, baud)).toThrow(/scheme/);
    expect(() => samplerJitter(undefined, "recovered", -1, baud)).toThrow(/bandwidth_Hz/);
    expect(() => samplerJitter(undefined, "recovered", 1e6, 0)).toThrow(/baud_Hz/);
    expect(() => samplerJitter({ rjRms_UI: 0, djPp_UI: 0.1, djFreq_Hz: 0 }, "recovered", 1e6, baud)).toThrow(
      /djFreq_Hz/,
    );
    expect(() => defaultTrackingBandwidth("recovered", Number.NaN)).toThrow(/baud_Hz/);
  });
});
