// Request of the `lms` command: LMS or sign-sign LMS adaptation on random NRZ symbols.
import { z } from "zod";
import {
  checkMainInCursors,
  fieldError,
  cursorWindowShape,
  nonNegativeNumber,
  positiveInt,
  positiveNumber,
} from "./common.ts";

/** Upper bound on `iterations × (cursors + taps)`, the work of one request. */
export const LMS_MAX_WORK = 2e9;

/** `{ cursors, main, pre, post, noiseRms_V, mu, iterations, seed, variant, every? }`. */
export const lmsRequestSchema = z
  .object({
    ...cursorWindowShape,
    noiseRms_V: nonNegativeNumber,
    mu: positiveNumber,
    iterations: positiveInt.max(10_000_000, { error: "expected at most 10000000 iterations" }),
    seed: z.int({ error: fieldError("expected an integer seed") }),
    variant: z.enum(["lms", "sign-sign"], { error: fieldError('expected "lms" or "sign-sign"') }),
    every: positiveInt.optional(),
  })
  .superRefine((r, ctx) => {
    checkMainInCursors(r, ctx);
    const taps = r.pre + 1 + r.post;
    if (r.iterations * (r.cursors.length + taps) > LMS_MAX_WORK) {
      ctx.addIssue({
        code: "custom",
        path: ["iterations"],
        message: "iterations × (cursors + taps) is too large for one request; use fewer iterations",
      });
    }
    if (r.every !== undefined && r.iterations / r.every > 100_000) {
      ctx.addIssue({
        code: "custom",
        path: ["every"],
        message: "every is too small: at most 100000 trajectory records",
      });
    }
  });

/** A validated request (defaults applied). */
export type LmsRequest = z.output<typeof lmsRequestSchema>;
