// Crosstalk benchmarks on the realistic benchmark case (the 25 dB, 28 GBd lane of engine-ii.bench.ts):
// the joint search with 4 aggressors (two NEXT, two FEXT, from the coupling model) against none, and
// the statistical eye of the 64-UI equalized pulse with 8 aggressors against none.
import { bench, describe } from "vitest";
import { statisticalEye } from "@lib/analysis/statisticalEye";
import { pulseFromLossModel } from "@lib/channel/lossModel";
import { crosstalkParts, type CouplingModel, type LinkAggressor, pulseFromCoupling } from "@lib/crosstalk";
import { applyFir } from "@lib/equalizers/applyFir";
import { createCtlePlan } from "@lib/equalizers/ctlePlan";
import { optimize } from "@lib/optimize/optimize";
import { scalePulse } from "@lib/pulse/scalePulse";
import { trimPulse } from "@lib/pulse/trimPulse";
import type { Pulse } from "@lib/types";

const BAUD = 28e9;
const grid = { ui_s: 1 / BAUD, samplesPerUi: 32 };
const channel = trimPulse(pulseFromLossModel({ lossAtNyquist_dB: 25 }, grid).pulse, 8, 56);
const ctle = { fz_Hz: BAUD / 2.5, fp1_Hz: BAUD / 2.5, fp2_Hz: BAUD, fLf_Hz: BAUD / 40 };
const budget = {
  modulation: "nrz" as const,
  txSwing_Vppd: 0.9,
  noiseRms_V: 0.002,
  limiterSensitivity_V: 0.01,
  targetBer: 1e-12,
  requiredHeadroom_V: 0.02,
  jitter: { rjRms_UI: 0.01, djPp_UI: 0.05 },
  tx: { pre: 1, post: 2, step: 0.02 },
  ctle: { ...ctle, gDc_dB: [-15, 0, 1] as [number, number, number], gDc2_dB: [-4, 0, 1] as [number, number, number] },
  dfe: { taps: 8, limits_V: [0.2, 0.1, 0.1, 0.1, 0.1, 0.1, 0.1, 0.1] },
};

/** Coupling-model aggressor k: NEXT over a short section for even k, FEXT along the lane for odd k. */
function coupling(k: number): CouplingModel {
  return k % 2 === 0
    ? { kind: "next", backwardCoefficient: 0.003 * (1 + k / 8), line: { lossAtNyquist_dB: 1, delay_s: 0.2e-9 } }
    : { kind: "fext", forwardCoupling_s: 0.6e-12 * (1 + k / 8), line: { lossAtNyquist_dB: 25, delay_s: 3.5e-9 } };
}
const crosstalkPulse = (k: number): Pulse => trimPulse(pulseFromCoupling(coupling(k), grid).pulse, 16, 48);
const four: LinkAggressor[] = [0, 1, 2, 3].map((k) => ({
  kind: coupling(k).kind,
  name: `aggressor ${k + 1}`,
  pulse: crosstalkPulse(k),
}));

// The eye: the benchmark's equalized pulse with DFE taps equal to its first post-cursors (an open
// eye), and 8 aggressors through the same CTLE at the same swing.
const ctleSetting = { ...ctle, gDc_dB: -6, gDc2_dB: -2 };
const equalized = trimPulse(
  scalePulse(applyFir(createCtlePlan(channel).apply(ctleSetting), [-0.06, 0.82, -0.12, 0], 1), 0.45),
  8,
  56,
);
const dfeTaps = [1, 2, 3, 4, 5, 6].map((k) => equalized.values_V[equalized.mainIndex + 32 * k]);
const eyeOptions = {
  modulation: "nrz" as const,
  noiseRms_V: 0.002,
  targetBer: 1e-12,
  jitter: { rjRms_UI: 0.01, djPp_UI: 0.05 },
  dfeTaps,
};
const eight = Array.from({ length: 8 }, (_, k) => ({
  name: `a${k}`,
  pulse: scalePulse(createCtlePlan(crosstalkPulse(k)).apply(ctleSetting), 0.45),
}));

const slow = { iterations: 3, warmupIterations: 1, time: 0, warmupTime: 0 };

describe("statistical eye of the 64-UI equalized pulse, NRZ, jitter, 6 DFE taps: one phase's eye height", () => {
  bench("no aggressors", () => {
    statisticalEye(equalized, eyeOptions).eyeHeight(0, 1e-12);
  });
  bench("8 aggressors (each at its worst phase, small parts lumped into the noise)", () => {
    const x = crosstalkParts(eight, "nrz", eyeOptions.noiseRms_V);
    statisticalEye(equalized, {
      ...eyeOptions,
      noiseRms_V: Math.sqrt(eyeOptions.noiseRms_V ** 2 + x.lumpedVariance_V2),
      extraParts_V: x.parts_V,
    }).eyeHeight(0, 1e-12);
  });
});

describe("joint optimizer: 16 × 5 CTLE × FIR 1 pre / 2 post at step 0.02 × 8 DFE taps, with jitter", () => {
  bench(
    "no aggressors",
    () => {
      optimize(channel, budget);
    },
    slow,
  );
  bench(
    "4 aggressors (2 NEXT, 2 FEXT)",
    () => {
      optimize(channel, budget, { aggressors: four });
    },
    slow,
  );
});
