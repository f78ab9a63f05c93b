// Convergence of the statistical eye on realistic channels of 250+ cursors: against the grid-refined
// limit (halving the step), against an independent converged computation (Laplace inversion, no
// grid, tailReference.ts), and against a Monte-Carlo of 10⁷ symbols. The lanes are the demo's
// synthetic backplane lanes (invented data) through the engine's own channel chain.
import { describe, expect, it } from "vitest";
import { eyeWidth } from "@lib/analysis/bathtub";
import { statisticalEye } from "@lib/analysis/statisticalEye";
import { pulseFromLossModel } from "@lib/channel/lossModel";
import { applyFir } from "@lib/equalizers/applyFir";
import { createCtlePlan } from "@lib/equalizers/ctlePlan";
import { scalePulse } from "@lib/pulse/scalePulse";
import { trimPulse } from "@lib/pulse/trimPulse";
import { seededRandom } from "@lib/signal/seededRandom";
import type { Pulse } from "@lib/types";
import { referenceQuantile, twoPointMagnitudes } from "./tailReference.ts";

/** A synthetic lane kept as the app stores it: 16 UI before the main cursor, 240 after, 32 samples/UI. */
function lane(loss_dB: number, delay_s: number, ui_s: number): Pulse {
  const p = pulseFromLossModel({ lossAtNyquist_dB: loss_dB, delay_s }, { ui_s, samplesPerUi: 32 }).pulse;
  return trimPulse(
    p,
    Math.min(16, Math.floor(p.mainIndex / 32)),
    Math.min(240, Math.floor((p.values_V.length - 1 - p.mainIndex) / 32)),
  );
}

/** The lane through a CTLE (Annex 93A form) and a transmit FIR at the swing's symbol amplitude. */
function equalize(
  p: Pulse,
  ctle: { gDc_dB: number; fz_Hz: number; fp2_Hz: number },
  taps: number[],
  amplitude_V: number,
): Pulse {
  const c = createCtlePlan(p).apply({
    fz_Hz: ctle.fz_Hz,
    fp1_Hz: ctle.fz_Hz,
    fp2_Hz: ctle.fp2_Hz,
    gDc_dB: ctle.gDc_dB,
    gDc2_dB: 0,
  });
  return scalePulse(applyFir(c, taps, 1), amplitude_V);
}

/** Main cursor and residual ISI (DFE taps subtracted) at a phase, read off the samples directly. */
function residualAt(p: Pulse, phase: number, dfe: number[]): { main: number; isi: number[] } {
  const spu = p.samplesPerUi;
  const at = p.mainIndex + phase;
  const isi: number[] = [];
  let main = 0;
  for (let i = at % spu; i < p.values_V.length; i += spu) {
    const k = (i - at) / spu;
    if (k === 0) main = p.values_V[i];
    else isi.push(k >= 1 && k <= dfe.length ? p.values_V[i] - dfe[k - 1] : p.values_V[i]);
  }
  return { main, isi };
}

const UI_28G = 1 / 28e9;
// The reported case: the demo's 27 in lane at 28 Gb/s NRZ, FIR [0, 0.55, −0.45, 0], CTLE 0 dB, 5 DFE
// taps, 1.5 mV noise, no jitter, sampled where the joint search puts it (−13 samples).
const lane27 = equalize(lane(28, 3.8e-9, UI_28G), { gDc_dB: 0, fz_Hz: 7e9, fp2_Hz: 28e9 }, [0, 0.55, -0.45, 0], 0.4);
const phase27 = -13;
const dfe27 = [1, 2, 3, 4, 5].map((k) => lane27.values_V[lane27.mainIndex + phase27 + k * 32]);

describe("statistical eye on realistic channels (250+ cursors)", () => {
  it("the reported 27 in lane: the engine's eye equals an independent converged eye (Laplace inversion) within 0.02 mV — 33.42 mV at a level tail of 1e-12 as in the report, 33.74 mV at BER 1e-12", () => {
    const sigma = 0.0015;
    const { main, isi } = residualAt(lane27, phase27, dfe27);
    expect(isi.length).toBeGreaterThanOrEqual(250);
    const eye = statisticalEye(lane27, { modulation: "nrz", noiseRms_V: sigma, dfeTaps: dfe27 });
    const m = twoPointMagnitudes(isi, "nrz");
    const atBer = 2 * (main + referenceQuantile(m, sigma, 2e-12)); // BER 1e-12: each edge's level tail is 2e-12
    const atTail = 2 * (main + referenceQuantile(m, sigma, 1e-12));
    expect(Math.abs(atTail - 0.03342)).toBeLessThan(1e-5); // the report's independent figure
    expect(Math.abs(eye.eyeHeight(phase27, 1e-12) - atBer)).toBeLessThan(2e-5);
    const e = eye.levelEdges(phase27, 1e-12);
    expect(Math.abs(e[1] - e[0] - atTail)).toBeLessThan(2e-5);
  }, 120_000);

  it("halving the grid step moves heights by < 0.05 mV and widths by < 0.005 UI (NRZ with and without jitter, PAM4), at the target and at 1e-6 … 1e-15", () => {
    const pam4Lane = equalize(
      lane(15, 1e-9, 2 / 106.25e9),
      { gDc_dB: -6, fz_Hz: 21.25e9, fp2_Hz: 53.125e9 },
      [-0.05, 0.8, -0.15],
      0.4,
    );
    const cases = [
      {
        pulse: lane27,
        options: { modulation: "nrz" as const, noiseRms_V: 0.0015, dfeTaps: dfe27, targetBer: 1e-12 },
        t: phase27,
      },
      {
        pulse: lane27,
        options: {
          modulation: "nrz" as const,
          noiseRms_V: 0.0015,
          dfeTaps: dfe27,
          targetBer: 1e-12,
          jitter: { rjRms_UI: 0.01, djPp_UI: 0.05 },
        },
        t: phase27,
      },
      { pulse: pam4Lane, options: { modulation: "pam4" as const, noiseRms_V: 0.001, targetBer: 1e-6 }, t: 0 },
    ];
    for (const c of cases) {
      const coarse = statisticalEye(c.pulse, c.options);
      const fine = statisticalEye(c.pulse, { ...c.options, refine: 2 });
      for (const ber of [c.options.targetBer, 1e-6, 1e-9, 1e-15]) {
        const a = coarse.eyeHeights(c.t, ber);
        const b = fine.eyeHeights(c.t, ber);
        a.forEach((h, i) => expect(Math.abs(h - b[i])).toBeLessThan(5e-5));
      }
      for (const ber of [c.options.targetBer, 1e-9]) {
        expect(Math.abs(eyeWidth(coarse, c.t, ber).eyeWidth_UI - eyeWidth(fine, c.t, ber).eyeWidth_UI)).toBeLessThan(
          0.005,
        );
      }
    }
  }, 240_000);

  it("contour heights (BER 1e-3 … 1e-15 at the sampling phase) are within 0.1 mV of the independent converged eye", () => {
    const sigma = 0.0015;
    const { main, isi } = residualAt(lane27, phase27, dfe27);
    const eye = statisticalEye(lane27, { modulation: "nrz", noiseRms_V: sigma, dfeTaps: dfe27 });
    const m = twoPointMagnitudes(isi, "nrz");
    for (const ber of [1e-3, 1e-6, 1e-9, 1e-15]) {
      const want = 2 * (main + referenceQuantile(m, sigma, 2 * ber));
      expect(Math.abs(eye.eyeHeight(phase27, ber) - want)).toBeLessThan(1e-4);
    }
  }, 120_000);

  it("Monte-Carlo, 10⁷ symbols (seed 7): at the eye's edges for BER 1e-4 the simulated bit error ratio is 1e-4 within its 4σ sampling error", () => {
    // The 27 in lane's 24 largest residual cursors (a Monte-Carlo of all 250 would take minutes).
    const sigma = 0.0015;
    const { main, isi } = residualAt(lane27, phase27, dfe27);
    const kept = isi
      .map((r, i) => ({ r, i }))
      .sort((a, b) => Math.abs(b.r) - Math.abs(a.r))
      .slice(0, 24)
      .map((x) => x.r);
    const pulseOf = (cursors: number[]): Pulse => {
      const values = new Float64Array(cursors.length + 1);
      values[0] = main;
      cursors.forEach((r, k) => (values[k + 1] = r));
      return { ui_s: UI_28G, samplesPerUi: 1, values_V: values, mainIndex: 0 };
    };
    const ber = 1e-4;
    const eye = statisticalEye(pulseOf(kept), { modulation: "nrz", noiseRms_V: sigma, targetBer: ber });
    const [bottom, top] = eye.eyeEdges(0, ber);
    const n = 10_000_000;
    const rng = seededRandom(7);
    const L = kept.length;
    const ring = new Float64Array(L);
    let errorsTop = 0;
    let errorsBottom = 0;
    for (let s = 0; s < n; s++) {
      const a = rng.uniform() < 0.5 ? -1 : 1;
      let y = a * main + sigma * rng.normal();
      for (let k = 0; k < L; k++) y += kept[k] * ring[(s - 1 - k + L * 2) % L];
      ring[s % L] = a;
      // A slicer at `top` errs on a +1 below it (and on a −1 above it, which never happens here).
      if (a > 0 && y < top) errorsTop++;
      if (a < 0 && y > bottom) errorsBottom++;
    }
    for (const errors of [errorsTop, errorsBottom]) {
      const measured = errors / n; // BER = ½·P(e | level) = errors over all symbols
      const sd = Math.sqrt(ber / n);
      expect(Math.abs(measured - ber)).toBeLessThan(4 * sd);
    }
  }, 240_000);
});
