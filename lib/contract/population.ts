// Request of the `population` command: the minimax default of a class of channels.
import { z } from "zod";
import { budgetSchema } from "./budget.ts";
import { pulseSchema } from "./common.ts";
import { MAX_REGISTER_FIELDS, registerFieldSchema } from "./registerField.ts";

/** Largest class the command accepts. */
export const MAX_POPULATION = 128;

/**
 * `{ pulses: [pulse, …], budget, registerMap? }`: the channels of one class (same UI), the budget,
 * and optionally the register fields the default is rounded to.
 */
export const populationRequestSchema = z.object({
  pulses: z
    .array(pulseSchema, { error: "expected an array of pulse responses" })
    .min(1, { error: "give at least one pulse" })
    .max(MAX_POPULATION, { error: `at most ${MAX_POPULATION} pulses` }),
  budget: budgetSchema,
  registerMap: z
    .array(registerFieldSchema)
    .max(MAX_REGISTER_FIELDS, { error: `at most ${MAX_REGISTER_FIELDS} register fields` })
    .refine((fs) => new Set(fs.map((f) => f.parameter)).size === fs.length, { error: "each parameter may appear in one field only" })
    .optional(),
});

/** A validated request (defaults applied). */
export type PopulationRequest = z.output<typeof populationRequestSchema>;
