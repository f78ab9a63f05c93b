// COM-style margin and the limiter: the COM identity, closed forms, edges.
import { describe, expect, it } from "vitest";
import { qFromBer } from "@lib/analysis/ber";
import { comMargin } from "@lib/analysis/comMargin";
import { limiterHeadroom } from "@lib/analysis/limiterHeadroom";
import { limiterNoise } from "@lib/analysis/limiterNoise";
import { statisticalEye } from "@lib/analysis/statisticalEye";
import { cursorPulse } from "./helpers.ts";

describe("comMargin", () => {
  it("COM identity 20·log10(As/Ani) (IEEE 802.3 Annex 93A [memory]); clean NRZ pulse: Ani = Q(DER0)·σ [computed]", () => {
    const sigma = 0.01;
    const eye = statisticalEye(cursorPulse([0, 0.4, 0], 1), { modulation: "nrz", noiseRms_V: sigma });
    const c = comMargin(eye, 0, 1e-5);
    expect(c.com_dB).toBeCloseTo(20 * Math.log10(c.as_V / c.ani_V), 12);
    expect(c.as_V).toBeCloseTo(0.4, 15);
    expect(Math.abs(c.ani_V - qFromBer(1e-5) * sigma)).toBeLessThan(1e-3 * sigma);
  });

  it("PAM4: As is a third of the main cursor; ISI adds to Ani", () => {
    const clean = statisticalEye(cursorPulse([0, 0.45, 0], 1), { modulation: "pam4", noiseRms_V: 0.005 });
    expect(comMargin(clean, 0, 1e-4).as_V).toBeCloseTo(0.15, 15);
    const isi = statisticalEye(cursorPulse([0, 0.45, 0.05, 0], 1), { modulation: "pam4", noiseRms_V: 0.005 });
    expect(comMargin(isi, 0, 1e-4).ani_V).toBeGreaterThan(comMargin(clean, 0, 1e-4).ani_V);
  });

  it("edges: a noiseless clean pulse has no interference (unbounded COM); a non-positive main cursor throws", () => {
    const ideal = statisticalEye(cursorPulse([0, 0.4, 0], 1), { modulation: "nrz", noiseRms_V: 0 });
    expect(() => comMargin(ideal, 0, 1e-5)).toThrow(/unbounded/);
    const neg = statisticalEye(cursorPulse([0, -0.4, 0], 1), { modulation: "nrz", noiseRms_V: 0.01 });
    expect(() => comMargin(neg, 0, 1e-5)).toThrow(/main cursor/);
  });
});

describe("limiter", () => {
  it("headroom is eye height minus sensitivity; noise powers add with the CTLE's noise-power gain", () => {
    expect(limiterHeadroom(0.1, 0.015)).toBeCloseTo(0.085, 15);
    expect(limiterHeadroom(0, 0.01)).toBeCloseTo(-0.01, 15);
    expect(limiterNoise(0.003, 0.004, 1)).toBeCloseTo(0.005, 15);
    expect(limiterNoise(0.003, 0, 7)).toBe(0.003);
    expect(limiterNoise(0, 0.002, 0.25)).toBeCloseTo(0.001, 15);
  });

  it("edges: negative or non-finite inputs throw naming the parameter", () => {
    expect(() => limiterHeadroom(-1, 0)).toThrow(/eyeHeight_V/);
    expect(() => limiterHeadroom(0.1, Number.NaN)).toThrow(/limiterSensitivity_V/);
    expect(() => limiterNoise(0, -1, 1)).toThrow(/inputNoiseRms_V/);
    expect(() => limiterNoise(0, 0, Number.POSITIVE_INFINITY)).toThrow(/ctleNoisePowerGain/);
  });
});
