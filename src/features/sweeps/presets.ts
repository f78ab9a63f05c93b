// Corner presets offered when a sweep is defined: common sets of corners, each saying where its
// numbers come from — a habit of the trade with no single source, or a value recalled from memory
// (not re-read). Teams replace them with their own silicon's and boards' characterization.
import type { Corner } from "@lib/contract/corner";

/** Where a preset's numbers come from. */
export type PresetSource = { kind: "practice"; note: string } | { kind: "memory"; note: string };

export interface CornerPreset {
  key: string;
  label: string;
  description: string;
  source: PresetSource;
  corners: Corner[];
}

export const cornerPresets: CornerPreset[] = [
  {
    key: "loss-10",
    label: "Loss ±10 %",
    description:
      "Insertion loss 10 % below and above nominal: temperature and board-to-board spread of the laminate and copper.",
    source: {
      kind: "practice",
      note: "Common practice: a ±10 % guard band on insertion loss for temperature and manufacturing spread.",
    },
    corners: [{ name: "nominal" }, { name: "loss −10 %", lossScale: 0.9 }, { name: "loss +10 %", lossScale: 1.1 }],
  },
  {
    key: "hot-humid",
    label: "Hot and humid board",
    description: "Loss up 15 %: laminate loss grows with temperature and with absorbed moisture.",
    source: {
      kind: "memory",
      note: "From memory: laminate loss rises with temperature and with absorbed moisture; 15 % is a round figure to replace with your board's own measurements.",
    },
    corners: [{ name: "nominal" }, { name: "hot, humid", lossScale: 1.15 }],
  },
  {
    key: "tx-pv",
    label: "Transmitter and receiver, process and voltage",
    description: "Swing ±10 %, noise +20 %, limiter sensitivity +25 %: the silicon's spread at its voltage corners.",
    source: {
      kind: "memory",
      note: "From memory: SerDes data sheets give output swing within about ±10 %; noise and sensitivity margins of 20–25 % are usual design guard bands.",
    },
    corners: [
      { name: "nominal" },
      { name: "swing −10 %", txSwingScale: 0.9 },
      { name: "swing +10 %", txSwingScale: 1.1 },
      { name: "noise +20 %", noiseScale: 1.2 },
      { name: "sensitivity +25 %", sensitivityScale: 1.25 },
    ],
  },
  {
    key: "jitter",
    label: "Jitter +30 %",
    description: "Random and deterministic jitter 30 % above the budget's: a noisier reference clock or supply.",
    source: {
      kind: "practice",
      note: "Common practice: budgets are re-checked with jitter raised by a guard band of a few tens of percent.",
    },
    corners: [{ name: "nominal" }, { name: "jitter +30 %", jitterScale: 1.3 }],
  },
  {
    key: "slow-fast",
    label: "Slow and fast stacks",
    description:
      "Every unfavourable factor at once (loss +10 %, swing −10 %, noise +20 %, jitter +20 %, sensitivity +20 %), and the fast corner (loss −10 %, swing +10 %) that over-equalized defaults fail first.",
    source: {
      kind: "practice",
      note: "Common practice: stack the unfavourable corners together, and check the low-loss end for over-equalization.",
    },
    corners: [
      { name: "nominal" },
      { name: "slow", lossScale: 1.1, txSwingScale: 0.9, noiseScale: 1.2, jitterScale: 1.2, sensitivityScale: 1.2 },
      { name: "fast", lossScale: 0.9, txSwingScale: 1.1 },
    ],
  },
];

/** "common practice" or "from memory", for the form's label. */
export function sourceLabel(source: PresetSource): string {
  return source.kind === "practice" ? "common practice" : "from memory";
}
