// A corner of a sweep: a named perturbation of the channel's loss and of the budget's swing, noise,
// jitter and limiter sensitivity. The web API and the engine share this one schema.
import { z } from "zod";
import { finiteNumber, fieldError } from "./common.ts";

/** Largest factor a corner may apply to any quantity. */
export const MAX_CORNER_SCALE = 4;

const factor = (what: string, allowZero: boolean) =>
  finiteNumber
    .refine((x) => (allowZero ? x >= 0 : x > 0), {
      error: `expected a factor ${allowZero ? "≥ 0" : "> 0"} on the ${what} (1 = nominal)`,
    })
    .refine((x) => x <= MAX_CORNER_SCALE, { error: `expected a factor at most ${MAX_CORNER_SCALE} on the ${what}` })
    .optional();

/**
 * One corner: every factor defaults to 1 (nominal). `lossScale` multiplies the channel's insertion
 * loss in dB at every frequency; the others multiply the budget's transmit swing, noise (at the limiter
 * and before the CTLE), jitter (RJ and DJ) and limiter sensitivity.
 */
export const cornerSchema = z.object({
  name: z
    .string({ error: fieldError("expected a corner name") })
    .trim()
    .min(1, { error: "a corner needs a name" })
    .max(60, { error: "a corner name has at most 60 characters" }),
  lossScale: factor("insertion loss in dB", false),
  txSwingScale: factor("transmit swing", false),
  noiseScale: factor("noise", true),
  jitterScale: factor("jitter", true),
  sensitivityScale: factor("limiter sensitivity", true),
});

/** A corner as written by a person or a script. */
export type Corner = z.infer<typeof cornerSchema>;
