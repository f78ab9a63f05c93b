// Engine II benchmarks: the statistical eye of a 64-UI pulse at 32 samples/UI (NRZ and PAM4), the
// joint optimizer over a 16 × 5 CTLE grid × a 1-pre/2-post FIR at step 0.02 × 8 DFE taps (in-process
// and as a whole process through the command line), a PRBS15 time-domain eye at 32 samples/UI, and
// the minimax default over 24 channels.
import { spawnSync } from "node:child_process";
import { fileURLToPath } from "node:url";
import { bench, describe } from "vitest";
import { berMap } from "@lib/analysis/berMap";
import { densityEye } from "@lib/analysis/densityEye";
import { eyeAnalysis } from "@lib/analysis/eyeAnalysis";
import { statisticalEye } from "@lib/analysis/statisticalEye";
import { symbolStream } from "@lib/analysis/symbolStream";
import { pulseFromLossModel } from "@lib/channel/lossModel";
import { runCommand } from "@lib/cli/runCommand";
import { applyFir } from "@lib/equalizers/applyFir";
import { createCtlePlan } from "@lib/equalizers/ctlePlan";
import { optimize } from "@lib/optimize/optimize";
import { pulseToJson } from "@lib/pulse/pulseJson";
import { scalePulse } from "@lib/pulse/scalePulse";
import { trimPulse } from "@lib/pulse/trimPulse";
import { populationDefault } from "@lib/tapTables/populationDefault";
import type { Pulse } from "@lib/types";

const root = fileURLToPath(new URL("../..", import.meta.url));
const BAUD = 28e9;
const UI = 1 / BAUD;

/** A synthetic line of the given loss at Nyquist, cut to 64 UI (8 before the main cursor) at 32 samples/UI. */
function line(loss_dB: number, ui_s = UI): Pulse {
  return trimPulse(pulseFromLossModel({ lossAtNyquist_dB: loss_dB }, { ui_s, samplesPerUi: 32 }).pulse, 8, 56);
}

const channel = line(25);
const ctle = { fz_Hz: BAUD / 2.5, fp1_Hz: BAUD / 2.5, fp2_Hz: BAUD, fLf_Hz: BAUD / 40 };
/** The optimizer's benchmark budget: 16 × 5 CTLE grid, FIR 1 pre / 2 post at step 0.02, 8 DFE taps. */
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
const noJitter = { ...budget, jitter: undefined };

// An equalized 64-UI pulse (CTLE −6 dB, FIR [−0.06, 0.82, −0.12, 0]) at the swing, for the eyes.
const equalized = (() => {
  const p = createCtlePlan(channel).apply({ ...ctle, gDc_dB: -6, gDc2_dB: -2 });
  return trimPulse(scalePulse(applyFir(p, [-0.06, 0.82, -0.12, 0], 1), 0.45), 8, 56);
})();
const eyeOptions = {
  noiseRms_V: 0.002,
  targetBer: 1e-12,
  jitter: { rjRms_UI: 0.01, djPp_UI: 0.05 },
  dfeTaps: [0.05, 0.02],
};

const prbs15 = symbolStream("nrz", { kind: "prbs", order: 15 });

/** 24 channels from 8 to 30 dB at Nyquist, and a lighter budget for the class default. */
const population = Array.from({ length: 24 }, (_, i) => line(8 + (22 * i) / 23));
const populationBudget = {
  ...budget,
  tx: { pre: 1, post: 1, step: 0.05 },
  ctle: { ...ctle, gDc_dB: [-12, 0, 3] as [number, number, number], gDc2_dB: [-3, 0, 3] as [number, number, number] },
  dfe: { taps: 4, limits_V: [0.2, 0.1, 0.1, 0.1] },
};

const optimizeRequest = JSON.stringify({ pulse: pulseToJson(channel), budget });
const optimizeNoJitterRequest = JSON.stringify({ pulse: pulseToJson(channel), budget: noJitter });

/** Spawns the command line exactly as a user would and checks it answered. */
function engine(command: string, input: string): void {
  const r = spawnSync("npm", ["run", "--silent", "engine", "--", command], { cwd: root, input, maxBuffer: 1 << 28 });
  if (r.status !== 0) throw new Error(`engine ${command} exited ${r.status}: ${String(r.stdout).slice(0, 300)}`);
}

const slow = { iterations: 3, warmupIterations: 1, time: 0, warmupTime: 0 };
const once = { iterations: 1, warmupIterations: 0, time: 0, warmupTime: 0 };

describe("statistical eye of a 64-UI pulse at 32 samples/UI (jitter RJ 0.01 / DJ 0.05 UI, 2 DFE taps)", () => {
  bench("NRZ: sampling phase (max height), eye height, eye width, bathtub", () => {
    eyeAnalysis(equalized, { ...eyeOptions, modulation: "nrz" });
  });
  bench("PAM4: sampling phase (max height), eye heights, eye width, bathtub", () => {
    eyeAnalysis(equalized, { ...eyeOptions, modulation: "pam4" });
  });
  bench("NRZ: eye height at one phase (the optimizer's unit of work)", () => {
    statisticalEye(equalized, { ...eyeOptions, modulation: "nrz" }).eyeHeight(0, 1e-12);
  });
  bench("NRZ: BER map 128 × 96 for the contours", () => {
    const eye = statisticalEye(equalized, { ...eyeOptions, modulation: "nrz" });
    const phases = Float64Array.from({ length: 128 }, (_, i) => (-1 + (2 * (i + 0.5)) / 128) * 32);
    const volts = Float64Array.from({ length: 96 }, (_, i) => 0.3 - (0.6 * (i + 0.5)) / 96);
    berMap(eye, phases, volts);
  });
});

describe("joint optimizer: 16 × 5 CTLE × FIR 1 pre / 2 post at step 0.02 × 8 DFE taps (verdict included)", () => {
  bench(
    "in-process: optimize (jitter RJ 0.01 / DJ 0.05 UI)",
    () => {
      optimize(channel, budget);
    },
    slow,
  );
  bench(
    "in-process: optimize (no jitter)",
    () => {
      optimize(channel, noJitter);
    },
    slow,
  );
  bench(
    "in-process: runCommand('optimize') incl. JSON",
    () => {
      runCommand("optimize", optimizeRequest);
    },
    slow,
  );
  bench("whole process: npm run --silent engine -- optimize (jitter)", () => engine("optimize", optimizeRequest), slow);
  bench(
    "whole process: npm run --silent engine -- optimize (no jitter)",
    () => engine("optimize", optimizeNoJitterRequest),
    slow,
  );
});

describe("time-domain eye: PRBS15 (32767 symbols) through a 64-UI pulse at 32 samples/UI", () => {
  bench(
    "density eye 128 × 96",
    () => {
      densityEye(equalized, prbs15, { width: 128, height: 96 });
    },
    slow,
  );
});

describe("population default (minimax) over 24 channels, 8 … 30 dB (4 × 2 CTLE × FIR 1/1 at 0.05 × 4 DFE taps)", () => {
  bench(
    "in-process: populationDefault incl. each channel's own optimum",
    () => {
      populationDefault(population, populationBudget);
    },
    once,
  );
});
