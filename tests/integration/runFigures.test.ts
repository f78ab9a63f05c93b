// A computed run's figures, fetched through the API, recomputed independently: the chosen setting is
// re-applied to the run's own copy of the channel (CTLE by its FFT plan, the transmit FIR, the swing),
// the DFE taps and residual ISI read off the samples, and the eye height rebuilt by a converged
// reference that shares no code with the statistical eye (Laplace inversion, tests/engine/analysis/
// tailReference.ts). Tolerances are the issue's: heights within 0.1 mV.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { applyFir } from "@lib/equalizers/applyFir";
import { createCtlePlan } from "@lib/equalizers/ctlePlan";
import type { Budget } from "@lib/contract/budget";
import { pulseFromJson } from "@lib/pulse";
import type { TuningRunResult } from "@lib/run";
import { signIn, type Client } from "../support/http";
import { closeDb, finished, unique } from "../fixtures/workspace";
import { referenceQuantile, twoPointMagnitudes } from "../engine/analysis/tailReference.ts";

afterAll(closeDb);

let designer: Client;
let run: {
  inputs: { channel: { pulse: Parameters<typeof pulseFromJson>[0] }; budget: { params: Budget } };
  result: TuningRunResult;
};

beforeAll(async () => {
  designer = await signIn("designer");
  const lanes = await (await designer.get(`/api/v1/channels?q=${encodeURIComponent("Slot 11 lane 2")}`)).json();
  expect(lanes.items.length).toBeGreaterThan(0);
  // The reported case's budget: 28 Gb/s NRZ lane, 1.5 mV at the limiter (no front-end noise, no
  // jitter), three DFE taps with limits, BER 1e-12.
  const budget = await (
    await designer.send("POST", "/api/v1/budgets", {
      name: unique("Run figures"),
      modulation: "nrz",
      txSwing_Vppd: 0.8,
      noiseRms_V: 0.0015,
      limiterSensitivity_V: 0.015,
      requiredHeadroom_V: 0.005,
      targetBer: 1e-12,
      tx: { pre: 1, post: 1, step: 0.05 },
      ctle: { gDc_dB: [-8, 0, 2], fz_Hz: 7e9, fp1_Hz: 7e9, fp2_Hz: 28e9 },
      dfe: { taps: 3, limits_V: [0.1, 0.05, 0.02] },
    })
  ).json();
  const start = await (
    await designer.send("POST", "/api/v1/runs", { channelId: lanes.items[0].id, budgetId: budget.id })
  ).json();
  expect((await finished(designer, start.id, 240_000)).status).toBe("done");
  run = await (await designer.get(`/api/v1/runs/${start.id}`)).json();
}, 300_000);

describe("a run's figures, recomputed independently", () => {
  it("DFE taps, residual ISI, eye height and limiter headroom agree with the chosen setting re-applied to the run's channel copy", () => {
    const b = run.inputs.budget.params;
    const r = run.result;
    const m = r.metrics;
    const pulse = pulseFromJson(run.inputs.channel.pulse);
    const ctle = createCtlePlan(pulse).apply({
      fz_Hz: b.ctle.fz_Hz,
      fp1_Hz: b.ctle.fp1_Hz,
      fp2_Hz: b.ctle.fp2_Hz,
      gDc_dB: m.ctle.gDc_dB,
      gDc2_dB: m.ctle.gDc2_dB,
    });
    const eq = applyFir(ctle, Float64Array.from(m.txTaps), b.tx.pre);
    const spu = eq.samplesPerUi;
    const swing = b.txSwing_Vppd / 2;
    const at = eq.mainIndex + Math.round(r.optimize.samplingPhase_UI * spu);
    const main = swing * eq.values_V[at];

    // The DFE taps are the post-cursors at the sampling instant, clipped to their limits.
    const limits = b.dfe.limits_V as number[]; // given per tap in this test's budget
    const taps = limits.map((lim, k) => {
      const h = swing * eq.values_V[at + (k + 1) * spu];
      return Math.max(-lim, Math.min(lim, h));
    });
    taps.forEach((d, k) => expect(Math.abs(d - m.dfe.taps[k])).toBeLessThan(1e-6));

    // Residual ISI: every other symbol-spaced sample, the DFE's taps subtracted.
    const isi: number[] = [];
    for (let i = at % spu; i < eq.values_V.length; i += spu) {
      const k = (i - at) / spu;
      if (k === 0) continue;
      const h = swing * eq.values_V[i];
      isi.push(k >= 1 && k <= taps.length ? h - taps[k - 1] : h);
    }
    expect(isi.length).toBeGreaterThanOrEqual(250);
    const peak = isi.reduce((s, x) => s + Math.abs(x), 0);
    const rms = Math.sqrt(isi.reduce((s, x) => s + x * x, 0));
    expect(Math.abs(peak - m.residualIsiPeak_V)).toBeLessThan(1e-5);
    expect(Math.abs(rms - m.residualIsiRms_V)).toBeLessThan(1e-6);

    // Eye height at BER 1e-12: each NRZ edge is a level's tail of 2e-12 (the README's convention).
    expect(m.noiseRms_V).toBeCloseTo(0.0015, 12);
    const q = referenceQuantile(twoPointMagnitudes(isi, "nrz"), m.noiseRms_V, 2e-12);
    const height = Math.max(0, 2 * (main + q));
    expect(Math.abs(m.eyeHeight_V - height)).toBeLessThan(1e-4);
    expect(Math.abs(r.eyes.after.eyeHeight_V - height)).toBeLessThan(1e-4);
    expect(Math.abs(m.limiterHeadroom_V - (height - b.limiterSensitivity_V))).toBeLessThan(1e-4);

    // Error propagation is modelled for three NRZ taps and never lowers the BER.
    const p = r.optimize.errorPropagation;
    expect(p?.modelled).toBe(true);
    if (p?.modelled && p.factor !== null) expect(p.factor).toBeGreaterThanOrEqual(1);
    expect(r.verdict.reasons.some((s) => /error propagation/i.test(s))).toBe(true);
  }, 300_000);
});
