// Request of the `optimize` command: a pulse and a budget.
import { z } from "zod";
import { linkAggressorsSchema } from "./aggressor.ts";
import { budgetSchema } from "./budget.ts";
import { positiveInt, pulseSchema } from "./common.ts";

/** `{ pulse, budget, aggressors? }`; extension: `topCount` (best settings listed, default 5). */
export const optimizeRequestSchema = z.object({
  pulse: pulseSchema,
  budget: budgetSchema,
  topCount: positiveInt.max(100, { error: "at most 100 top settings" }).default(5),
  aggressors: linkAggressorsSchema
    .optional()
    .describe("crosstalk pulses at the receiver's pins, NEXT or FEXT, for a 1 V aggressor symbol"),
});

/** A validated request (defaults applied). */
export type OptimizeRequest = z.output<typeof optimizeRequestSchema>;
