// One register field of a register map (lib/tapTables/registerMap.ts): the command line's
// `population` request and the web app's tap tables validate fields with this schema.
import { z } from "zod";
import { fieldUnits, PARAMETER_PATTERN } from "../tapTables/registerMap.ts";
import { finiteNumber } from "./common.ts";

/** Largest number of fields one register map may hold. */
export const MAX_REGISTER_FIELDS = 64;

/**
 * A register field's own checks, before the check across its fields: callers with stricter rules
 * extend this object (`.extend`) and add their own `min ≤ max` refinement.
 */
export const registerFieldObject = z.object({
  name: z.string().regex(/^[A-Za-z_][A-Za-z0-9_]*$/, { error: "a field name is a C identifier" }),
  parameter: z
    .string()
    .regex(PARAMETER_PATTERN, { error: "parameter must be tx[k], ctle.gDc_dB, ctle.gDc2_dB, dfe[n] or ffe[k]" }),
  bits: z
    .int({ error: "bits must be an integer" })
    .min(1, { error: "a field has at least 1 bit" })
    .max(32, { error: "at most 32 bits" }),
  signed: z.boolean({ error: "signed must be true or false" }),
  lsb: finiteNumber.positive({ error: "lsb must be > 0 (one code step in the field's unit)" }),
  unit: z.enum(fieldUnits, { error: 'unit must be "fraction", "dB" or "V"' }),
  min: finiteNumber,
  max: finiteNumber,
});

/** One register field: `{ name, parameter, bits, signed, lsb, unit, min, max }` with `min ≤ max`. */
export const registerFieldSchema = registerFieldObject.refine((f) => f.min <= f.max, {
  error: "min must not exceed max",
  path: ["min"],
});
