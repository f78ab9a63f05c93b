// Request of the `eye` command: the statistical eye of an (already equalized) pulse.
import { z } from "zod";
import { eyeAggressorsSchema } from "./aggressor.ts";
import { finiteNumber, modulationSchema, nonNegativeNumber, pulseSchema, samplingPolicySchema } from "./common.ts";

/** Target BER accepted by the engine. */
export const targetBerSchema = finiteNumber
  .min(1e-30, { error: "targetBer must be at least 1e-30" })
  .max(1e-2, { error: "targetBer must be at most 1e-2 (e.g. 1e-12)" });

/** Dual-Dirac jitter in UI. */
export const eyeJitterSchema = z.object({
  rjRms_UI: nonNegativeNumber.max(0.5, { error: "random jitter is at most 0.5 UI rms" }),
  djPp_UI: nonNegativeNumber.max(1, { error: "deterministic jitter is at most 1 UI peak-to-peak" }),
});

/**
 * `{ pulse, modulation, noiseRms_V, targetBer, jitter?, dfe?: { taps }, aggressors?: [{ pulse, name? }] }`;
 * extensions: `policy` (sampling-phase policy, default "centre" — the same default as a budget's clocking).
 */
export const eyeRequestSchema = z.object({
  pulse: pulseSchema,
  modulation: modulationSchema.default("nrz"),
  noiseRms_V: nonNegativeNumber.max(10, { error: "expected a noise rms in volts, at most 10" }),
  targetBer: targetBerSchema.default(1e-12),
  jitter: eyeJitterSchema.optional(),
  dfe: z
    .object({
      taps: z
        .array(finiteNumber, { error: "expected an array of DFE tap values in volts" })
        .max(64, { error: "at most 64 DFE taps" }),
    })
    .optional()
    .describe("tap k cancels post-cursor k at every phase (decisions assumed correct)"),
  policy: samplingPolicySchema,
  aggressors: eyeAggressorsSchema
    .optional()
    .describe(
      "crosstalk pulses at the same sampler (through the same receiver) for a 1 V aggressor symbol; each sampled at its worst phase",
    ),
});

/** A validated request (defaults applied). */
export type EyeRequest = z.output<typeof eyeRequestSchema>;
