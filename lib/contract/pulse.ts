// Request of the `pulse` command: a channel (samples, CSV, Touchstone or loss model) to a pulse response.
import { z } from "zod";
import {
  fieldError,
  nonNegativeNumber,
  numberArray,
  positiveInt,
  positiveNumber,
  samplesPerUiSchema,
} from "./common.ts";

/** Largest file text accepted inside a request (50 MB). */
export const MAX_FILE_TEXT = 50 * 1024 * 1024;

const responseKind = z.enum(["pulse", "step", "impulse"], {
  error: fieldError('expected "pulse", "step" or "impulse"'),
});
const fileText = z
  .string({ error: fieldError("expected the file's text") })
  .min(1, { error: "the file is empty" })
  .max(MAX_FILE_TEXT, { error: "the file is larger than 50 MB" });

/** Port pairing of a 4-port (or larger) file, ports numbered from 1. */
export const portPairsSchema = z
  .object({ inP: positiveInt, inN: positiveInt, outP: positiveInt, outN: positiveInt })
  .refine((p) => new Set([p.inP, p.inN, p.outP, p.outN]).size === 4, { error: "pairs must name four different ports" });

/** Where the pulse comes from. */
export const pulseSourceSchema = z.discriminatedUnion(
  "kind",
  [
    z.object({
      kind: z.literal("samples"),
      response: responseKind,
      dt_s: positiveNumber,
      values: numberArray.min(2, { error: "expected at least 2 samples" }),
    }),
    z.object({ kind: z.literal("csv"), response: responseKind, text: fileText }),
    z.object({
      kind: z.literal("touchstone"),
      text: fileText,
      format: z
        .string()
        .regex(/^s[1-9]\d?p$/i, { error: 'expected a file type like "s2p" or "s4p"' })
        .optional(),
      pairs: portPairsSchema.optional(),
    }),
    z.object({
      kind: z.literal("loss-model"),
      lossAtNyquist_dB: nonNegativeNumber.max(100, { error: "expected a loss of at most 100 dB" }),
      delay_s: nonNegativeNumber.max(1e-6, { error: "expected a delay of at most 1 µs" }).optional(),
      skinFraction: nonNegativeNumber.max(1, { error: "expected a fraction from 0 to 1" }).optional(),
    }),
  ],
  { error: 'expected a source of kind "samples", "csv", "touchstone" or "loss-model"' },
);

/** `{ source, ui_s, samplesPerUi, riseTime_s? }`. */
export const pulseRequestSchema = z.object({
  source: pulseSourceSchema,
  ui_s: positiveNumber.max(1e-3, { error: "expected a UI of at most 1 ms" }),
  samplesPerUi: samplesPerUiSchema,
  riseTime_s: nonNegativeNumber.optional(),
});

/** A validated request (defaults applied). */
export type PulseRequest = z.output<typeof pulseRequestSchema>;
