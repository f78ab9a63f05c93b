// The CTLE grid by bilinearity against filtering each setting on its own (the CTLE plan).
import { describe, expect, it } from "vitest";
import { createCtlePlan } from "@lib/equalizers/ctlePlan";
import { ctleGridPulses } from "@lib/optimize/ctleGridPulses";
import { rcPulse } from "./fixtures.ts";

const ui = 1e-10;
const pulse = rcPulse(0.6, 16, 24, ui);
const twoStage = { fz_Hz: 0.4 / ui, fp1_Hz: 0.4 / ui, fp2_Hz: 1 / ui, fLf_Hz: 0.025 / ui };
const oneStage = { fz_Hz: 0.3 / ui, fp1_Hz: 0.5 / ui, fp2_Hz: 1.2 / ui };

describe("ctleGridPulses", () => {
  it("oracle: equals filtering each setting through the CTLE plan, within 1e-12 of the peak (two stages)", () => {
    const settings = [
      { gDc_dB: 0, gDc2_dB: 0 },
      { gDc_dB: -7, gDc2_dB: -2 },
      { gDc_dB: -15, gDc2_dB: -4 },
      { gDc_dB: -3.5, gDc2_dB: 0 },
    ];
    const grid = ctleGridPulses(pulse, twoStage, settings);
    const plan = createCtlePlan(pulse);
    settings.forEach((s, i) => {
      const want = plan.apply({ ...twoStage, ...s });
      const got = grid[i];
      expect(got.values_V.length).toBe(want.values_V.length);
      expect(got.mainIndex).toBe(want.mainIndex);
      expect(got.samplesPerUi).toBe(want.samplesPerUi);
      expect(got.ui_s).toBe(want.ui_s);
      const peak = Math.abs(want.values_V[want.mainIndex]);
      let worst = 0;
      for (let k = 0; k < want.values_V.length; k++)
        worst = Math.max(worst, Math.abs(got.values_V[k] - want.values_V[k]));
      expect(worst).toBeLessThan(1e-12 * peak);
    });
  });

  it("oracle: a single stage (no low-frequency corner) matches the plan too", () => {
    const settings = [
      { gDc_dB: 0, gDc2_dB: 0 },
      { gDc_dB: -9, gDc2_dB: 0 },
    ];
    const grid = ctleGridPulses(pulse, oneStage, settings);
    const plan = createCtlePlan(pulse);
    settings.forEach((s, i) => {
      const want = plan.apply({ ...oneStage, gDc_dB: s.gDc_dB });
      const peak = Math.abs(want.values_V[want.mainIndex]);
      for (let k = 0; k < want.values_V.length; k += 7)
        expect(Math.abs(grid[i].values_V[k] - want.values_V[k])).toBeLessThan(1e-12 * peak);
    });
  });

  it("identity: at a fixed second-stage gain every sample is affine in the linear gain g = 10^(gDc/20)", () => {
    const dbs = [-9, -4, 0];
    const g = dbs.map((db) => 10 ** (db / 20));
    const [x, y, z] = ctleGridPulses(
      pulse,
      twoStage,
      dbs.map((gDc_dB) => ({ gDc_dB, gDc2_dB: -3 })),
    );
    const peak = Math.abs(z.values_V[z.mainIndex]);
    for (let k = 0; k < x.values_V.length; k += 5) {
      const slope1 = (y.values_V[k] - x.values_V[k]) / (g[1] - g[0]);
      const slope2 = (z.values_V[k] - x.values_V[k]) / (g[2] - g[0]);
      expect(Math.abs(slope1 - slope2)).toBeLessThan(1e-11 * peak);
    }
  });

  it("edges: a second-stage gain without its corner, or a gain that is not finite, is refused by name", () => {
    expect(() => ctleGridPulses(pulse, oneStage, [{ gDc_dB: 0, gDc2_dB: -2 }])).toThrow(/fLf_Hz/);
    expect(() => ctleGridPulses(pulse, twoStage, [{ gDc_dB: Number.NaN, gDc2_dB: 0 }])).toThrow(/gDc_dB/);
    expect(() => ctleGridPulses(pulse, twoStage, [{ gDc_dB: 0, gDc2_dB: Number.POSITIVE_INFINITY }])).toThrow(
      /gDc2_dB/,
    );
    expect(ctleGridPulses(pulse, twoStage, [])).toEqual([]);
  });
});
