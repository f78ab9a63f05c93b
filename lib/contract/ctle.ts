// CTLE settings and the `ctle-response` request (IEEE 802.3 Annex 93A form with the low-frequency stage).
import { z } from "zod";
import { finiteNumber, freqsSchema, positiveNumber } from "./common.ts";

const ctleFields = {
  gDc_dB: finiteNumber.min(-60).max(60, { error: "expected a DC gain within ±60 dB" }),
  fz_Hz: positiveNumber,
  fp1_Hz: positiveNumber,
  fp2_Hz: positiveNumber,
  gDc2_dB: finiteNumber.min(-60).max(60, { error: "expected a DC gain within ±60 dB" }).optional(),
  fLf_Hz: positiveNumber.optional(),
};

const needsCorner = (c: { gDc2_dB?: number; fLf_Hz?: number }, ctx: z.RefinementCtx) => {
  if ((c.gDc2_dB ?? 0) !== 0 && c.fLf_Hz === undefined) {
    ctx.addIssue({
      code: "custom",
      path: ["fLf_Hz"],
      message: "give fLf_Hz (the low-frequency stage's corner) when gDc2_dB is not 0",
    });
  }
};

/** One CTLE setting: `{ gDc_dB, fz_Hz, fp1_Hz, fp2_Hz, gDc2_dB?, fLf_Hz? }`. */
export const ctleParamsSchema = z.object(ctleFields).superRefine(needsCorner);

/** A CTLE setting plus the frequencies to evaluate it at. */
export const ctleResponseRequestSchema = z
  .object({ ...ctleFields, freqs_Hz: freqsSchema.max(100_000, { error: "expected at most 100000 frequencies" }) })
  .superRefine(needsCorner);

/** A validated request (defaults applied). */
export type CtleResponseRequest = z.output<typeof ctleResponseRequestSchema>;
