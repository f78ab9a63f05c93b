// The link budget: what a tuning run is asked to achieve and with which equalizers. The command
// line's `optimize` request, the web API and the budget form all use this one schema.
import { z } from "zod";
import { DEFAULT_SAMPLING_POLICY } from "../clocking/samplingPhase.ts";
import {
  finiteNumber,
  modulationSchema,
  nonNegativeInt,
  nonNegativeNumber,
  positiveNumber,
  samplingPolicySchema,
} from "./common.ts";
import { ffeSchema, frontEndSchema, packagesSchema } from "./frontEnd.ts";

/** Largest number of settings one CTLE grid axis may hold. */
export const MAX_GRID_POINTS = 512;

/** A grid `[min, max, step]` in dB: `min, min + step, …` up to `max`. */
export const dbGridSchema = z
  .tuple([finiteNumber, finiteNumber, positiveNumber], {
    error: "expected a grid [min, max, step] in dB, e.g. [-12, 0, 1]",
  })
  .superRefine(([min, max, step], ctx) => {
    if (min > max) ctx.addIssue({ code: "custom", message: `min (${min}) must not exceed max (${max})` });
    else if ((max - min) / step + 1 > MAX_GRID_POINTS + 1e-9) {
      ctx.addIssue({
        code: "custom",
        message: `the grid has more than ${MAX_GRID_POINTS} points; use a larger step than ${step} dB`,
      });
    }
  });

/** Values of a `[min, max, step]` grid (the last point may fall short of max by less than a step). */
export function gridValues([min, max, step]: readonly [number, number, number]): number[] {
  const n = Math.floor((max - min) / step + 1e-9) + 1;
  return Array.from({ length: n }, (_, i) => Math.round((min + i * step) * 1e12) / 1e12);
}

const rangeSchema = z
  .tuple([finiteNumber.min(-1).max(1), finiteNumber.min(-1).max(1)], {
    error: "expected a tap range [min, max] within [-1, 1] (fractions of the peak swing)",
  })
  .refine(([a, b]) => a <= b, { error: "a tap range's min must not exceed its max" });

/** Transmit FIR: tap counts, the DAC step and per-tap ranges. */
export const txSchema = z
  .object({
    pre: nonNegativeInt.max(4, { error: "at most 4 pre-cursor taps" }).default(1),
    post: nonNegativeInt.max(8, { error: "at most 8 post-cursor taps" }).default(1),
    step: positiveNumber
      .max(0.5, { error: "the tap step is a fraction of the peak swing, at most 0.5 (e.g. 0.02)" })
      .optional()
      .describe("quantization step of every tap; omit for continuous taps (grid search then refinement)"),
    ranges: z.array(rangeSchema).optional().describe("per tap from the earliest pre-cursor tap: [min, max]"),
  })
  .superRefine((tx, ctx) => {
    if (tx.ranges !== undefined && tx.ranges.length !== tx.pre + 1 + tx.post) {
      ctx.addIssue({
        code: "custom",
        path: ["ranges"],
        message: `give one range per tap: ${tx.pre + 1 + tx.post} ranges (pre + 1 + post), got ${tx.ranges.length}`,
      });
    }
  });

/** CTLE: the gain grid and the fixed corners of the IEEE 802.3 Annex 93A form. */
export const ctleSchema = z
  .object({
    gDc_dB: dbGridSchema.describe("DC gain grid of the main stage, e.g. [-12, 0, 1]"),
    fz_Hz: positiveNumber.describe("zero frequency"),
    fp1_Hz: positiveNumber.describe("first pole"),
    fp2_Hz: positiveNumber.describe("second pole"),
    gDc2_dB: z
      .union([finiteNumber, dbGridSchema], { error: "expected a gain in dB or a grid [min, max, step]" })
      .optional()
      .describe("DC gain (or grid) of the low-frequency stage; omit for a single stage"),
    fLf_Hz: positiveNumber.optional().describe("pole/zero frequency of the low-frequency stage"),
  })
  .superRefine((c, ctx) => {
    const g2 = c.gDc2_dB;
    const nonZero = g2 !== undefined && (typeof g2 === "number" ? g2 !== 0 : g2[0] !== 0 || g2[1] !== 0);
    if (nonZero && c.fLf_Hz === undefined) {
      ctx.addIssue({
        code: "custom",
        path: ["fLf_Hz"],
        message: "give fLf_Hz (the low-frequency stage's corner) when gDc2_dB is not 0",
      });
    }
  });

/** DFE: number of taps and their magnitude limits. */
export const dfeSchema = z
  .object({
    taps: nonNegativeInt.max(32, { error: "at most 32 DFE taps" }).default(0),
    limits_V: z
      .union([nonNegativeNumber, z.array(nonNegativeNumber)], {
        error: "expected a limit in volts for all taps, or one limit per tap",
      })
      .optional()
      .describe("largest |tap| in volts at the limiter input; omit for no limit"),
  })
  .superRefine((d, ctx) => {
    if (Array.isArray(d.limits_V) && d.limits_V.length !== d.taps) {
      ctx.addIssue({
        code: "custom",
        path: ["limits_V"],
        message: `give one limit per DFE tap: ${d.taps} limits, got ${d.limits_V.length}`,
      });
    }
  });

/** Jitter of the transmitted data, in UI. */
export const jitterSchema = z.object({
  rjRms_UI: nonNegativeNumber.max(0.5, { error: "random jitter is at most 0.5 UI rms" }).default(0),
  djPp_UI: nonNegativeNumber.max(1, { error: "deterministic jitter is at most 1 UI peak-to-peak" }).default(0),
  djFreq_Hz: positiveNumber.optional().describe("frequency of periodic DJ; omit for data-dependent DJ"),
});

/** How the receiver gets its clock and where it samples. */
export const clockingSchema = z.object({
  scheme: z.enum(["forwarded", "recovered"], { error: 'expected "forwarded" or "recovered"' }).default("recovered"),
  bandwidth_Hz: positiveNumber
    .optional()
    .describe("tracking bandwidth; default baud/1667 (recovered) or baud/10 (forwarded)"),
  policy: samplingPolicySchema,
});

/**
 * The Budget: swing, noise, sensitivity, jitter, target BER, the equalizers' search space, the
 * required headroom and the clocking, and optionally the packages, the receiver's bandwidth and a
 * receive FFE. Units are in the field names (volts, hertz, UI, farads, ohms, metres).
 */
export const budgetSchema = z.object({
  modulation: modulationSchema.default("nrz"),
  bitRate_bps: positiveNumber.optional().describe("bit rate; checked against the pulse's UI when given"),
  txSwing_Vppd: positiveNumber
    .max(10, { error: "expected a peak-to-peak differential swing in volts, at most 10 (e.g. 0.8)" })
    .describe("transmitter peak-to-peak differential swing; symbols drive ±txSwing_Vppd/2"),
  noiseRms_V: nonNegativeNumber
    .max(1, { error: "expected a noise rms in volts, at most 1 (e.g. 0.002)" })
    .describe("Gaussian noise at the limiter input (after the CTLE, not shaped by it)"),
  inputNoiseRms_V: nonNegativeNumber
    .max(1, { error: "expected a noise rms in volts, at most 1" })
    .default(0)
    .describe("front-end noise before the CTLE, scaled by its noise-power gain over [0, baud/2]"),
  limiterSensitivity_V: nonNegativeNumber
    .max(1, { error: "expected a sensitivity in volts, at most 1 (e.g. 0.015)" })
    .describe("smallest eye the limiting amplifier resolves"),
  targetBer: finiteNumber
    .min(1e-30, { error: "targetBer must be at least 1e-30" })
    .max(1e-2, { error: "targetBer must be at most 1e-2 (e.g. 1e-12)" })
    .default(1e-12),
  requiredHeadroom_V: finiteNumber
    .min(-1)
    .max(1, { error: "expected a headroom in volts within ±1" })
    .default(0)
    .describe("headroom the link must keep at the limiter; the verdict compares against it"),
  jitter: jitterSchema.optional(),
  tx: txSchema.default({ pre: 1, post: 1 }),
  ctle: ctleSchema,
  dfe: dfeSchema.default({ taps: 0 }),
  clocking: clockingSchema.default({ scheme: "recovered", policy: DEFAULT_SAMPLING_POLICY }),
  package: packagesSchema
    .optional()
    .describe("the transmitter's and receiver's packages (IEEE 802.3 Annex 93A form); omit for ideal pins"),
  frontEnd: frontEndSchema.optional().describe("the receiver's bandwidth filter; omit for none"),
  ffe: ffeSchema
    .optional()
    .describe("a receive FFE (the feed-forward filter of an MMSE-DFE, set per CTLE setting); omit for none"),
});

/** A budget as written by a person or a script (defaults not yet applied). */
export type BudgetInput = z.input<typeof budgetSchema>;

/** A validated budget with every default filled in. */
export type Budget = z.output<typeof budgetSchema>;
