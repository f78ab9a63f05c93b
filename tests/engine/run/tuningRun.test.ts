// The tuning run: plain JSON, consistency with the optimizer, pictures on shared axes, adaptation;
// and the DFE adaptation on its own (convergence to the closed form, limits, edges).
import { describe, expect, it } from "vitest";
import { dfeAdaptation } from "@lib/run/dfeAdaptation";
import { ENGINE_VERSION } from "@lib/run/engineVersion";
import { tuningRun } from "@lib/run/tuningRun";
import { frontEndLoss_dB } from "@lib/package/frontEnd";
import { ANNEX_93A_PACKAGE } from "@lib/package";
import { pulseLoss_dB } from "@lib/pulse";
import { cursorPulse } from "../analysis/helpers.ts";

const pulse = cursorPulse([0, 0.05, 0.55, 0.3, 0.15, 0.07, 0.03, 0.01, 0], 2, 16);
const budget = {
  txSwing_Vppd: 0.8,
  noiseRms_V: 0.003,
  inputNoiseRms_V: 0.002,
  limiterSensitivity_V: 0.01,
  requiredHeadroom_V: 0.05,
  jitter: { rjRms_UI: 0.01, djPp_UI: 0.05 },
  tx: { pre: 1, post: 1, step: 0.05 },
  ctle: { gDc_dB: [-6, 0, 2] as [number, number, number], fz_Hz: 2e9, fp1_Hz: 2e9, fp2_Hz: 1e10 },
  dfe: { taps: 3, limits_V: [0.2, 0.1, 0.05] },
};

/** Every leaf of a JSON value is a finite number, a string, a boolean or null; no typed arrays. */
function plainJson(x: unknown, path = "result"): void {
  if (x === null || typeof x === "string" || typeof x === "boolean") return;
  if (typeof x === "number") {
    if (!Number.isFinite(x)) throw new Error(`${path} is ${x}`);
    return;
  }
  if (ArrayBuffer.isView(x)) throw new Error(`${path} is a typed array`);
  if (Array.isArray(x)) return x.forEach((v, i) => plainJson(v, `${path}[${i}]`));
  if (typeof x === "object") return Object.entries(x as object).forEach(([k, v]) => plainJson(v, `${path}.${k}`));
  throw new Error(`${path} has type ${typeof x}`);
}

describe("tuningRun", () => {
  const r = tuningRun(pulse, budget);

  it("is plain JSON (number arrays, no NaN or Infinity) and survives a round trip; carries the engine version", () => {
    plainJson(r);
    expect(JSON.parse(JSON.stringify(r))).toEqual(r);
    expect(r.engineVersion).toBe(ENGINE_VERSION);
    expect(JSON.stringify(r).length).toBeLessThan(400_000);
  });

  it("its metrics, eye and verdict are the optimizer's", () => {
    expect(r.metrics.eyeHeight_V).toBe(r.optimize.eye.eyeHeight_V);
    expect(r.metrics.limiterHeadroom_V).toBe(r.optimize.limiterHeadroom_V);
    expect(r.eyes.after.eyeHeight_V).toBe(r.optimize.eye.eyeHeight_V);
    expect(r.eyes.after.samplingPhase_UI).toBe(r.optimize.samplingPhase_UI);
    expect(r.verdict).toEqual(r.optimize.verdict);
    expect(r.metrics.dfe.taps.length).toBe(3);
    expect(r.metrics.residualIsiPeak_V).toBeGreaterThanOrEqual(r.metrics.residualIsiRms_V);
    expect(r.metrics.noiseRms_V).toBeGreaterThan(0.003);
  });

  it("pictures: 128 × 96 density images over ±1 UI with every folded point counted (spread by the eye's noise and jitter, rounded to 1/100 hit: within 0.1 %); contours at 1e-3 … 1e-15", () => {
    for (const e of [r.eyes.before, r.eyes.after]) {
      expect(e.image.width).toBe(128);
      expect(e.image.height).toBe(96);
      expect(e.image.counts.length).toBe(128 * 96);
      expect(e.image.time_UI[0]).toBeCloseTo(-1 + 1 / 128, 12);
      expect(Math.abs(e.image.counts.reduce((a, b) => a + b, 0) / (e.symbols.count * 128 * 4) - 1)).toBeLessThan(1e-3);
      expect(e.spread.noiseRms_V).toBeGreaterThan(0.003);
      expect(e.spread.rjRms_UI).toBeGreaterThan(0);
      expect(e.contours.map((c) => c.log10Ber)).toEqual([-3, -6, -9, -12, -15]);
    }
    // After equalization the 1e-12 contour encloses the sampling instant; before, the eye is smaller.
    expect(r.eyes.after.eyeHeight_V).toBeGreaterThan(r.eyes.before.eyeHeight_V);
    const c12 = r.eyes.after.contours.find((c) => c.log10Ber === -12);
    const near = (c12?.paths ?? [])
      .flat()
      .filter(([t]) => Math.abs(t) < 0.02)
      .map(([, v]) => v);
    expect(Math.max(...near) - Math.min(...near)).toBeGreaterThan(0.9 * r.eyes.after.eyeHeight_V);
  });

  it("bathtub around the sampling instant, lowest near it; pulses on a common axis", () => {
    const i0 = r.bathtub.phase_UI.findIndex((p) => Math.abs(p) < 1e-12);
    expect(i0).toBeGreaterThan(0);
    expect(Math.min(...r.bathtub.log10Ber)).toBeLessThanOrEqual(r.bathtub.log10Ber[i0] + 1e-9);
    expect(r.pulses.time_UI.length).toBe(r.pulses.before_V.length);
    expect(r.pulses.after_V.length).toBe(r.pulses.before_V.length);
    const at0 = r.pulses.time_UI.indexOf(0);
    expect(r.pulses.before_V[at0]).toBeCloseTo(0.4 * 0.55, 9);
  });

  it("adaptation: the DFE LMS ends near the closed-form taps; transmit training records each exchange", () => {
    const d = r.adaptation.dfe;
    expect(d).not.toBeNull();
    const last = d?.taps[d.taps.length - 1] ?? [];
    last.forEach((v, k) => expect(Math.abs(v - (d?.target[k] ?? 0))).toBeLessThan(0.01));
    expect(r.adaptation.txTraining.taps.length).toBe(r.adaptation.txTraining.objective.length);
  });

  it("reproducible: the same run gives the same JSON", () => {
    expect(JSON.stringify(tuningRun(pulse, budget))).toBe(JSON.stringify(r));
  });

  it("PAM4 and a budget without DFE: no DFE trajectory, three eyes' worth of contours", () => {
    const p4 = tuningRun(pulse, { ...budget, modulation: "pam4", dfe: { taps: 0 }, requiredHeadroom_V: 0 });
    expect(p4.adaptation.dfe).toBeNull();
    expect(p4.eyes.after.symbols.source).toMatch(/PRBS13/);
    plainJson(p4);
  });

  it("edges: a bad budget throws naming the field; progress goes 0 → 1", () => {
    expect(() => tuningRun(pulse, { ...budget, targetBer: 2 })).toThrow(/budget\.targetBer/);
    const seen: number[] = [];
    tuningRun(pulse, { ...budget, dfe: { taps: 0 } }, (f) => seen.push(f));
    expect(seen[0]).toBe(0);
    expect(seen[seen.length - 1]).toBe(1);
  });
});

describe("tuningRun with aggressors and packages", () => {
  const near = cursorPulse([0, 0.03, -0.02, 0.012, 0], 1, 16);
  const far = cursorPulse([0, 0.01, 0.025, -0.008, 0.004, 0], 2, 16);
  const withPackages = { ...budget, package: { tx: {}, rx: {} } };
  const r = tuningRun(pulse, withPackages, undefined, [
    { kind: "next", name: "Near", pulse: near },
    { kind: "fext", name: "Far", pulse: far },
  ]);

  it("carries the optimizer's crosstalk and draws the eye again without it: same symbols, its own contours and height", () => {
    plainJson(r);
    const x = r.crosstalk!;
    expect(x.perAggressor.map((a) => [a.name, a.kind])).toEqual([
      ["Near", "next"],
      ["Far", "fext"],
    ]);
    expect(x).toMatchObject(r.optimize.crosstalk!);
    expect(x.eyeWithout.eyeHeight_V).toBeCloseTo(x.eyeHeightWithoutCrosstalk_V, 12);
    expect(x.eyeWithout.eyeHeight_V).toBeGreaterThan(r.eyes.after.eyeHeight_V);
    // The same symbols folded on the same time axis (the victim's own); crosstalk shows in the contours.
    expect(x.eyeWithout.image.time_UI).toEqual(r.eyes.after.image.time_UI);
    expect(x.eyeWithout.symbols).toEqual(r.eyes.after.symbols);
    expect(tuningRun(pulse, budget).crosstalk).toBeNull();
  });

  it("loss at Nyquist: the channel's from its pulse, each package's from the front end; the packages' share of the sum", () => {
    const f = 1 / (2 * pulse.ui_s);
    const l = r.loss;
    expect(l.channelAtNyquist_dB).toBeCloseTo(pulseLoss_dB(pulse, f), 12);
    expect(l.txPackage_dB).toBeCloseTo(frontEndLoss_dB({ txPackage: ANNEX_93A_PACKAGE }, f), 9);
    expect(l.rxPackage_dB).toBeCloseTo(frontEndLoss_dB({ rxPackage: ANNEX_93A_PACKAGE }, f), 9);
    expect(l.rxFilter_dB).toBeNull();
    expect(l.packageShare).toBeCloseTo(
      (l.txPackage_dB! + l.rxPackage_dB!) / (l.channelAtNyquist_dB + l.txPackage_dB! + l.rxPackage_dB!),
      12,
    );
    expect(l.packageShare).toBeGreaterThan(0);
    expect(tuningRun(pulse, budget).loss.packageShare).toBeNull();
  });
});

describe("dfeAdaptation", () => {
  const cursors = { h: Float64Array.of(0.02, 0.5, 0.2, -0.08, 0.03), main: 1 };
  it("analytic: LMS converges to the post-cursors (0.2, −0.08, 0.03) [Haykin, LMS]", () => {
    const r = dfeAdaptation(cursors, {
      modulation: "nrz",
      taps: 3,
      limits_V: [1, 1, 1],
      noiseRms_V: 0.01,
      mu: 0.01,
      iterations: 20_000,
      seed: 3,
      variant: "lms",
    });
    [0.2, -0.08, 0.03].forEach((v, k) => expect(Math.abs(r.taps[k] - v)).toBeLessThan(0.005));
    expect(r.trajectory[0]).toEqual(new Float64Array(3));
    expect(r.iterationsAt[r.iterationsAt.length - 1]).toBe(20_000);
  });

  it("limits clip the taps (the closed form's clipping); sign-sign and PAM4 also converge", () => {
    const c = dfeAdaptation(cursors, {
      modulation: "nrz",
      taps: 2,
      limits_V: [0.1, 1],
      noiseRms_V: 0.01,
      mu: 0.01,
      iterations: 20_000,
      seed: 4,
      variant: "lms",
    });
    expect(c.taps[0]).toBeCloseTo(0.1, 12);
    const s = dfeAdaptation(cursors, {
      modulation: "pam4",
      taps: 2,
      limits_V: [1, 1],
      noiseRms_V: 0.005,
      mu: 0.0005,
      iterations: 20_000,
      seed: 5,
      variant: "sign-sign",
    });
    expect(Math.abs(s.taps[0] - 0.2)).toBeLessThan(0.01);
    expect(Math.abs(s.taps[1] + 0.08)).toBeLessThan(0.01);
  });

  it("edges: bad arguments throw naming them", () => {
    const base = {
      modulation: "nrz" as const,
      taps: 1,
      limits_V: [1],
      noiseRms_V: 0,
      mu: 0.01,
      iterations: 10,
      seed: 1,
      variant: "lms" as const,
    };
    expect(() => dfeAdaptation(cursors, { ...base, taps: 0 })).toThrow(/taps/);
    expect(() => dfeAdaptation(cursors, { ...base, mu: 0 })).toThrow(/mu/);
    expect(() => dfeAdaptation(cursors, { ...base, limits_V: [] })).toThrow(/limits_V/);
    expect(() => dfeAdaptation({ h: new Float64Array(0), main: 0 }, base)).toThrow(/cursors/);
    expect(() => dfeAdaptation(cursors, { ...base, variant: "zf" as "lms" })).toThrow(/variant/);
  });
});
