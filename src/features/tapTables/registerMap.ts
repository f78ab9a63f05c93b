// The register map a tap table is quantized to: one field per equalizer parameter of the
// architecture, each with a name, bit width, signedness, LSB in physical units and a range.
// The default map follows the architecture and the budget; people edit it per field.
import { z } from "zod";
import { MAX_REGISTER_FIELDS, registerFieldObject } from "@lib/contract/registerField";
import { codeRange, type FieldUnit } from "@lib/tapTables/registerMap";
import type { Architecture } from "@/features/studies/architecture";

/** How the unit of a field reads in tables. */
export const unitLabels: Record<FieldUnit, string> = { fraction: "× peak swing", dB: "dB", V: "V" };

/**
 * The engine's register field with the app's stricter rules: a lowercase name of at most 32
 * characters (the C header's macros are built from it), at most 16 bits (the firmware's
 * registers), and signed whenever the range goes below 0.
 */
export const registerFieldSchema = registerFieldObject
  .extend({
    name: z
      .string()
      .trim()
      .regex(
        /^[a-z][a-z0-9_]{0,31}$/,
        "A field name is a C identifier in lowercase: a letter, then letters, digits or _ (at most 32).",
      ),
    bits: registerFieldObject.shape.bits.max(16, "A field has at most 16 bits."),
  })
  .superRefine((f, ctx) => {
    if (f.min > f.max)
      ctx.addIssue({
        code: "custom",
        path: ["min"],
        message: `${f.name}: min (${f.min}) must not exceed max (${f.max}).`,
      });
    if (!f.signed && f.min < 0) {
      ctx.addIssue({
        code: "custom",
        path: ["signed"],
        message: `${f.name}: the range goes below 0, so the field must be signed.`,
      });
    }
  });
export type RegisterField = z.infer<typeof registerFieldSchema>;

export const registerMapSchema = z
  .array(registerFieldSchema, { error: "The register map is a list of fields." })
  .min(1, "The register map needs at least one field.")
  .max(MAX_REGISTER_FIELDS, `At most ${MAX_REGISTER_FIELDS} fields.`)
  .refine(
    (fs) => new Set(fs.map((f) => f.name)).size === fs.length,
    "Two fields have the same name; names must be unique.",
  )
  .refine((fs) => new Set(fs.map((f) => f.parameter)).size === fs.length, "Two fields hold the same parameter.");

/** The budget fields the default map reads (a subset of lib/contract/budget.ts's Budget). */
export interface BudgetForMap {
  txSwing_Vppd: number;
  tx?: { pre?: number; post?: number; step?: number; ranges?: [number, number][] };
  ctle: { gDc_dB: [number, number, number]; gDc2_dB?: number | [number, number, number] };
  dfe?: { taps?: number; limits_V?: number | number[] };
}

/** Transmit tap names: tx_pre2, tx_pre1, tx_main, tx_post1, … */
function tapName(k: number): string {
  if (k === 0) return "tx_main";
  return k < 0 ? `tx_pre${-k}` : `tx_post${k}`;
}

/** Smallest width holding every code of `[min, max]` at this LSB (a sign bit when min < 0). */
function widthFor(min: number, max: number, lsb: number): { bits: number; signed: boolean } {
  const signed = min < 0;
  const top = Math.max(Math.abs(Math.round(min / lsb)), Math.abs(Math.round(max / lsb)));
  const magnitude = Math.max(1, Math.ceil(Math.log2(top + 1)));
  return { bits: Math.min(16, magnitude + (signed ? 1 : 0)), signed };
}

function field(name: string, parameter: string, unit: FieldUnit, lsb: number, min: number, max: number): RegisterField {
  return { name, parameter, unit, lsb, min, max, ...widthFor(min, max, lsb) };
}

/** DFE LSBs offered by default (volts): the finest that reaches the tap's limit within ±127 codes. */
const DFE_LSBS_V = [0.25e-3, 0.5e-3, 1e-3, 2e-3, 5e-3, 10e-3];

/** Receive FFE tap LSB by default (the FFE's main tap is near 1). */
const FFE_LSB = 1 / 64;

/** Transmit tap range when the budget gives none: pre/post taps de-emphasize (≤ 0), the main tap drives. */
function defaultTxRange(k: number): [number, number] {
  if (k === 0) return [0.5, 1];
  return k < 0 ? [-0.25, 0] : [-0.5, 0];
}

/**
 * The default register map of an architecture under a budget: transmit taps at the budget's step
 * (1/64 of the swing otherwise) within its ranges, the CTLE gains at the grid's step over the grid,
 * and DFE taps at the finest of 0.25, 0.5, 1, 2, 5 or 10 mV that reaches their limit (half the
 * swing when unlimited) within 8 signed bits; receive FFE taps (starting values: the FFE adapts per
 * channel like the DFE) at 1/64 over [0, 2] for the main tap and [−1, 1] for the others.
 */
export function defaultRegisterMap(a: Architecture, budget: BudgetForMap): RegisterField[] {
  const fields: RegisterField[] = [];
  if (a.tx) {
    const step = budget.tx?.step ?? 1 / 64;
    const sameShape = budget.tx?.ranges && (budget.tx.pre ?? 1) === a.tx.pre && (budget.tx.post ?? 1) === a.tx.post;
    for (let k = -a.tx.pre; k <= a.tx.post; k++) {
      const [min, max] = sameShape ? budget.tx!.ranges![k + a.tx.pre] : defaultTxRange(k);
      fields.push(field(tapName(k), `tx[${k}]`, "fraction", step, min, max));
    }
  }
  if (a.ctle) {
    const [lo, hi, step] = budget.ctle.gDc_dB;
    fields.push(field("ctle_gdc", "ctle.gDc_dB", "dB", step, lo, hi));
    const g2 = budget.ctle.gDc2_dB;
    if (Array.isArray(g2) && g2[1] > g2[0]) fields.push(field("ctle_gdc2", "ctle.gDc2_dB", "dB", g2[2], g2[0], g2[1]));
  }
  if (a.ffe) {
    for (let k = -a.ffe.pre; k <= a.ffe.post; k++) {
      const name = k === 0 ? "ffe_main" : k < 0 ? `ffe_pre${-k}` : `ffe_post${k}`;
      fields.push(field(name, `ffe[${k}]`, "fraction", FFE_LSB, k === 0 ? 0 : -1, k === 0 ? 2 : 1));
    }
  }
  const limits = budget.dfe?.limits_V;
  for (let n = 1; n <= a.dfeTaps; n++) {
    const limit = Array.isArray(limits)
      ? limits[Math.min(n - 1, limits.length - 1)]
      : (limits ?? budget.txSwing_Vppd / 2);
    const lsb = DFE_LSBS_V.find((x) => limit / x <= 127) ?? DFE_LSBS_V[DFE_LSBS_V.length - 1];
    fields.push(field(`dfe_tap${n}`, `dfe[${n}]`, "V", lsb, -limit, limit));
  }
  return fields;
}

/** The parameters an architecture needs a field for (in register-map order). */
export function requiredParameters(a: Architecture, budget: BudgetForMap): string[] {
  return defaultRegisterMap(a, budget).map((f) => f.parameter);
}

/**
 * What keeps a register map from encoding an architecture: a missing or stray field, or a field
 * with no code inside its range at its width and LSB; null when the map fits. `path` names the
 * request field at fault.
 */
export function registerMapProblem(
  map: readonly RegisterField[],
  architecture: Architecture,
  budget: BudgetForMap,
): { message: string; path: string } | null {
  const needed = requiredParameters(architecture, budget);
  const have = new Set(map.map((f) => f.parameter));
  const missing = needed.filter((p) => !have.has(p));
  if (missing.length > 0) {
    return {
      message: `The register map has no field for ${missing.join(", ")} (the architecture “${architecture.label}” needs one).`,
      path: "registerMap",
    };
  }
  const stray = map.findIndex((f) => !needed.includes(f.parameter));
  if (stray !== -1) {
    return {
      message: `The field “${map[stray].name}” holds ${map[stray].parameter}, which “${architecture.label}” does not have.`,
      path: `registerMap.${stray}.parameter`,
    };
  }
  for (const [i, f] of map.entries()) {
    try {
      codeRange(f);
    } catch (e) {
      if (e instanceof RangeError)
        return { message: `${e.message}; widen the field or change its LSB or range.`, path: `registerMap.${i}` };
      throw e;
    }
  }
  return null;
}

/** A field's value for people, in its unit (DFE taps in mV). */
export function formatFieldValue(f: Pick<RegisterField, "unit">, value: number): string {
  if (f.unit === "V") return `${(value * 1e3).toFixed(2)} mV`;
  if (f.unit === "dB") return `${Number(value.toFixed(3))} dB`;
  return Number(value.toFixed(4)).toString();
}

/** A field's LSB for people. */
export function formatLsb(f: Pick<RegisterField, "unit" | "lsb">): string {
  if (f.unit === "V") return `${Number((f.lsb * 1e3).toPrecision(4))} mV`;
  if (f.unit === "dB") return `${Number(f.lsb.toPrecision(4))} dB`;
  const inv = 1 / f.lsb;
  return Number.isInteger(Math.round(inv * 1e9) / 1e9)
    ? `1/${Math.round(inv)}`
    : Number(f.lsb.toPrecision(4)).toString();
}
