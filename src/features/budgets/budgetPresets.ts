// Starting points of the budget form: values typical of the trade for each kind of link, to be
// adjusted to the silicon at hand (the demo seeds two of them as its budgets).
import { budgetSchema, type Budget, type BudgetInput } from "@lib/contract/budget";

/** A starting point offered in the form. */
export interface BudgetPreset {
  key: string;
  name: string;
  description: string;
  budget: BudgetInput;
}

/**
 * Starting points: values typical of the trade for each kind of link, to be adjusted to the
 * silicon at hand. CTLE corners follow the Annex 93A habit of tying them to the baud rate.
 */
export const budgetPresets: BudgetPreset[] = [
  {
    key: "nrz28-backplane",
    name: "28 Gb/s NRZ backplane",
    description:
      "A long-reach NRZ backplane lane: 0.8 Vppd swing, 1-pre/2-post transmit FIR in 1/40 steps, a 0…−12 dB CTLE with corners at baud/4 and baud, and a 5-tap DFE.",
    budget: {
      modulation: "nrz",
      bitRate_bps: 28e9,
      txSwing_Vppd: 0.8,
      noiseRms_V: 0.0015,
      inputNoiseRms_V: 0,
      limiterSensitivity_V: 0.015,
      targetBer: 1e-12,
      requiredHeadroom_V: 0.005,
      jitter: { rjRms_UI: 0.01, djPp_UI: 0.05 },
      tx: { pre: 1, post: 2, step: 0.025 },
      ctle: { gDc_dB: [-12, 0, 1], fz_Hz: 7e9, fp1_Hz: 7e9, fp2_Hz: 28e9 },
      dfe: { taps: 5, limits_V: 0.1 },
      clocking: { scheme: "recovered", policy: "centre" },
    },
  },
  {
    key: "pam4-53-short",
    name: "53 GBd PAM4 short reach",
    description:
      "106.25 Gb/s PAM4 over a short chip-to-module trace: target BER 1e-6 ahead of FEC, a two-stage CTLE (corners at baud/2.5, baud and baud/40) and a 2-tap DFE.",
    budget: {
      modulation: "pam4",
      bitRate_bps: 106.25e9,
      txSwing_Vppd: 0.8,
      noiseRms_V: 0.001,
      inputNoiseRms_V: 0,
      limiterSensitivity_V: 0.01,
      targetBer: 1e-6,
      requiredHeadroom_V: 0.002,
      jitter: { rjRms_UI: 0.01, djPp_UI: 0.03 },
      tx: { pre: 1, post: 1, step: 0.05 },
      ctle: {
        gDc_dB: [-15, 0, 1],
        fz_Hz: 21.25e9,
        fp1_Hz: 21.25e9,
        fp2_Hz: 53.125e9,
        gDc2_dB: [-4, 0, 1],
        fLf_Hz: 1.328125e9,
      },
      dfe: { taps: 2, limits_V: 0.05 },
      clocking: { scheme: "recovered", policy: "centre" },
    },
  },
  {
    key: "nrz10-ctle",
    name: "10.3 Gb/s NRZ, CTLE only",
    description:
      "A chip-to-chip link with no DFE: transmit de-emphasis and a CTLE must do it all. Handy to see where linear reach ends.",
    budget: {
      modulation: "nrz",
      bitRate_bps: 10.3125e9,
      txSwing_Vppd: 1.0,
      noiseRms_V: 0.002,
      limiterSensitivity_V: 0.02,
      targetBer: 1e-12,
      requiredHeadroom_V: 0.01,
      jitter: { rjRms_UI: 0.015, djPp_UI: 0.1 },
      tx: { pre: 0, post: 1, step: 0.05 },
      ctle: { gDc_dB: [-9, 0, 1], fz_Hz: 2.578e9, fp1_Hz: 2.578e9, fp2_Hz: 10.3125e9 },
      dfe: { taps: 0 },
      clocking: { scheme: "recovered", policy: "centre" },
    },
  },
];

/** The first starting point, with defaults applied: what a new budget form shows. */
export function defaultBudget(): Budget {
  return budgetSchema.parse(budgetPresets[0].budget);
}
