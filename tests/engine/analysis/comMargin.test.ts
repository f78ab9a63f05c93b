// COM-style margin and the limiter: closed forms, an enumerated Ani, edges.
import { describe, expect, it } from "vitest";
import { berFromQ, qFromBer } from "@lib/analysis/ber";
import { comMargin } from "@lib/analysis/comMargin";
import { limiterHeadroom } from "@lib/analysis/limiterHeadroom";
import { limiterNoise } from "@lib/analysis/limiterNoise";
import { statisticalEye } from "@lib/analysis/statisticalEye";
import { cursorPulse } from "./helpers.ts";

describe("comMargin", () => {
  it("analytic: a clean NRZ pulse has As = A and Ani = Q(DER0)·σ, so COM = 20·log10(A/(Q(DER0)·σ)) (IEEE 802.3 Annex 93A form [memory]) [computed]", () => {
    const sigma = 0.01;
    const eye = statisticalEye(cursorPulse([0, 0.4, 0], 1), { modulation: "nrz", noiseRms_V: sigma });
    const c = comMargin(eye, 0, 1e-5);
    // Q(1e-5) = 4.26489 (the Gaussian tail, BER = ½·erfc(Q/√2)) [computed].
    expect(Math.abs(c.com_dB - 20 * Math.log10(0.4 / (4.26489 * sigma)))).toBeLessThan(1e-3);
    expect(c.as_V).toBeCloseTo(0.4, 15);
    expect(Math.abs(c.ani_V - qFromBer(1e-5) * sigma)).toBeLessThan(1e-3 * sigma);
  });

  it("oracle: with one post-cursor r, Ani is where ½Q((Ani − r)/σ) + ½Q((Ani + r)/σ) = DER0 (a level's tail, not a bit error ratio), by bisection [computed]", () => {
    const sigma = 0.006;
    const r = 0.0517;
    const eye = statisticalEye(cursorPulse([0, 0.4, r, 0], 1), { modulation: "nrz", noiseRms_V: sigma });
    const tail = (a: number) => 0.5 * berFromQ((a - r) / sigma) + 0.5 * berFromQ((a + r) / sigma);
    let lo = 0;
    let hi = 1;
    for (let i = 0; i < 100; i++) {
      const m = (lo + hi) / 2;
      if (tail(m) > 1e-5) lo = m;
      else hi = m;
    }
    const c = comMargin(eye, 0, 1e-5);
    expect(Math.abs(c.ani_V - lo)).toBeLessThan(5e-6);
    expect(Math.abs(c.com_dB - 20 * Math.log10(0.4 / lo))).toBeLessThan(1e-3);
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
