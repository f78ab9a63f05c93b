// Crosstalk in the statistical eye: asynchronous aggressors, each at its worst phase, convolved with
// the victim's ISI and noise, never cancelled by the DFE.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { eyeAnalysis } from "@lib/analysis/eyeAnalysis";
import { pulseFromLossModel } from "@lib/channel";
import { crosstalkParts, pulseFromCoupling } from "@lib/crosstalk";
import { createCtlePlan } from "@lib/equalizers";
import { scalePulse, trimPulse } from "@lib/pulse";
import type { Pulse } from "@lib/types";
import { cursorPulse } from "../analysis/helpers";

const spu = 8;
const ui = 1e-10;
/** A pulse with exactly the given samples (spu per UI), main cursor at `main`. */
const samples = (values: number[], main: number): Pulse => ({
  ui_s: ui,
  samplesPerUi: spu,
  values_V: Float64Array.from(values),
  mainIndex: main,
});
/** A crosstalk pulse whose samples `k·spu + phase` are `cursors[k]` and whose other samples are smaller. */
const aggressorAt = (cursors: number[], phase: number, leak = 0.3): Pulse => {
  const v = new Float64Array(cursors.length * spu);
  cursors.forEach((c, k) => {
    v[k * spu + phase] = c;
    if (phase > 0) v[k * spu + phase - 1] = leak * c;
  });
  return samples(Array.from(v), phase);
};
const base = { modulation: "nrz" as const, targetBer: 1e-12, policy: "max-height" as const };

describe("crosstalk in the statistical eye", () => {
  // [practice] the worst case of a two-point aggressor of cursor x: the victim's levels ±A move by ±|x|.
  it("analytic: one aggressor with a single cursor x lowers the noise-free NRZ eye by exactly 2|x|", () => {
    const A = 0.2;
    const victim = cursorPulse([0, A, 0], 1, spu, ui);
    for (const x of [0.003, -0.021, 0.05]) {
      const r = eyeAnalysis(victim, {
        ...base,
        noiseRms_V: 0,
        aggressors: [{ name: "x", pulse: aggressorAt([x], 3, 0) }],
      });
      expect(r.eyeHeightWithoutCrosstalk_V).toBeCloseTo(2 * A, 12);
      expect(r.eyeHeight_V).toBeCloseTo(2 * A - 2 * Math.abs(x), 9);
      expect(r.crosstalk!.rms_V).toBeCloseTo(Math.abs(x), 15);
    }
  });

  it("identity: the crosstalk rms is the root of the sampled pulse's energy (NRZ), powers adding over aggressors", () => {
    const a = aggressorAt([0.01, -0.004, 0.002], 5);
    const b = aggressorAt([0.006, 0.003], 2);
    const r = eyeAnalysis(cursorPulse([0.02, 0.3, 0.1, 0.03], 1, spu, ui), {
      ...base,
      noiseRms_V: 0.002,
      aggressors: [
        { name: "a", pulse: a },
        { name: "b", pulse: b },
      ],
    });
    const ea = 0.01 ** 2 + 0.004 ** 2 + 0.002 ** 2;
    const eb = 0.006 ** 2 + 0.003 ** 2;
    expect(r.crosstalk!.perAggressor.map((x) => x.rms_V)).toEqual(
      [Math.sqrt(ea), Math.sqrt(eb)].map((v) => expect.closeTo(v, 15)),
    );
    expect(r.crosstalk!.rms_V).toBeCloseTo(Math.sqrt(ea + eb), 15);
  });

  it("the worst-phase rule: the phase of largest Σ_k x(t + k·UI)² is used, and it closes the eye most [IEEE 802.3 Annex 93A, memory]", () => {
    // Phase 5 holds 0.02, 0.02 (energy 8e-4, Σ|x| 0.04); phase 4 holds 0.3× that (leak).
    const agg = aggressorAt([0.02, 0.02], 5);
    const s = crosstalkParts([{ name: "a", pulse: agg }], "nrz");
    expect(s.perAggressor[0].phase_UI).toBe(0); // its own peak phase
    expect(Array.from(s.parts_V)).toEqual([0.02, 0.02]);
    const victim = cursorPulse([0.05, 0.3, 0.12, -0.04], 1, spu, ui);
    const r = eyeAnalysis(victim, { ...base, noiseRms_V: 0.003, aggressors: [{ name: "a", pulse: agg }] });
    const at = (parts: number[]) =>
      eyeAnalysis(victim, { ...base, noiseRms_V: 0.003, extraParts_V: Float64Array.from(parts) }).eyeHeight_V;
    expect(r.eyeHeight_V).toBeCloseTo(at([0.02, 0.02]), 14);
    expect(r.eyeHeight_V).toBeLessThan(at([0.006, 0.006]));
  });

  it("no aggressors gives the old answer, field for field", () => {
    const victim = cursorPulse([0.03, 0.25, 0.1, 0.02], 1, spu, ui);
    const opts = { ...base, noiseRms_V: 0.002, jitter: { rjRms_UI: 0.01, djPp_UI: 0.04 }, dfeTaps: [0.05] };
    expect(eyeAnalysis(victim, { ...opts, aggressors: [] })).toEqual(eyeAnalysis(victim, opts));
  });

  it("the DFE never cancels crosstalk: DFE taps equal to the aggressor's cursors change nothing of its share", () => {
    const victim = cursorPulse([0, 0.3, 0, 0], 1, spu, ui);
    const agg = aggressorAt([0.04, 0.03, 0.02], 3, 0);
    const plain = eyeAnalysis(victim, { ...base, noiseRms_V: 0, aggressors: [{ name: "a", pulse: agg }] });
    expect(plain.eyeHeight_V).toBeCloseTo(0.6 - 2 * 0.09, 3); // the noise-free law's grid places the three parts to 0.2 mV
    const withDfe = eyeAnalysis(victim, {
      ...base,
      noiseRms_V: 0,
      dfeTaps: [0.03, 0.02],
      aggressors: [{ name: "a", pulse: agg }],
    });
    // The taps cancel nothing the victim has, so they become post-cursor ISI of their own: never better.
    expect(withDfe.eyeHeight_V).toBeLessThanOrEqual(plain.eyeHeight_V + 1e-12);
  });

  it("oracle: equals brute-force enumeration of every symbol pattern with Gaussian noise (victim 3 cursors, aggressor 3 cursors)", () => {
    const victimCursors = [0.04, 0.3, 0.09];
    const agg = [0.025, -0.012, 0.006];
    const sigma = 0.004;
    const victim = cursorPulse([...victimCursors, 0], 1, spu, ui);
    const r = eyeAnalysis(victim, {
      ...base,
      targetBer: 1e-9,
      policy: "centre",
      noiseRms_V: sigma,
      aggressors: [{ name: "a", pulse: aggressorAt(agg, 4, 0) }],
    });
    // The centre policy samples where p(t − ½) = p(t + ½); the oracle takes the cursors at that phase.
    const t = r.samplingPhase_UI;
    const at = (k: number) => {
      // Linear between the pulse's cursors (the helper's triangular shape).
      const x = k + t;
      const i = Math.floor(x);
      const f = x - i;
      const c = (j: number) => (j >= -1 && j <= 1 ? victimCursors[j + 1] : 0);
      return c(i) + f * (c(i + 1) - c(i));
    };
    const main = at(0);
    const isi = [at(-1), at(1), at(2)].filter((v) => v !== 0);
    const all = [...isi, ...agg];
    // P(main + Σ ± c_i + n < v), averaged over the 2^k patterns; the eye's bottom edge by bisection at
    // the conditional tail one NRZ edge carries at BER 1e-9: 2·BER (one BER convention, berConvention.ts).
    const erfcOracle = (x: number) => {
      // Abramowitz & Stegun 7.1.26 is too coarse in the tail; integrate the density instead.
      const n = 4000;
      const lo = x;
      const hi = x + 12;
      const h = (hi - lo) / n;
      let s = 0;
      for (let i = 0; i <= n; i++) s += (i === 0 || i === n ? 1 : i % 2 ? 4 : 2) * Math.exp(-((lo + i * h) ** 2));
      return ((2 / Math.sqrt(Math.PI)) * s * h) / 3;
    };
    const below = (v: number) => {
      let p = 0;
      for (let m = 0; m < 1 << all.length; m++) {
        let y = main;
        all.forEach((c, i) => (y += (m >> i) & 1 ? c : -c));
        p += 0.5 * erfcOracle((y - v) / (sigma * Math.SQRT2));
      }
      return p / (1 << all.length);
    };
    let lo = -0.5;
    let hi = main;
    for (let i = 0; i < 80; i++) {
      const mid = (lo + hi) / 2;
      if (below(mid) < 2e-9) lo = mid;
      else hi = mid;
    }
    expect(r.eyeHeight_V).toBeCloseTo(2 * lo, 4);
  });

  it("property: an added aggressor never raises the eye (fast-check, seed 17)", () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -0.06, max: 0.06, noNaN: true }), { minLength: 1, maxLength: 6 }),
        fc.array(fc.double({ min: -0.03, max: 0.03, noNaN: true }), { minLength: 1, maxLength: 6 }),
        fc.integer({ min: 0, max: spu - 1 }),
        fc.double({ min: 0.001, max: 0.01, noNaN: true }),
        fc.boolean(),
        (isi, xt, phase, sigma, jittered) => {
          const victim = cursorPulse([isi[0], 0.3, ...isi.slice(1)], 1, spu, ui);
          const opts = { ...base, noiseRms_V: sigma, jitter: jittered ? { rjRms_UI: 0.01, djPp_UI: 0.05 } : undefined };
          const without = eyeAnalysis(victim, opts).eyeHeight_V;
          const withXt = eyeAnalysis(victim, {
            ...opts,
            aggressors: [{ name: "a", pulse: aggressorAt(xt, phase) }],
          }).eyeHeight_V;
          return withXt <= without + 1e-9;
        },
      ),
      { seed: 17, numRuns: 40 },
    );
  });

  it("identity: lumping the aggressors' parts below σ/32 into the noise moves the eye by under 0.01 mV (8 aggressors through a CTLE)", () => {
    const baud = 28e9;
    const grid = { ui_s: 1 / baud, samplesPerUi: 32 };
    const ctle = { fz_Hz: baud / 2.5, fp1_Hz: baud / 2.5, fp2_Hz: baud, gDc_dB: -3 };
    const victim = trimPulse(
      scalePulse(createCtlePlan(pulseFromLossModel({ lossAtNyquist_dB: 8 }, grid).pulse).apply(ctle), 0.45),
      8,
      56,
    );
    const aggressors = Array.from({ length: 8 }, (_, k) => {
      const model =
        k % 2 === 0
          ? {
              kind: "next" as const,
              backwardCoefficient: 0.0015 * (1 + k / 4),
              line: { lossAtNyquist_dB: 1, delay_s: 0.2e-9 },
            }
          : {
              kind: "fext" as const,
              forwardCoupling_s: 0.3e-12 * (1 + k / 4),
              line: { lossAtNyquist_dB: 16, delay_s: 2e-9 },
            };
      return {
        name: `a${k}`,
        pulse: trimPulse(scalePulse(createCtlePlan(pulseFromCoupling(model, grid).pulse).apply(ctle), 0.45), 16, 48),
      };
    });
    const opts = { ...base, noiseRms_V: 0.002, jitter: { rjRms_UI: 0.01, djPp_UI: 0.05 } };
    const lumped = eyeAnalysis(victim, { ...opts, aggressors });
    const all = crosstalkParts(aggressors, "nrz"); // nothing lumped without noise
    expect(all.lumpedVariance_V2).toBe(0);
    const kept = crosstalkParts(aggressors, "nrz", 0.002);
    expect(kept.parts_V.length).toBeLessThan(all.parts_V.length / 4);
    const exact = eyeAnalysis(victim, { ...opts, extraParts_V: all.parts_V });
    expect(lumped.eyeHeight_V).toBeGreaterThan(0.01);
    expect(lumped.eyeHeight_V).toBeLessThan(lumped.eyeHeightWithoutCrosstalk_V! - 0.005);
    expect(Math.abs(lumped.eyeHeight_V - exact.eyeHeight_V)).toBeLessThan(1e-5);
  });

  it("edges: an aggressor on another grid is refused", () => {
    const victim = cursorPulse([0, 0.3, 0], 1, spu, ui);
    const other: Pulse = { ui_s: ui, samplesPerUi: 4, values_V: Float64Array.of(0.01, 0, 0, 0), mainIndex: 0 };
    expect(() =>
      eyeAnalysis(victim, { ...base, noiseRms_V: 0.001, aggressors: [{ name: "a", pulse: other }] }),
    ).toThrow(/aggressors\[0\]\.pulse/);
  });
});
