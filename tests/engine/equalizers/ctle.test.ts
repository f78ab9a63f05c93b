// CTLE (IEEE 802.3 Annex 93A form): response table, plan applied to pulses, noise gain.
import { describe, expect, it } from "vitest";
import { createCtlePlan, ctleMagnitudeDb, ctleNoiseGain, ctleResponse, type CtleParams } from "@lib/equalizers";
import { pulseArea } from "@lib/pulse";
import type { Pulse } from "@lib/types";

const fb = 25.78125e9;
const bj = (gDc_dB: number): CtleParams => ({ gDc_dB, fz_Hz: fb / 4, fp1_Hz: fb / 4, fp2_Hz: fb });

/** Oracle: the formula with explicit complex numbers (test only). */
type C = [number, number];
const mul = (a: C, b: C): C => [a[0] * b[0] - a[1] * b[1], a[0] * b[1] + a[1] * b[0]];
const div = (a: C, b: C): C => {
  const d = b[0] * b[0] + b[1] * b[1];
  return [(a[0] * b[0] + a[1] * b[1]) / d, (a[1] * b[0] - a[0] * b[1]) / d];
};
const oracle = (p: CtleParams, f: number): C => {
  const g = 10 ** (p.gDc_dB / 20);
  const g2 = 10 ** ((p.gDc2_dB ?? 0) / 20);
  let num = mul([g, f / p.fz_Hz], [1, 0]);
  let den = mul([1, f / p.fp1_Hz], [1, f / p.fp2_Hz]);
  if (p.fLf_Hz !== undefined) {
    num = mul(num, [g2, f / p.fLf_Hz]);
    den = mul(den, [1, f / p.fLf_Hz]);
  }
  return div(num, den);
};

describe("ctleResponse", () => {
  // [computed] from IEEE 802.3 eq. 93A-22 (recalled, not re-read) with the 802.3bj parameters
  // fz = fp1 = fb/4, fp2 = fb; table in shared/references.md, tol 0.001 dB.
  it.each([
    [0, [0.0, -0.263, -0.969, -3.01]],
    [-6, [-6.0, -2.3, -1.674, -3.206]],
    [-12, [-12.0, -3.008, -1.87, -3.256]],
  ])("Annex 93A table, gDC = %i dB [computed from eq. 93A-22, memory]", (g, want) => {
    const got = ctleMagnitudeDb(bj(g), [0, fb / 4, fb / 2, fb]);
    want.forEach((w, i) => expect(Math.abs(got[i] - w)).toBeLessThan(0.001));
  });

  it("oracle: equals the formula evaluated with explicit complex arithmetic, two stages", () => {
    const p: CtleParams = { gDc_dB: -9, fz_Hz: 10e9, fp1_Hz: 12e9, fp2_Hz: 40e9, gDc2_dB: -3, fLf_Hz: 0.7e9 };
    const freqs = [0, 1e8, 7e8, 3e9, 14e9, 60e9];
    const got = ctleResponse(p, freqs);
    freqs.forEach((f, k) => {
      const [r, i] = oracle(p, f);
      expect(got.re[k]).toBeCloseTo(r, 13);
      expect(got.im[k]).toBeCloseTo(i, 13);
    });
  });

  it("identities: gDc2 = 0 equals one stage; DC gain is gDc + gDc2; high-frequency LF factor → 1", () => {
    const one = ctleMagnitudeDb(bj(-5), [1e9, 9e9]);
    const two = ctleMagnitudeDb({ ...bj(-5), gDc2_dB: 0, fLf_Hz: fb / 40 }, [1e9, 9e9]);
    expect(two[0]).toBeCloseTo(one[0], 12);
    expect(two[1]).toBeCloseTo(one[1], 12);
    const lf = { ...bj(-5), gDc2_dB: -4, fLf_Hz: fb / 40 };
    expect(ctleMagnitudeDb(lf, [0])[0]).toBeCloseTo(-9, 12);
    const far = ctleMagnitudeDb(lf, [1e15])[0] - ctleMagnitudeDb(bj(-5), [1e15])[0];
    expect(Math.abs(far)).toBeLessThan(1e-5);
  });

  it("edges: bad settings name their field", () => {
    expect(() => ctleResponse({ ...bj(0), fz_Hz: 0 }, [0])).toThrow(/fz_Hz/);
    expect(() => ctleResponse({ ...bj(Number.NaN) }, [0])).toThrow(/gDc_dB/);
    expect(() => ctleResponse({ ...bj(0), gDc2_dB: -3 }, [0])).toThrow(/fLf_Hz is required/);
    expect(() => ctleResponse({ ...bj(0), fLf_Hz: -1 }, [0])).toThrow(/fLf_Hz/);
    expect(() => ctleResponse(bj(0), [-1])).toThrow(/freqs_Hz\[0\]/);
  });
});

describe("createCtlePlan", () => {
  const spu = 64;
  const ui = 1 / fb;
  const rect: Pulse = {
    ui_s: ui,
    samplesPerUi: spu,
    values_V: (() => {
      const v = new Float64Array(8 * spu);
      v.fill(1, 2 * spu, 3 * spu);
      return v;
    })(),
    mainIndex: 2 * spu + spu / 2,
  };

  it("analytic: with fz = fp1 the CTLE is a first-order low-pass; a rectangle rises as 1 − e^(−t/τ) (tol 2 %)", () => {
    const fp = fb / 2;
    const tau = 1 / (2 * Math.PI * fp);
    // (1 + jf/fp)/((1 + jf/fp)(1 + jf/fp)) = 1/(1 + jf/fp): one pole, τ = 1/(2π·fp).
    const out = createCtlePlan(rect).apply({ gDc_dB: 0, fz_Hz: fp, fp1_Hz: fp, fp2_Hz: fp });
    const dt = ui / spu;
    for (const n of [8, 16, 32, 63]) {
      const t = (n + 0.5) * dt; // sample n of the rectangle stands for the interval around (n + ½)·dt
      const want = 1 - Math.exp(-t / tau);
      expect(Math.abs(out.values_V[2 * spu + n] - want)).toBeLessThan(0.02);
    }
  });

  it("identities: area scales by the DC gain; a far-out filter is the identity; the pulse is not mutated", () => {
    const plan = createCtlePlan(rect, { tail_UI: 64 });
    const before = Array.from(rect.values_V);
    const p = { gDc_dB: -7, fz_Hz: fb / 4, fp1_Hz: fb / 4, fp2_Hz: fb, gDc2_dB: -2, fLf_Hz: fb / 40 };
    const out = plan.apply(p);
    expect(pulseArea(out) / pulseArea(rect)).toBeCloseTo(10 ** (-9 / 20), 3);
    const id = plan.apply({ gDc_dB: 0, fz_Hz: 1e30, fp1_Hz: 1e30, fp2_Hz: 1e30 });
    for (let i = 0; i < rect.values_V.length; i++)
      expect(Math.abs(id.values_V[i] - rect.values_V[i])).toBeLessThan(1e-12);
    expect(out.values_V.length).toBe(rect.values_V.length + 64 * spu);
    expect(Array.from(rect.values_V)).toEqual(before);
    expect(plan.freqs_Hz[1]).toBeCloseTo(1 / (plan.freqs_Hz.length * 2 - 2) / (ui / spu), 0);
  });

  // The grids differ in length, so the discrete filters differ by the slowly decaying ringing of
  // H(f) cut at fs/2: agreement to 1e-6 of a 1 V pulse is what the method promises, not 1e-12.
  it("oracle: the plan matches the same filter on a much longer grid (reuse across settings, tol 1e-6)", () => {
    const plan = createCtlePlan(rect, { tail_UI: 8 });
    const big = createCtlePlan(rect, { tail_UI: 120 });
    for (const g of [0, -6, -12]) {
      const a = plan.apply(bj(g));
      const b = big.apply(bj(g));
      for (let i = 0; i < a.values_V.length; i++) expect(Math.abs(a.values_V[i] - b.values_V[i])).toBeLessThan(1e-6);
    }
  });

  it("edges: bad options and settings", () => {
    expect(() => createCtlePlan(rect, { tail_UI: -1 })).toThrow(/tail_UI/);
    expect(() => createCtlePlan(rect).apply({ ...bj(0), fp2_Hz: Number.NaN })).toThrow(/fp2_Hz/);
  });
});

describe("ctleNoiseGain", () => {
  it("analytic: a single pole gives (fp/B)·atan(B/fp)", () => {
    const fp = 10e9;
    const B = 25e9;
    const g = ctleNoiseGain({ gDc_dB: 0, fz_Hz: 5e9, fp1_Hz: 5e9, fp2_Hz: fp }, B);
    expect(g).toBeCloseTo((fp / B) * Math.atan(B / fp), 10);
  });
  it("identities: flat filter gives its gain squared; peaking raises the gain with the band", () => {
    expect(ctleNoiseGain({ gDc_dB: -6, fz_Hz: 1e30, fp1_Hz: 1e30, fp2_Hz: 1e30 }, 1e10)).toBeCloseTo(
      10 ** (-6 / 10),
      12,
    );
    const a = ctleNoiseGain(bj(-12), fb / 4);
    const b = ctleNoiseGain(bj(-12), fb / 2);
    expect(b).toBeGreaterThan(a);
  });
  it("edges: bad band and interval counts", () => {
    expect(() => ctleNoiseGain(bj(0), 0)).toThrow(/band_Hz/);
    expect(() => ctleNoiseGain(bj(0), 1e9, 3)).toThrow(/intervals/);
  });
});
