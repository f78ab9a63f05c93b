// Request of the `fir-response` command: the frequency response of a symbol-spaced FIR.
import { z } from "zod";
import { freqsSchema, nonNegativeInt, numberArray, positiveNumber } from "./common.ts";

/** `{ taps, pre, ui_s, freqs_Hz }`, with `pre` indexing the main tap. */
export const firResponseRequestSchema = z
  .object({
    taps: numberArray.max(256, { error: "expected at most 256 taps" }),
    pre: nonNegativeInt,
    ui_s: positiveNumber,
    freqs_Hz: freqsSchema.max(100_000, { error: "expected at most 100000 frequencies" }),
  })
  .superRefine((r, ctx) => {
    if (r.pre >= r.taps.length) {
      ctx.addIssue({
        code: "custom",
        path: ["pre"],
        message: `pre ${r.pre} leaves no main tap among ${r.taps.length} taps`,
      });
    }
  });

/** A validated request (defaults applied). */
export type FirResponseRequest = z.output<typeof firResponseRequestSchema>;
