// Request of the `optimize` command: a pulse and a budget.
import { z } from "zod";
import { budgetSchema } from "./budget.ts";
import { positiveInt, pulseSchema } from "./common.ts";

/** `{ pulse, budget }`; extension: `topCount` (best settings listed, default 5). */
export const optimizeRequestSchema = z.object({
  pulse: pulseSchema,
  budget: budgetSchema,
  topCount: positiveInt.max(100, { error: "at most 100 top settings" }).default(5),
});

/** A validated request (defaults applied). */
export type OptimizeRequest = z.output<typeof optimizeRequestSchema>;
