// Aggressors in requests: crosstalk pulses for the `eye` command (already through the receiver) and
// for `optimize` / `population` (at the receiver's pins, with the aggressor's transmitter).
import { z } from "zod";
import { finiteNumber, positiveNumber, pulseSchema } from "./common.ts";

/** Most aggressors per victim. */
export const MAX_AGGRESSORS = 16;

const name = z
  .string({ error: "expected a name" })
  .min(1, { error: "a name must not be empty" })
  .max(100, { error: "at most 100 characters" });

/** `eye`: `{ pulse, name? }` — a crosstalk pulse at the sampler for a 1 V aggressor symbol. */
export const eyeAggressorSchema = z.object({ pulse: pulseSchema, name: name.optional() });

/** `optimize` / `population`: a crosstalk pulse at the receiver's pins, its kind and its transmitter. */
export const linkAggressorSchema = z.object({
  pulse: pulseSchema,
  kind: z.enum(["next", "fext"], { error: 'expected "next" or "fext"' }),
  name: name.optional(),
  txSwing_Vppd: positiveNumber
    .max(10, { error: "expected a peak-to-peak differential swing in volts, at most 10" })
    .optional()
    .describe("the aggressor's swing; default the budget's"),
  txTaps: z
    .array(finiteNumber, { error: "expected an array of FIR taps" })
    .min(1, { error: "give at least one tap" })
    .max(13, { error: "at most 13 taps" })
    .refine((t) => t.reduce((s, c) => s + Math.abs(c), 0) <= 1 + 1e-9, {
      error: "the taps' Σ|c| must not exceed 1 (fractions of the peak swing)",
    })
    .optional()
    .describe("NEXT: the aggressor's own FIR (default [1]); FEXT: default the victim's chosen FIR"),
});

/** A list of aggressors for one victim. */
export const eyeAggressorsSchema = z
  .array(eyeAggressorSchema)
  .max(MAX_AGGRESSORS, { error: `at most ${MAX_AGGRESSORS} aggressors` });
export const linkAggressorsSchema = z
  .array(linkAggressorSchema)
  .max(MAX_AGGRESSORS, { error: `at most ${MAX_AGGRESSORS} aggressors` });

/** A validated aggressor of `optimize` / `population`. */
export type LinkAggressor = z.output<typeof linkAggressorSchema>;
