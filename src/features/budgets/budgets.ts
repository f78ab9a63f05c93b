// Budgets: the request schema (the engine's own Budget schema plus a name), the form's fields with
// units and help, the starting points offered in the form, and conversions between the form's
// display units and the SI values stored. No server code here: the form island imports this file.
import { z } from "zod";
import { budgetSchema, type Budget, type BudgetInput } from "@lib/contract/budget";

/** POST/PUT /api/v1/budgets: the `budget` object of the engine's optimize request, with a name. */
export const budgetRequest = budgetSchema.extend({
  name: z.string({ error: "Give the budget a name." }).trim().min(1, "Give the budget a name.").max(200, "Keep the name under 200 characters."),
  description: z.string().trim().max(2000, "Keep the description under 2000 characters.").optional(),
});
export type BudgetRequest = z.output<typeof budgetRequest>;

export const listQuery = z.object({
  limit: z.coerce.number().int().min(1).max(200).default(100),
  cursor: z.coerce.number().int().min(0).optional(),
});

export const idParams = z.object({ id: z.coerce.number({ error: "The id must be a number." }).int().positive() });

/** What the API answers for a budget: the stored budget's fields, flattened, plus bookkeeping. */
export type BudgetView = Budget & {
  id: number;
  name: string;
  description: string | null;
  createdBy: string | null;
  createdAt: string | Date;
  updatedAt: string | Date;
  runCount?: number;
};

/** A starting point offered in the form. */
export interface BudgetPreset {
  key: string;
  name: string;
  description: string;
  budget: BudgetInput;
}

/**
 * Starting points: values typical of the trade for each kind of link, to be adjusted to the
 * silicon at hand. CTLE corners follow the Annex 93A habit of tying them to the baud rate.
 */
export const budgetPresets: BudgetPreset[] = [
  {
    key: "nrz28-backplane",
    name: "28 Gb/s NRZ backplane",
    description:
      "A long-reach NRZ backplane lane: 0.8 Vppd swing, 1-pre/2-post transmit FIR in 1/40 steps, a 0…−12 dB CTLE with corners at baud/4 and baud, and a 5-tap DFE.",
    budget: {
      modulation: "nrz",
      bitRate_bps: 28e9,
      txSwing_Vppd: 0.8,
      noiseRms_V: 0.0015,
      inputNoiseRms_V: 0,
      limiterSensitivity_V: 0.015,
      targetBer: 1e-12,
      requiredHeadroom_V: 0.005,
      jitter: { rjRms_UI: 0.01, djPp_UI: 0.05 },
      tx: { pre: 1, post: 2, step: 0.025 },
      ctle: { gDc_dB: [-12, 0, 1], fz_Hz: 7e9, fp1_Hz: 7e9, fp2_Hz: 28e9 },
      dfe: { taps: 5, limits_V: 0.1 },
      clocking: { scheme: "recovered", policy: "centre" },
    },
  },
  {
    key: "pam4-53-short",
    name: "53 GBd PAM4 short reach",
    description:
      "106.25 Gb/s PAM4 over a short chip-to-module trace: target BER 1e-6 ahead of FEC, a two-stage CTLE (corners at baud/2.5, baud and baud/40) and a 2-tap DFE.",
    budget: {
      modulation: "pam4",
      bitRate_bps: 106.25e9,
      txSwing_Vppd: 0.8,
      noiseRms_V: 0.001,
      inputNoiseRms_V: 0,
      limiterSensitivity_V: 0.01,
      targetBer: 1e-6,
      requiredHeadroom_V: 0.002,
      jitter: { rjRms_UI: 0.01, djPp_UI: 0.03 },
      tx: { pre: 1, post: 1, step: 0.05 },
      ctle: { gDc_dB: [-15, 0, 1], fz_Hz: 21.25e9, fp1_Hz: 21.25e9, fp2_Hz: 53.125e9, gDc2_dB: [-4, 0, 1], fLf_Hz: 1.328125e9 },
      dfe: { taps: 2, limits_V: 0.05 },
      clocking: { scheme: "recovered", policy: "centre" },
    },
  },
  {
    key: "nrz10-ctle",
    name: "10.3 Gb/s NRZ, CTLE only",
    description: "A chip-to-chip link with no DFE: transmit de-emphasis and a CTLE must do it all. Handy to see where linear reach ends.",
    budget: {
      modulation: "nrz",
      bitRate_bps: 10.3125e9,
      txSwing_Vppd: 1.0,
      noiseRms_V: 0.002,
      limiterSensitivity_V: 0.02,
      targetBer: 1e-12,
      requiredHeadroom_V: 0.01,
      jitter: { rjRms_UI: 0.015, djPp_UI: 0.1 },
      tx: { pre: 0, post: 1, step: 0.05 },
      ctle: { gDc_dB: [-9, 0, 1], fz_Hz: 2.578e9, fp1_Hz: 2.578e9, fp2_Hz: 10.3125e9 },
      dfe: { taps: 0 },
      clocking: { scheme: "recovered", policy: "centre" },
    },
  },
];

/** The first starting point, with defaults applied: what a new budget form shows. */
export function defaultBudget(): Budget {
  return budgetSchema.parse(budgetPresets[0].budget);
}

// ——— The form ———————————————————————————————————————————————————————————————————————————————

/** One input of the budget form. `path` is where its value goes in the budget (dots, indices). */
export interface FieldSpec {
  path: string;
  label: string;
  /** The unit shown to people. */
  unit?: string;
  /** Display value = SI value / scale (e.g. 1e-3 shows volts as mV). */
  scale?: number;
  kind: "number" | "int" | "ber" | "select" | "list";
  options?: { value: string; label: string }[];
  /** Empty means "leave it out" (the schema's default or none). */
  optional?: boolean;
  placeholder?: string;
  help: string;
}

export interface FieldGroup {
  title: string;
  intro?: string;
  fields: FieldSpec[];
}

export const budgetForm: FieldGroup[] = [
  {
    title: "Signalling",
    fields: [
      { path: "modulation", label: "Modulation", kind: "select", options: [{ value: "nrz", label: "NRZ" }, { value: "pam4", label: "PAM4" }], help: "NRZ carries one bit per symbol; PAM4 two, with eyes a third as tall." },
      { path: "bitRate_bps", label: "Bit rate", unit: "Gb/s", scale: 1e9, kind: "number", optional: true, help: "When given, a run checks that the channel was derived for this rate." },
      { path: "txSwing_Vppd", label: "Transmit swing", unit: "mVppd", scale: 1e-3, kind: "number", help: "Peak-to-peak differential swing; symbols drive ± half of it." },
      { path: "targetBer", label: "Target BER", kind: "ber", help: "Error ratio at which eye height and width are measured, e.g. 1e-12 (NRZ) or 1e-6 (PAM4 ahead of FEC)." },
    ],
  },
  {
    title: "Receiver and limiter",
    fields: [
      { path: "noiseRms_V", label: "Noise at the limiter", unit: "mV rms", scale: 1e-3, kind: "number", help: "Gaussian noise at the limiting amplifier's input, after the CTLE (not shaped by it)." },
      { path: "inputNoiseRms_V", label: "Front-end noise", unit: "mV rms", scale: 1e-3, kind: "number", optional: true, placeholder: "0", help: "Noise ahead of the CTLE; scaled by the CTLE's noise gain up to Nyquist." },
      { path: "limiterSensitivity_V", label: "Limiter sensitivity", unit: "mV", scale: 1e-3, kind: "number", help: "Smallest eye the limiting amplifier resolves (after offset calibration typically 5–20 mV)." },
      { path: "requiredHeadroom_V", label: "Required headroom", unit: "mV", scale: 1e-3, kind: "number", optional: true, placeholder: "0", help: "Limiter headroom the link must keep; below it the verdict flags the link." },
    ],
  },
  {
    title: "Jitter",
    intro: "Dual-Dirac model of the transmitted data's jitter.",
    fields: [
      { path: "jitter.rjRms_UI", label: "Random jitter", unit: "UI rms", kind: "number", optional: true, placeholder: "0", help: "Gaussian jitter, rms, e.g. 0.01 UI." },
      { path: "jitter.djPp_UI", label: "Deterministic jitter", unit: "UI pp", kind: "number", optional: true, placeholder: "0", help: "Bounded jitter, peak to peak (the dual-Dirac separation), e.g. 0.05 UI." },
    ],
  },
  {
    title: "Transmit FIR",
    intro: "Taps are fractions of the peak swing; their magnitudes sum to at most 1.",
    fields: [
      { path: "tx.pre", label: "Pre-cursor taps", kind: "int", help: "0 … 4; one pre-cursor tap gives pre-shoot." },
      { path: "tx.post", label: "Post-cursor taps", kind: "int", help: "0 … 8; post-cursor taps give de-emphasis." },
      { path: "tx.step", label: "Tap step", kind: "number", optional: true, placeholder: "continuous", help: "The DAC's resolution as a fraction of the swing, e.g. 0.025 (1/40); empty for continuous taps." },
      { path: "tx.ranges", label: "Per-tap ranges", kind: "list", optional: true, placeholder: "-0.25..0; 0.5..1; -0.4..0", help: "Optional, earliest tap first: min..max for each tap, separated by semicolons." },
    ],
  },
  {
    title: "CTLE",
    intro: "The Annex 93A continuous-time form: a zero, two poles and an optional low-frequency stage. The run searches the gain grid.",
    fields: [
      { path: "ctle.gDc_dB.0", label: "DC gain from", unit: "dB", kind: "number", help: "Lowest DC gain of the grid (most peaking), e.g. −12." },
      { path: "ctle.gDc_dB.1", label: "DC gain to", unit: "dB", kind: "number", help: "Highest DC gain (least peaking), usually 0." },
      { path: "ctle.gDc_dB.2", label: "DC gain step", unit: "dB", kind: "number", help: "Grid step, e.g. 1 dB." },
      { path: "ctle.fz_Hz", label: "Zero", unit: "GHz", scale: 1e9, kind: "number", help: "Zero frequency; often baud/4 (NRZ) or baud/2.5." },
      { path: "ctle.fp1_Hz", label: "First pole", unit: "GHz", scale: 1e9, kind: "number", help: "Usually equal to the zero." },
      { path: "ctle.fp2_Hz", label: "Second pole", unit: "GHz", scale: 1e9, kind: "number", help: "Usually the baud rate." },
      { path: "ctle.gDc2_dB", label: "Low-frequency gain", unit: "dB", kind: "list", optional: true, placeholder: "none", help: "Optional second stage: a fixed gain (e.g. −2) or a grid min..max..step (e.g. -4..0..1)." },
      { path: "ctle.fLf_Hz", label: "Low-frequency corner", unit: "GHz", scale: 1e9, kind: "number", optional: true, placeholder: "none", help: "Pole/zero of the second stage, e.g. baud/40; needed when its gain is not 0." },
    ],
  },
  {
    title: "DFE",
    fields: [
      { path: "dfe.taps", label: "DFE taps", kind: "int", help: "0 … 32; each cancels one post-cursor at the sampler." },
      { path: "dfe.limits_V", label: "Tap limits", unit: "mV", scale: 1e-3, kind: "list", optional: true, placeholder: "no limit", help: "Largest |tap| at the limiter input: one value for every tap or one per tap (e.g. 100; 50; 50)." },
    ],
  },
  {
    title: "Clocking",
    fields: [
      { path: "clocking.scheme", label: "Clock", kind: "select", options: [{ value: "recovered", label: "Recovered (CDR)" }, { value: "forwarded", label: "Forwarded" }], help: "A forwarded clock cancels correlated transmit jitter up to its tracking bandwidth; a CDR tracks only inside its loop bandwidth." },
      { path: "clocking.bandwidth_Hz", label: "Tracking bandwidth", unit: "MHz", scale: 1e6, kind: "number", optional: true, placeholder: "default", help: "Loop or tracking bandwidth; empty for baud/1667 (CDR) or baud/10 (forwarded)." },
      {
        path: "clocking.policy",
        label: "Sampling phase",
        kind: "select",
        options: [
          { value: "centre", label: "Eye centre" },
          { value: "max-height", label: "Maximum height" },
          { value: "mueller-muller", label: "Mueller–Müller" },
        ],
        help: "Where the receiver samples: the eye's centre, its tallest point, or the baud-rate Mueller–Müller criterion.",
      },
    ],
  },
];

export type Draft = Record<string, string>;

function getPath(obj: unknown, path: string): unknown {
  return path.split(".").reduce<unknown>((o, k) => (o && typeof o === "object" ? (o as Record<string, unknown>)[k] : undefined), obj);
}

function setPath(obj: Record<string, unknown>, path: string, value: unknown) {
  const keys = path.split(".");
  let o: Record<string, unknown> = obj;
  keys.slice(0, -1).forEach((k, i) => {
    if (o[k] === undefined) o[k] = /^\d+$/.test(keys[i + 1]) ? [] : {};
    o = o[k] as Record<string, unknown>;
  });
  o[keys[keys.length - 1]] = value;
}

const round = (v: number) => Number(v.toPrecision(12));
const display = (v: number, scale = 1) => String(round(v / scale));

/** The form's text values for a budget (display units). */
export function draftFromBudget(budget: BudgetInput): Draft {
  const draft: Draft = {};
  for (const g of budgetForm) {
    for (const f of g.fields) {
      const v = getPath(budget, f.path);
      if (v === undefined || v === null) draft[f.path] = "";
      else if (f.path === "tx.ranges") draft[f.path] = (v as [number, number][]).map(([a, b]) => `${a}..${b}`).join("; ");
      else if (f.path === "ctle.gDc2_dB") draft[f.path] = Array.isArray(v) ? v.join("..") : String(v);
      else if (Array.isArray(v)) draft[f.path] = v.map((x) => display(x, f.scale)).join("; ");
      else if (typeof v === "number") draft[f.path] = f.kind === "ber" ? v.toExponential().replace(/\.?0+e/, "e").replace("e+", "e") : display(v, f.scale);
      else draft[f.path] = String(v);
    }
  }
  return draft;
}

/** A text value that is not a number stays a string, so that the schema names the field at fault. */
function num(text: string, scale = 1): number | string {
  const t = text.trim().replace(/^−/, "-");
  if (t === "" || !Number.isFinite(Number(t))) return text;
  return round(Number(t) * scale);
}

/** The budget object (SI units) for the form's text values; the schema then validates it. */
export function budgetFromDraft(draft: Draft): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const g of budgetForm) {
    for (const f of g.fields) {
      const text = (draft[f.path] ?? "").trim();
      if (text === "" && f.optional) continue;
      let value: unknown;
      if (f.kind === "select") value = text;
      else if (f.path === "tx.ranges") value = text.split(";").filter((s) => s.trim()).map((r) => r.split("..").map((x) => num(x)));
      else if (f.path === "ctle.gDc2_dB") value = text.includes("..") ? text.split("..").map((x) => num(x)) : num(text);
      else if (f.kind === "list") {
        const parts = text.split(/[;,]/).filter((s) => s.trim()).map((x) => num(x, f.scale));
        value = parts.length === 1 ? parts[0] : parts;
      } else value = num(text, f.scale);
      setPath(out, f.path, value);
    }
  }
  return out;
}

/** The form field an error path belongs to: the field itself, the field it lies inside, or the first field under it. */
export function fieldForPath(path: string): string | undefined {
  const all = budgetForm.flatMap((g) => g.fields.map((f) => f.path));
  if (all.includes(path)) return path;
  const inside = all.filter((p) => path.startsWith(`${p}.`)).sort((a, b) => b.length - a.length)[0];
  return inside ?? all.find((p) => p.startsWith(`${path}.`));
}

/** Short description of a budget for lists: "NRZ 28 Gb/s · 1+2 FIR · CTLE −12…0 dB · 5 DFE". */
export function budgetSummary(b: Budget): string {
  const rate = b.bitRate_bps ? ` ${Number((b.bitRate_bps / 1e9).toPrecision(6))} Gb/s` : "";
  const [lo, hi] = b.ctle.gDc_dB;
  return `${b.modulation.toUpperCase()}${rate} · FIR ${b.tx.pre}+1+${b.tx.post} · CTLE ${lo}…${hi} dB · ${b.dfe.taps} DFE tap${b.dfe.taps === 1 ? "" : "s"} · BER ${b.targetBer.toExponential(0)}`;
}
