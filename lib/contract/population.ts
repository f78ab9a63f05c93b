// Request of the `population` command: the minimax default of a class of channels.
import { z } from "zod";
import { PARAMETER_PATTERN } from "../tapTables/registerMap.ts";
import { budgetSchema } from "./budget.ts";
import { finiteNumber, pulseSchema } from "./common.ts";

/** Largest class the command accepts. */
export const MAX_POPULATION = 128;

/** One register field (see lib/tapTables/registerMap.ts). */
export const registerFieldSchema = z
  .object({
    name: z.string().regex(/^[A-Za-z_][A-Za-z0-9_]*$/, { error: "a field name is a C identifier" }),
    parameter: z.string().regex(PARAMETER_PATTERN, { error: "parameter must be tx[k], ctle.gDc_dB, ctle.gDc2_dB, dfe[n] or ffe[k]" }),
    bits: z.int({ error: "bits must be an integer" }).min(1).max(32, { error: "at most 32 bits" }),
    signed: z.boolean({ error: "signed must be true or false" }),
    lsb: finiteNumber.positive({ error: "lsb must be > 0 (one code step in the field's unit)" }),
    unit: z.enum(["fraction", "dB", "V"], { error: 'unit must be "fraction", "dB" or "V"' }),
    min: finiteNumber,
    max: finiteNumber,
  })
  .refine((f) => f.min <= f.max, { error: "min must not exceed max", path: ["min"] });

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
    .max(64, { error: "at most 64 register fields" })
    .refine((fs) => new Set(fs.map((f) => f.parameter)).size === fs.length, { error: "each parameter may appear in one field only" })
    .optional(),
});

/** A validated request (defaults applied). */
export type PopulationRequest = z.output<typeof populationRequestSchema>;
