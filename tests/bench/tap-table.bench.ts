// The web app's heaviest job: a tap table of 4 classes over 24 channels, computed exactly as the
// worker pool computes a version (src/features/tapTables/tapTables.job.ts), in-process.
import { bench, describe } from "vitest";
import { deriveSynthetic } from "@/features/channels/derive";
import { budgetPresets } from "@/features/budgets/budgetPresets";
import { defaultRegisterMap } from "@/features/tapTables/registerMap";
import { computeTapTableVersion } from "@/features/tapTables/tapTables.job";
import type { VersionClass, VersionInputs } from "@/features/tapTables/tapTables";
import type { Architecture } from "@/features/studies/architecture";

const preset = budgetPresets.find((p) => p.key === "nrz28-backplane")!;
const edges_dB = [12, 18, 24];
/** 24 synthetic 28 Gb/s lanes from 6 to 29 dB at Nyquist, stored as the app stores them. */
const lanes = Array.from({ length: 24 }, (_, i) => {
  const loss_dB = 6 + i;
  const d = deriveSynthetic(28e9, "nrz", { lossAtNyquist_dB: loss_dB });
  return { id: i + 1, name: `lane ${i + 1}`, lossAtNyquist_dB: loss_dB, pulse: d.pulse };
});
const classes: VersionClass[] = [null, ...edges_dB].map((lo, k) => {
  const hi = edges_dB[k] ?? null;
  return {
    name: `class ${k + 1}`,
    lossRange_dB: [lo, hi],
    channels: lanes.filter(
      (l) => (lo === null || l.lossAtNyquist_dB >= lo) && (hi === null || l.lossAtNyquist_dB < hi),
    ),
  };
});

function inputs(architecture: Architecture): VersionInputs {
  return {
    budget: { id: 1, name: preset.name, params: preset.budget },
    architecture,
    study: null,
    registerMap: defaultRegisterMap(architecture, preset.budget),
    grouping: { mode: "loss-bins", edges_dB },
    classes,
  };
}

const own: Architecture = {
  key: "tx12-ctle-dfe5",
  label: "TX FIR 1/2 + CTLE + DFE 5",
  tx: { pre: 1, post: 2 },
  ctle: true,
  dfeTaps: 5,
  ffe: null,
};
const lighter: Architecture = {
  key: "tx11-ctle-dfe3",
  label: "TX FIR 1/1 + CTLE + DFE 3",
  tx: { pre: 1, post: 1 },
  ctle: true,
  dfeTaps: 3,
  ffe: null,
};

describe("tap table: 4 classes over 24 channels (28 Gb/s NRZ backplane budget)", () => {
  bench(
    "the budget's own architecture: TX FIR 1/2 at 1/40 + CTLE + DFE 5",
    () => void computeTapTableVersion(inputs(own), () => {}),
    { iterations: 1, warmupIterations: 0, time: 0 },
  );
  bench("TX FIR 1/1 + CTLE + DFE 3", () => void computeTapTableVersion(inputs(lighter), () => {}), {
    iterations: 1,
    warmupIterations: 0,
    time: 0,
  });
});
