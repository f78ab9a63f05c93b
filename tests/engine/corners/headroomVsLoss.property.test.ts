// Property: a channel's limiter headroom never rises when its loss corner rises (synthetic lines and
// sampled pulses, random losses and factors, fixed seed). The receiver samples where the eye is
// highest (max-height), so the optimum over the grid is compared like for like; under a CDR policy
// (centre, Mueller–Müller) the lock phase sits on the sample grid and can step by one sample as the
// pulse changes, which moves the headroom by a few millivolts either way — a property of the lock
// point, not of the loss.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { pulseFromLossModel } from "@lib/channel";
import type { BudgetInput } from "@lib/contract";
import { cornerPulses, type CornerSource } from "@lib/corners";
import { optimize } from "@lib/optimize";

const grid = { ui_s: 1 / 28e9, samplesPerUi: 8 };
/** A small 28 Gb/s NRZ budget with jitter, so each joint search is cheap (≈ 0.1 s). */
const budget: BudgetInput = {
  modulation: "nrz",
  bitRate_bps: 28e9,
  txSwing_Vppd: 0.8,
  noiseRms_V: 0.0015,
  limiterSensitivity_V: 0.015,
  targetBer: 1e-12,
  jitter: { rjRms_UI: 0.01, djPp_UI: 0.05 },
  tx: { pre: 1, post: 1, step: 0.1 },
  ctle: { gDc_dB: [-12, 0, 3], fz_Hz: 7e9, fp1_Hz: 7e9, fp2_Hz: 28e9 },
  dfe: { taps: 2, limits_V: 0.1 },
  clocking: { scheme: "recovered", policy: "max-height" },
};

describe("headroom against the loss corner", () => {
  it("property: more loss never gives more headroom (24 random channel × factor pairs, seed 11)", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 3, max: 35, noNaN: true }),
        fc.double({ min: 0.7, max: 1.4, noNaN: true }),
        fc.double({ min: 0.005, max: 0.3, noNaN: true }),
        fc.constantFrom("loss-model", "pulse"),
        (loss_dB, s, ds, kind) => {
          const model = { lossAtNyquist_dB: loss_dB };
          const source: CornerSource =
            kind === "loss-model"
              ? { kind, model, grid }
              : { kind: "pulse", pulse: pulseFromLossModel(model, grid).pulse };
          const [less, more] = cornerPulses(source, [s, s + ds]);
          const headroom = (p: typeof less) => optimize(p, budget, { topCount: 1 }).limiterHeadroom_V;
          expect(headroom(more)).toBeLessThanOrEqual(headroom(less) + 1e-12);
        },
      ),
      { seed: 11, numRuns: 24 },
    );
  }, 60_000);
});
