// Request of the `population` command: the minimax default of a class of channels.
import { z } from "zod";
import { linkAggressorsSchema } from "./aggressor.ts";
import { budgetSchema } from "./budget.ts";
import { pulseSchema } from "./common.ts";
import { MAX_REGISTER_FIELDS, registerFieldSchema } from "./registerField.ts";

/** Largest class the command accepts. */
export const MAX_POPULATION = 128;

/**
 * `{ pulses: [pulse, …], budget, registerMap?, aggressors? }`: the channels of one class (same UI),
 * the budget, optionally the register fields the default is rounded to, and each channel's aggressors.
 */
export const populationRequestSchema = z
  .object({
    pulses: z
      .array(pulseSchema, { error: "expected an array of pulse responses" })
      .min(1, { error: "give at least one pulse" })
      .max(MAX_POPULATION, { error: `at most ${MAX_POPULATION} pulses` }),
    budget: budgetSchema,
    registerMap: z
      .array(registerFieldSchema)
      .max(MAX_REGISTER_FIELDS, { error: `at most ${MAX_REGISTER_FIELDS} register fields` })
      .refine((fs) => new Set(fs.map((f) => f.parameter)).size === fs.length, {
        error: "each parameter may appear in one field only",
      })
      .optional(),
    aggressors: z
      .array(linkAggressorsSchema, { error: "expected one list of aggressors per pulse" })
      .optional()
      .describe("per pulse (same order), its aggressors; an empty list for a lane without"),
  })
  .superRefine((r, ctx) => {
    if (r.aggressors !== undefined && r.aggressors.length !== r.pulses.length) {
      ctx.addIssue({
        code: "custom",
        path: ["aggressors"],
        message: `give one list of aggressors per pulse: ${r.pulses.length} lists, got ${r.aggressors.length}`,
      });
    }
  });

/** A validated request (defaults applied). */
export type PopulationRequest = z.output<typeof populationRequestSchema>;
