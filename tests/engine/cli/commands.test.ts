// Every command of the engine's command line answers per shared/engine-cli.md (in-process).
import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { formatTouchstone, lossModelS21, type NetworkData } from "@lib/channel";
import { runCommand } from "@lib/cli/runCommand";

const fixture = (name: string) => readFileSync(new URL(`../fixtures/${name}`, import.meta.url), "utf8");
// eslint-disable-next-line @typescript-eslint/no-explicit-any
const ok = (command: string, request: unknown): any => {
  const r = runCommand(command, JSON.stringify(request));
  if (r.exitCode !== 0) throw new Error(`exit ${r.exitCode}: ${r.text}`);
  return JSON.parse(r.text);
};
const areaOf = (p: { values_V: number[]; ui_s: number; samplesPerUi: number }) =>
  (p.values_V.reduce((s, v) => s + v, 0) * p.ui_s) / p.samplesPerUi;
const UI = 1 / 25.78125e9;

describe("pulse", () => {
  it("samples: a pulse, a step and an impulse response; values in V, mainIndex at the peak", () => {
    const rect = ok("pulse", {
      source: { kind: "samples", response: "pulse", dt_s: UI / 8, values: [0, 0, 1, 1, 1, 1, 1, 1, 1, 1, 0, 0] },
      ui_s: UI,
      samplesPerUi: 8,
    });
    expect(rect.samplesPerUi).toBe(8);
    expect(rect.values_V[rect.mainIndex]).toBe(1);
    expect(areaOf(rect) / UI).toBeCloseTo(1, 12);
    const step = ok("pulse", {
      source: { kind: "samples", response: "step", dt_s: UI / 4, values: [0, 0, 0.5, 1, 1, 1] },
      ui_s: UI,
      samplesPerUi: 4,
    });
    expect(Math.max(...step.values_V)).toBeCloseTo(1, 12);
    const imp = ok("pulse", {
      source: { kind: "samples", response: "impulse", dt_s: UI / 4, values: [0, 4 / UI, 0, 0, 0, 0] },
      ui_s: UI,
      samplesPerUi: 4,
    });
    expect(areaOf(imp) / UI).toBeCloseTo(1, 9);
  });

  it("csv: a step response file gives a pulse of unit area", () => {
    const r = ok("pulse", {
      source: { kind: "csv", response: "step", text: fixture("step-semicolon.csv") },
      ui_s: 20e-12,
      samplesPerUi: 8,
    });
    expect(areaOf(r) / 20e-12).toBeCloseTo(1, 9);
    expect(r.insertionLoss).toBeUndefined();
  });

  it("touchstone: a 2-port (S21) and a 4-port (SDD21, default and explicit pairs); area = |S21(0)|·ui_s within 1 %", () => {
    // A 2-port thru with 6 dB flat loss and 1 ns delay, 10 MHz … 40 GHz.
    const n = 4000;
    const f = Float64Array.from({ length: n }, (_, i) => 10e6 * (i + 1));
    const two: NetworkData = {
      ports: 2,
      freqs_Hz: f,
      s: new Float64Array(n * 8),
      referenceOhms: Float64Array.of(50, 50),
    };
    for (let k = 0; k < n; k++) {
      const a = -2 * Math.PI * f[k] * 1e-9;
      for (const at of [2, 4]) {
        two.s[k * 8 + at] = 0.5 * Math.cos(a);
        two.s[k * 8 + at + 1] = 0.5 * Math.sin(a);
      }
    }
    const r2 = ok("pulse", {
      source: { kind: "touchstone", text: formatTouchstone(two), format: "s2p" },
      ui_s: UI,
      samplesPerUi: 16,
    });
    expect(Math.abs(areaOf(r2) / (0.5 * UI) - 1)).toBeLessThan(0.01);
    expect(r2.insertionLoss.freqs_Hz.length).toBe(n);
    expect(r2.insertionLoss.magnitude_dB[0]).toBeCloseTo(-6.0206, 3);

    const r4 = ok("pulse", {
      source: { kind: "touchstone", text: fixture("four-port-v2.s4p"), format: "s4p" },
      ui_s: UI,
      samplesPerUi: 8,
    });
    expect(Math.abs(areaOf(r4) / (0.99 * UI) - 1)).toBeLessThan(0.02); // |SDD21(10 MHz)| ≈ 0.99, extrapolated to DC
    const swapped = ok("pulse", {
      source: { kind: "touchstone", text: fixture("four-port-v2.s4p"), pairs: { inP: 2, inN: 1, outP: 3, outN: 4 } },
      ui_s: UI,
      samplesPerUi: 8,
    });
    expect(areaOf(swapped)).toBeCloseTo(-areaOf(r4), 15);
  });

  it("touchstone: quality as in engine-cli.md — a clean 2-port passes with no warnings; the 4-port fixture stops at 10 GHz and is told so", () => {
    const n = 4000;
    const f = Float64Array.from({ length: n }, (_, i) => 10e6 * (i + 1));
    const two: NetworkData = {
      ports: 2,
      freqs_Hz: f,
      s: new Float64Array(n * 8),
      referenceOhms: Float64Array.of(50, 50),
    };
    for (let k = 0; k < n; k++) {
      for (const at of [2, 4]) {
        two.s[k * 8 + at] = 0.5 * Math.cos(-2 * Math.PI * f[k] * 1e-9);
        two.s[k * 8 + at + 1] = 0.5 * Math.sin(-2 * Math.PI * f[k] * 1e-9);
      }
    }
    const q = ok("pulse", {
      source: { kind: "touchstone", text: formatTouchstone(two), format: "s2p" },
      ui_s: UI,
      samplesPerUi: 16,
    }).quality;
    expect(q).toMatchObject({ passive: true, reciprocal: true, causal: true, warnings: [] });
    expect(q.maxSingularValue).toBeCloseTo(0.5, 9);
    expect(q.maxReciprocityError).toBe(0);
    expect(q.bandCoverage).toEqual({ fmax_Hz: 40e9, baudRatio: 40e9 * UI });
    expect(q.frequencyStep.df_Hz).toBeCloseTo(10e6, 3);
    expect(q.frequencyStep.maxDelay_s).toBeCloseTo(1e-7, 15);
    const q4 = ok("pulse", {
      source: { kind: "touchstone", text: fixture("four-port-v2.s4p"), format: "s4p" },
      ui_s: UI,
      samplesPerUi: 8,
    }).quality;
    expect(q4.bandCoverage.baudRatio).toBeCloseTo(10e9 * UI, 12);
    expect(q4.warnings.map((w: { code: string }) => w.code)).toContain("band-below-baud");
    const loss = ok("pulse", { source: { kind: "loss-model", lossAtNyquist_dB: 10 }, ui_s: UI, samplesPerUi: 8 });
    expect(loss.quality).toBeUndefined();
  });

  it("loss-model: the insertion loss reaches the asked loss at Nyquist; area UI within 1 %", () => {
    const r = ok("pulse", {
      source: { kind: "loss-model", lossAtNyquist_dB: 18, delay_s: 0.5e-9, skinFraction: 0.4 },
      ui_s: UI,
      samplesPerUi: 16,
      riseTime_s: 8e-12,
    });
    expect(Math.abs(areaOf(r) / UI - 1)).toBeLessThan(0.01);
    const nyq = lossModelS21([1 / (2 * UI)], { lossAtNyquist_dB: 18, skinFraction: 0.4 }, 1 / (2 * UI));
    expect(10 * Math.log10(nyq.re[0] ** 2 + nyq.im[0] ** 2)).toBeCloseTo(r.insertionLoss.magnitude_dB[100], 6);
    expect(r.start_s).toBeLessThan(0);
  });
});

describe("fir-response, ctle-response", () => {
  it("[practice] symmetric 3-tap FIR (−0.15, 0.7, −0.15): DC 0.4 (−7.96 dB), Nyquist 1.0 (0 dB), zero phase", () => {
    const r = ok("fir-response", { taps: [-0.15, 0.7, -0.15], pre: 1, ui_s: UI, freqs_Hz: [0, 1 / (2 * UI)] });
    expect(r.magnitude_dB[0]).toBeCloseTo(20 * Math.log10(0.4), 10);
    expect(r.magnitude_dB[1]).toBeCloseTo(0, 10);
    expect(r.phase_rad).toEqual([0, 0]);
    // An exact zero stays finite in JSON.
    const z = ok("fir-response", { taps: [0.5, 0.5], pre: 0, ui_s: UI, freqs_Hz: [1 / (2 * UI)] });
    expect(z.magnitude_dB[0]).toBeGreaterThanOrEqual(-400);
  });

  it("Annex 93A table gDC = −6 dB [computed from eq. 93A-22, memory] and the two-stage form", () => {
    const fb = 25.78125e9;
    const r = ok("ctle-response", {
      gDc_dB: -6,
      fz_Hz: fb / 4,
      fp1_Hz: fb / 4,
      fp2_Hz: fb,
      freqs_Hz: [0, fb / 4, fb / 2, fb],
    });
    [-6, -2.3, -1.674, -3.206].forEach((w, i) => expect(Math.abs(r.magnitude_dB[i] - w)).toBeLessThan(0.001));
    const two = ok("ctle-response", {
      gDc_dB: -6,
      fz_Hz: fb / 4,
      fp1_Hz: fb / 4,
      fp2_Hz: fb,
      gDc2_dB: -3,
      fLf_Hz: fb / 40,
      freqs_Hz: [0],
    });
    expect(two.magnitude_dB[0]).toBeCloseTo(-9, 10);
    const single = ok("ctle-response", {
      gDc_dB: -6,
      fz_Hz: fb / 4,
      fp1_Hz: fb / 4,
      fp2_Hz: fb,
      gDc2_dB: 0,
      freqs_Hz: [fb / 2],
    });
    expect(single.magnitude_dB[0]).toBeCloseTo(r.magnitude_dB[2], 12);
  });
});

describe("zf, mmse, lms", () => {
  it("zf: Sklar's example [source: Sklar, 2nd ed., ch. 3]; peak-swing normalization; least-squares window", () => {
    const r = ok("zf", { cursors: [0.0, 0.2, 0.9, -0.3, 0.1], main: 2, pre: 1, post: 1 });
    [-180 / 841, 810 / 841, 10 / 29].forEach((w, j) => expect(r.taps[j]).toBeCloseTo(w, 12));
    expect(r.equalized.length).toBe(7);
    expect(r.equalized[r.equalizedMain]).toBeCloseTo(1, 12);
    const ps = ok("zf", { cursors: [0.0, 0.2, 0.9, -0.3, 0.1], main: 2, pre: 1, post: 1, normalize: "peak-swing" });
    expect(ps.taps.reduce((s: number, c: number) => s + Math.abs(c), 0)).toBeCloseTo(1, 14);
    const ls = ok("zf", { cursors: [0.1, 1, 0.5, 0.2], main: 1, pre: 1, post: 2, window: { pre: 3, post: 6 } });
    expect(ls.equalized[ls.equalizedMain]).toBeCloseTo(1, 12);
  });

  it("mmse: taps and mse = 1 − g[main + pre] [textbook identity]", () => {
    const r = ok("mmse", { cursors: [0.05, 1, 0.4, -0.1], main: 1, pre: 1, post: 3, noiseRms_V: 0.05 });
    expect(r.taps.length).toBe(5);
    expect(r.mse).toBeCloseTo(1 - r.equalized[r.equalizedMain], 12);
  });

  it("lms: small mu ends near the mmse taps; trajectory every k iterations with its MSE", () => {
    const base = { cursors: [0.05, 1, 0.4, -0.1], main: 1, pre: 1, post: 3, noiseRms_V: 0.05 };
    const target = ok("mmse", base);
    const r = ok("lms", { ...base, mu: 0.003, iterations: 40000, seed: 5, variant: "lms", every: 400 });
    r.taps.forEach((c: number, j: number) => expect(Math.abs(c - target.taps[j])).toBeLessThan(0.02));
    expect(r.trajectory.length).toBe(101);
    expect(r.mse.length).toBe(101);
    expect(r.mse[100]).toBeLessThan(r.mse[0]);
    const ss = ok("lms", { ...base, mu: 1e-3, iterations: 2000, seed: 5, variant: "sign-sign" });
    expect(ss.trajectory.length).toBe(201); // default: about 200 records
  });
});

describe("prbs, ber", () => {
  it("prbs: PRBS9 begins 1111111110000011 [source: ITU-T O.150]; inverted; PRBS13 period 8191", () => {
    expect(ok("prbs", { order: 9, length: 16 }).bits).toBe("1111111110000011");
    expect(ok("prbs", { order: 7, length: 8, invert: true }).bits).toBe("00000001");
    const b = ok("prbs", { order: 13, length: 2 * 8191 }).bits as string;
    expect(b.slice(0, 8191)).toBe(b.slice(8191));
    expect(ok("prbs", { order: 31, length: 0 }).bits).toBe("");
  });

  it("ber: Q 7.0345 ↔ BER 1e-12 [computed, BER = ½·erfc(Q/√2)], extra fields ignored", () => {
    expect(Math.abs(ok("ber", { q: 7.0345 }).ber / 1e-12 - 1)).toBeLessThan(1e-3);
    expect(Math.abs(ok("ber", { ber: 1e-12, note: "ignored" }).q - 7.0345)).toBeLessThan(1e-4);
  });
});
