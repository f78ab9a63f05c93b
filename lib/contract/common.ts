// Building blocks of the engine's request schemas (zod), shared by every command and by the web API.
import { z } from "zod";
import { DEFAULT_SAMPLING_POLICY } from "../clocking/samplingPhase.ts";
import { pulseFromJson } from "../pulse/pulseJson.ts";
import type { Modulation } from "../types.ts";

/** Largest sample array accepted in a request (pulse values, cursors, frequency grids). */
export const MAX_ARRAY_LENGTH = 1 << 22;

/** An error message for a field: "required" when it is missing, `text` when it is wrong. */
export function fieldError(text: string): (issue: { input?: unknown }) => string {
  return (issue) => (issue.input === undefined ? "this field is required" : text);
}

/** A finite JSON number (zod 4 refuses NaN and ±Infinity). */
export const finiteNumber = z.number({ error: fieldError("expected a finite number") });

/** The modulations the engine knows: NRZ (two levels) and PAM4 (four). */
export const modulations = ["nrz", "pam4"] as const satisfies readonly Modulation[];

/** A modulation name, `"nrz"` or `"pam4"`. */
export const modulationSchema = z.enum(modulations, { error: 'expected "nrz" or "pam4"' });

/** A finite number > 0. */
export const positiveNumber = finiteNumber.positive({ error: "expected a number > 0" });

/** A finite number ≥ 0. */
export const nonNegativeNumber = finiteNumber.nonnegative({ error: "expected a number ≥ 0" });

/** An integer ≥ 1 (safe range). */
export const positiveInt = z
  .int({ error: fieldError("expected an integer") })
  .min(1, { error: "expected an integer ≥ 1" });

/** An integer ≥ 0 (safe range). */
export const nonNegativeInt = z
  .int({ error: fieldError("expected an integer") })
  .min(0, { error: "expected an integer ≥ 0" });

/** A non-empty array of finite numbers of bounded length. */
export const numberArray = z
  .array(finiteNumber, { error: fieldError("expected an array of numbers") })
  .min(1, { error: "expected at least one value" })
  .max(MAX_ARRAY_LENGTH, { error: `expected at most ${MAX_ARRAY_LENGTH} values` });

/** A frequency grid in Hz: finite values ≥ 0. */
export const freqsSchema = z
  .array(nonNegativeNumber, { error: fieldError("expected an array of frequencies in Hz") })
  .min(1, { error: "expected at least one frequency" })
  .max(MAX_ARRAY_LENGTH, { error: `expected at most ${MAX_ARRAY_LENGTH} frequencies` });

/** Samples per UI accepted by the engine (1 … 1024). */
export const samplesPerUiSchema = positiveInt.max(1024, { error: "expected at most 1024 samples per UI" });

/** A pulse response in its JSON form, `mainIndex` checked against the values. */
export const pulseJsonSchema = z
  .object({
    ui_s: positiveNumber,
    samplesPerUi: samplesPerUiSchema,
    values_V: numberArray,
    mainIndex: nonNegativeInt,
  })
  .superRefine((p, ctx) => {
    if (p.mainIndex >= p.values_V.length) {
      ctx.addIssue({
        code: "custom",
        path: ["mainIndex"],
        message: `mainIndex ${p.mainIndex} is outside values_V (length ${p.values_V.length})`,
      });
    }
  });

/** A pulse response validated and converted to the engine's {@link Pulse} (Float64Array values). */
export const pulseSchema = pulseJsonSchema.transform((p) => pulseFromJson(p));

/**
 * Fields shared by the symbol-spaced solvers (`zf`, `mmse`, `lms`): cursors, the main cursor's
 * index among them, and the equalizer's pre/post tap counts.
 */
export const cursorWindowShape = {
  cursors: numberArray,
  main: nonNegativeInt,
  pre: nonNegativeInt.max(256, { error: "expected at most 256 pre-cursor taps" }),
  post: nonNegativeInt.max(256, { error: "expected at most 256 post-cursor taps" }),
};

/** Refinement adding an issue at `main` when it does not index into `cursors`. */
export function checkMainInCursors(r: { cursors: number[]; main: number }, ctx: z.RefinementCtx): void {
  if (r.main >= r.cursors.length) {
    ctx.addIssue({
      code: "custom",
      path: ["main"],
      message: `main ${r.main} is outside cursors (length ${r.cursors.length})`,
    });
  }
}

/** Dotted form of a zod issue path (`source.values.3`); the empty string for the root. */
export function formatPath(path: readonly PropertyKey[]): string {
  return path.map((p) => String(p)).join(".");
}

/** A sampling-phase policy, defaulting to Tapwright's one default (the eye centre). */
export const samplingPolicySchema = z
  .enum(["centre", "max-height", "mueller-muller"], { error: 'expected "centre", "max-height" or "mueller-muller"' })
  .default(DEFAULT_SAMPLING_POLICY);
