// The optimizer end to end: the RC channel's closed forms, the noise-enhancement example driving the
// verdict, monotonicity, constraints (fast-check), reproducibility and edges.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { qFromBer } from "@lib/analysis/ber";
import { isLegalTxFir } from "@lib/equalizers/txFirConstraints";
import { equalizedCursors } from "@lib/optimize/ctleChannel";
import { nelderMead } from "@lib/optimize/nelderMead";
import { optimize } from "@lib/optimize/optimize";
import { prepareChannels } from "@lib/optimize/prepareChannels";
import { searchSpace } from "@lib/optimize/searchSpace";
import { flatCtle, rcPulse, stepwisePulse } from "./fixtures.ts";

const BER = 1e-12;

describe("first-order RC channel (cursors (1 − a)·a^k) [computed from the RC step response]", () => {
  it.each([0.3, 0.5, 0.7])(
    "a = %s: the 2-tap FIR [1, −a]/(1 + a) removes every post-cursor and leaves (1 − a)/(1 + a)",
    (a) => {
      const pulse = rcPulse(a);
      const space = searchSpace(pulse, {
        txSwing_Vppd: 2,
        noiseRms_V: 0,
        limiterSensitivity_V: 0,
        tx: { pre: 0, post: 1 },
        ctle: flatCtle(),
      });
      const ch = prepareChannels(pulse, space).channels[0];
      const taps = Float64Array.of(1 / (1 + a), -a / (1 + a));
      const g = equalizedCursors(ch, taps, 0, 0, 1);
      expect(g.h[g.main]).toBeCloseTo((1 - a) / (1 + a), 4); // the flat CTLE's far pole leaves < 1e-4
      for (let k = 1; k < 10; k++) expect(Math.abs(g.h[g.main + k])).toBeLessThan(1e-4);
    },
  );

  it.each([0.3, 0.5, 0.7])(
    "a = %s: the optimizer (continuous taps, no DFE) finds that FIR and the eye 2·s·(1 − a)/(1 + a) − 2·Q(2·BER)·σ",
    (a) => {
      const sigma = 1e-4;
      const r = optimize(rcPulse(a), {
        txSwing_Vppd: 1,
        noiseRms_V: sigma,
        limiterSensitivity_V: 0,
        tx: { pre: 0, post: 1 },
        ctle: flatCtle(),
        clocking: { policy: "max-height" },
      });
      expect(Math.abs(r.tx.taps[0] - 1 / (1 + a))).toBeLessThan(1e-3);
      expect(Math.abs(r.tx.taps[1] + a / (1 + a))).toBeLessThan(1e-3);
      expect(Math.abs(r.eye.eyeHeight_V - (2 * 0.5 * (1 - a)) / (1 + a) + 2 * qFromBer(2 * BER) * sigma)).toBeLessThan(
        2e-4,
      );
      expect(r.refinement).not.toBeNull();
    },
  );
});

describe("the noise-enhancement example (channel 1 + a·z⁻¹; Barry, Lee & Messerschmitt [memory]) drives the verdict", () => {
  const budget = (required: number) => ({
    txSwing_Vppd: 1,
    noiseRms_V: 0.01,
    limiterSensitivity_V: 0.01,
    requiredHeadroom_V: required,
    tx: { pre: 0, post: 3, step: 0.01 },
    ctle: flatCtle(),
    dfe: { taps: 2 },
  });
  it("a = 0.9: linear equalization falls short, one DFE tap closes the link, and the reasons say why", () => {
    const r = optimize(stepwisePulse([0, 0, 1, 0.9, 0, 0, 0, 0], 2), budget(0.3));
    expect(r.linearOnly.limiterHeadroom_V).toBeLessThan(0.3);
    expect(r.limiterHeadroom_V).toBeGreaterThanOrEqual(0.3);
    expect(r.verdict.linearReachExhausted).toBe(true);
    expect(r.verdict.fewestDfeTaps).toBe(1);
    expect(r.verdict.reasons.join(" ")).toMatch(/Noise floor/);
    expect(r.verdict.reasons.join(" ")).toMatch(/one tap reaches/);
    // The ideal DFE pays no enhancement: the eye is the clean one, 2·s·1 − 2·Q(2·BER)·σ (edge tail of an NRZ bit error ratio).
    expect(Math.abs(r.eye.eyeHeight_V - (1 - 2 * qFromBer(2 * BER) * 0.01))).toBeLessThan(1e-4);
  });

  it("a = 0.5 (1.249 dB of enhancement for a linear equalizer): linear equalization suffices", () => {
    const r = optimize(stepwisePulse([0, 0, 1, 0.5, 0, 0, 0, 0], 2), budget(0.3));
    expect(r.verdict.linearReachExhausted).toBe(false);
    expect(r.verdict.fewestDfeTaps).toBe(0);
  });

  it("no DFE budget can close a hopeless link: fewestDfeTaps is null", () => {
    const r = optimize(stepwisePulse([0, 0, 1, 0.9, 0, 0, 0, 0], 2), budget(0.99));
    expect(r.verdict.linearReachExhausted).toBe(false);
    expect(r.verdict.fewestDfeTaps).toBeNull();
    expect(r.verdict.reasons.join(" ")).toMatch(/does not close/);
  });
});

describe("monotonicity", () => {
  const pulse = stepwisePulse([0, 0.05, 1, 0.45, 0.25, 0.12, 0.06, 0.03, 0.01, 0], 2);
  const base = {
    txSwing_Vppd: 0.6,
    noiseRms_V: 0.004,
    limiterSensitivity_V: 0.01,
    tx: { pre: 1, post: 1, step: 0.05 },
    ctle: { gDc_dB: [-6, 0, 3] as [number, number, number], fz_Hz: 2e9, fp1_Hz: 2e9, fp2_Hz: 1e10 },
  };
  it("more DFE taps never lower the best headroom (beyond the eye's grid resolution)", () => {
    let prev = Number.NEGATIVE_INFINITY;
    for (let n = 0; n <= 4; n++) {
      const r = optimize(pulse, { ...base, dfe: { taps: n } });
      expect(r.limiterHeadroom_V).toBeGreaterThanOrEqual(prev - 2e-4);
      prev = r.limiterHeadroom_V;
    }
  });

  it("property: a larger noise never raises the best headroom (beyond the grid resolution)", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.001, max: 0.02, noNaN: true }),
        fc.double({ min: 1.1, max: 3, noNaN: true }),
        (s, f) => {
          const a = optimize(pulse, { ...base, noiseRms_V: s, dfe: { taps: 1 } });
          const b = optimize(pulse, { ...base, noiseRms_V: s * f, dfe: { taps: 1 } });
          return b.limiterHeadroom_V <= a.limiterHeadroom_V + 2e-4;
        },
      ),
      { seed: 11, numRuns: 8 },
    );
  });
});

describe("constraints and reproducibility", () => {
  const pulse = stepwisePulse([0, 0.08, 1, 0.5, 0.2, 0.1, 0.05, 0], 2);
  it("property: the result never breaks a constraint (FIR grid, ranges, Σ|c| ≤ 1, DFE limits, CTLE grid)", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 1 }),
        fc.integer({ min: 0, max: 2 }),
        fc.constantFrom(0.05, 0.1, 0.125),
        fc.double({ min: 0.2, max: 0.5, noNaN: true }),
        fc.integer({ min: 0, max: 3 }),
        fc.double({ min: 0.005, max: 0.2, noNaN: true }),
        fc.constantFrom("nrz" as const, "pam4" as const),
        (pre, post, step, sideMax, taps, limit, modulation) => {
          const ranges = Array.from({ length: pre + 1 + post }, (_, j) =>
            j === pre ? [0.3, 1] : [-sideMax, 0.05],
          ) as [number, number][];
          const budget = {
            modulation,
            txSwing_Vppd: 0.8,
            noiseRms_V: 0.003,
            limiterSensitivity_V: 0.01,
            tx: { pre, post, step, ranges },
            ctle: { gDc_dB: [-4, 0, 2] as [number, number, number], fz_Hz: 2e9, fp1_Hz: 2e9, fp2_Hz: 1e10 },
            dfe: { taps, limits_V: limit },
          };
          const r = optimize(pulse, budget);
          const spec = { pre, post, step, ranges };
          const within = (d: number[]) => d.every((x) => Math.abs(x) <= limit + 1e-12);
          return (
            isLegalTxFir(r.tx.taps, spec) &&
            isLegalTxFir(r.linearOnly.tx.taps, spec) &&
            r.dfe.taps.length === taps &&
            within(r.dfe.taps) &&
            r.linearOnly.dfe.taps.length === 0 &&
            [-4, -2, 0].includes(r.ctle.gDc_dB) &&
            Math.abs(r.limiterHeadroom_V - (r.eye.eyeHeight_V - 0.01)) < 1e-12 &&
            r.limiterHeadroom_V >= r.linearOnly.limiterHeadroom_V - 2e-4
          );
        },
      ),
      { seed: 2026, numRuns: 12 },
    );
  });

  it("the same request gives the same answer, bit for bit", () => {
    const budget = {
      txSwing_Vppd: 0.8,
      noiseRms_V: 0.003,
      limiterSensitivity_V: 0.01,
      jitter: { rjRms_UI: 0.01, djPp_UI: 0.05 },
      tx: { pre: 1, post: 1, step: 0.05 },
      ctle: { gDc_dB: [-6, 0, 2] as [number, number, number], fz_Hz: 2e9, fp1_Hz: 2e9, fp2_Hz: 1e10 },
      dfe: { taps: 2 },
    };
    expect(JSON.stringify(optimize(pulse, budget))).toBe(JSON.stringify(optimize(pulse, budget)));
  });

  it("reports progress from 0 to 1, non-decreasing", () => {
    const seen: number[] = [];
    optimize(
      pulse,
      {
        txSwing_Vppd: 0.8,
        noiseRms_V: 0.003,
        limiterSensitivity_V: 0.01,
        ctle: flatCtle(),
        tx: { pre: 0, post: 1, step: 0.1 },
      },
      {
        onProgress: (f) => seen.push(f),
      },
    );
    expect(seen[0]).toBe(0);
    expect(seen[seen.length - 1]).toBe(1);
    for (let i = 1; i < seen.length; i++) expect(seen[i]).toBeGreaterThanOrEqual(seen[i - 1]);
  });
});

describe("edges", () => {
  const pulse = stepwisePulse([0, 1, 0.3, 0], 1);
  it("an invalid budget throws a RangeError naming the field", () => {
    expect(() =>
      optimize(pulse, { txSwing_Vppd: -1, noiseRms_V: 0, limiterSensitivity_V: 0, ctle: flatCtle() }),
    ).toThrow(/budget\.txSwing_Vppd/);
    expect(() =>
      optimize(pulse, { txSwing_Vppd: 1, noiseRms_V: 0, limiterSensitivity_V: 0, ctle: flatCtle(), bitRate_bps: 5e9 }),
    ).toThrow(/budget\.bitRate_bps/);
  });

  it("nelderMead: minimizes a quadratic; rejects bad starts and non-finite objectives", () => {
    const r = nelderMead(([x, y]) => (x - 1) ** 2 + 3 * (y + 2) ** 2, [0, 0], { zeroDelta: 0.5 });
    expect(r.x[0]).toBeCloseTo(1, 3);
    expect(r.x[1]).toBeCloseTo(-2, 3);
    expect(() => nelderMead(() => 0, [])).toThrow(/x0/);
    expect(() => nelderMead(() => Number.NaN, [1])).toThrow(/objective/);
  });
});
