// One budget builder for the tests: a small 28 Gb/s NRZ budget (a tap table of a few channels
// computes in seconds), with what a test changes laid over it. Nested objects merge, lists and
// values replace, and `undefined` takes a field out (the schema's default then applies).
import type { BudgetInput } from "@lib/contract/budget";

/** What a test may change: any field, at any depth. */
export type BudgetChanges = {
  [K in keyof BudgetInput]?: BudgetInput[K] extends object
    ? (BudgetInput[K] extends unknown[] ? BudgetInput[K] : Partial<BudgetInput[K]>) | undefined
    : BudgetInput[K] | undefined;
};

const base: BudgetInput = {
  modulation: "nrz",
  bitRate_bps: 28e9,
  txSwing_Vppd: 0.8,
  noiseRms_V: 0.0015,
  limiterSensitivity_V: 0.015,
  targetBer: 1e-12,
  requiredHeadroom_V: 0.005,
  jitter: { rjRms_UI: 0.01, djPp_UI: 0.05 },
  tx: { pre: 0, post: 1, step: 0.05 },
  ctle: { gDc_dB: [-9, 0, 3], fz_Hz: 7e9, fp1_Hz: 7e9, fp2_Hz: 28e9 },
  dfe: { taps: 2, limits_V: 0.1 },
  clocking: { scheme: "recovered", policy: "centre" },
};

const isPlainObject = (v: unknown): v is Record<string, unknown> =>
  typeof v === "object" && v !== null && !Array.isArray(v);

function merge(into: Record<string, unknown>, changes: Record<string, unknown>): Record<string, unknown> {
  const out: Record<string, unknown> = { ...into };
  for (const [key, value] of Object.entries(changes)) {
    if (value === undefined) delete out[key];
    else if (isPlainObject(value) && isPlainObject(out[key]))
      out[key] = merge(out[key] as Record<string, unknown>, value);
    else out[key] = value;
  }
  return out;
}

/** The test budget with `changes` laid over it (a fresh object each call). */
export function budget(changes: BudgetChanges = {}): BudgetInput {
  return merge(structuredClone(base) as Record<string, unknown>, changes) as BudgetInput;
}

/** A budget as the API takes it: the test budget with a name. */
export function budgetBody(name: string, changes: BudgetChanges = {}): BudgetInput & { name: string } {
  return { name, ...budget(changes) };
}
