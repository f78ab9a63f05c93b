// The demo scenario (invented): Quillfeather Systems' QL-48 line card, whose lanes cross the
// Brackenridge backplane to the switch card, plus the module cage's PAM4 lanes. Channels from
// short to very long reach, two budgets, and the tuning runs that the seed computes.
import { budgetPresets } from "@/features/budgets/budgetPresets";
import type { AggressorSpec } from "@/features/channels/aggressors";
import type { Modulation } from "@lib/types";
import type { NeighbourCoupling } from "./laneBundleTouchstone";

export const DEMO_PROGRAM = {
  name: "QL-48 line card · Brackenridge backplane",
  description:
    "Quillfeather Systems' 48-port line card: 28 Gb/s NRZ lanes across the Brackenridge backplane to the switch card, and 106.25 Gb/s PAM4 lanes to the front module cage.",
};

export interface DemoChannel {
  name: string;
  bitRate_bps: number;
  modulation: Modulation;
  lossAtNyquist_dB: number;
  delay_s: number;
  /** Delivered as a generated Touchstone 4-port file (kept as the channel's original) instead of a loss model. */
  touchstone?: { filename: string };
  /**
   * Delivered as a generated multi-port file of the lane and its neighbours (see
   * laneBundleTouchstone): the victim is lane 0 (ports 1,2 → 7,8 of a 12-port file) and the
   * aggressors are pairs of the same file.
   */
  bundle?: { filename: string; neighbours: NeighbourCoupling[]; aggressors: AggressorSpec[] };
}

/** A short section of parallel routing near the connector, where the neighbours couple backward. */
const CONNECTOR_SECTION = { lossAtNyquist_dB: 1, delay_s: 0.25e-9 };
const SLOT9_LINE = { lossAtNyquist_dB: 24, delay_s: 3.3e-9 };

export const DEMO_CHANNELS: DemoChannel[] = [
  {
    name: "Slot 2 lane 0 · 5 in to the switch card",
    bitRate_bps: 28e9,
    modulation: "nrz",
    lossAtNyquist_dB: 6,
    delay_s: 0.8e-9,
  },
  { name: "Slot 5 lane 1 · 11 in", bitRate_bps: 28e9, modulation: "nrz", lossAtNyquist_dB: 13, delay_s: 1.6e-9 },
  {
    name: "Slot 8 lane 3 · 19 in, two connectors",
    bitRate_bps: 28e9,
    modulation: "nrz",
    lossAtNyquist_dB: 21,
    delay_s: 2.7e-9,
    touchstone: { filename: "brackenridge-slot8-lane3.s4p" },
  },
  { name: "Slot 11 lane 2 · 27 in", bitRate_bps: 28e9, modulation: "nrz", lossAtNyquist_dB: 28, delay_s: 3.8e-9 },
  {
    name: "Slot 14 lane 0 · 36 in, far corner",
    bitRate_bps: 28e9,
    modulation: "nrz",
    lossAtNyquist_dB: 38,
    delay_s: 5.0e-9,
  },
  {
    name: "Cage port 3 · 4 in to the module",
    bitRate_bps: 106.25e9,
    modulation: "pam4",
    lossAtNyquist_dB: 9,
    delay_s: 0.6e-9,
  },
  {
    name: "Cage port 11 · 7 in to the module",
    bitRate_bps: 106.25e9,
    modulation: "pam4",
    lossAtNyquist_dB: 15,
    delay_s: 1.0e-9,
  },
  {
    // Closes without its neighbours; with them (lane 1 running the other way, lane 3 the same way)
    // the crosstalk takes the headroom below the budget's requirement.
    name: "Slot 9 lane 2 · 24 in, between lanes 1 and 3",
    bitRate_bps: 28e9,
    modulation: "nrz",
    lossAtNyquist_dB: SLOT9_LINE.lossAtNyquist_dB,
    delay_s: SLOT9_LINE.delay_s,
    bundle: {
      filename: "brackenridge-slot9-lanes1-3.s12p",
      neighbours: [
        {
          next: { backwardCoefficient: 0.013, line: CONNECTOR_SECTION },
          fext: { forwardCoupling_s: 2e-12, line: SLOT9_LINE },
        },
        {
          next: { backwardCoefficient: 0.004, line: CONNECTOR_SECTION },
          fext: { forwardCoupling_s: 2e-12, line: SLOT9_LINE },
        },
      ],
      aggressors: [
        { source: "ports", kind: "next", p: 9, n: 10, name: "Lane 1 (opposite direction), NEXT" },
        { source: "ports", kind: "fext", p: 5, n: 6, name: "Lane 3 (same direction), FEXT" },
      ],
    },
  },
];

/** The two demo budgets: the NRZ backplane and the PAM4 short-reach starting points. */
export const DEMO_BUDGETS = budgetPresets.filter((p) => p.key === "nrz28-backplane" || p.key === "pam4-53-short");

/**
 * Which channel runs against which budget in the seed (by name): a short lane (all clear), the
 * Touchstone lane, a long lane where linear reach is exhausted, a PAM4 lane, and the lane that
 * closes only when its crosstalk is ignored. The far-corner lane is left for people to try (the
 * search takes the longest there).
 */
export const DEMO_RUNS: { channel: string; budget: string }[] = [
  { channel: DEMO_CHANNELS[0].name, budget: DEMO_BUDGETS[0].name },
  { channel: DEMO_CHANNELS[2].name, budget: DEMO_BUDGETS[0].name },
  { channel: DEMO_CHANNELS[3].name, budget: DEMO_BUDGETS[0].name },
  { channel: DEMO_CHANNELS[5].name, budget: DEMO_BUDGETS[1].name },
  { channel: DEMO_CHANNELS[7].name, budget: DEMO_BUDGETS[0].name },
];
