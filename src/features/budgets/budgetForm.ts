// The budget form's model: its fields grouped as the form shows them (path in the budget, label,
// display unit and scale, kind, help), and the conversions between the form's text in display
// units and the budget's SI values. Each kind of field has one codec; no field is special-cased.
import type { BudgetInput } from "@lib/contract/budget";

/**
 * How a field's text reads and writes its value: `number`/`int` (scaled), `ber` (shown as 1e-12),
 * `select` (one of `options`), `list` (one value or several, separated by ; or ,), `ranges` (tap
 * ranges `min..max; min..max`), `gain-or-grid` (a gain, or a grid `min..max..step`).
 */
export type FieldKind = "number" | "int" | "ber" | "select" | "list" | "ranges" | "gain-or-grid";

/** One input of the budget form. `path` is where its value goes in the budget (dots, indices). */
export interface FieldSpec {
  path: string;
  label: string;
  /** The unit shown to people. */
  unit?: string;
  /** Display value = SI value / scale (e.g. 1e-3 shows volts as mV). */
  scale?: number;
  kind: FieldKind;
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

/** The fields of one side's package (both sides have the same model). */
function packageFields(side: "tx" | "rx", who: "Transmitter" | "Receiver"): FieldSpec[] {
  return [
    {
      path: `package.${side}`,
      label: `${who} package`,
      kind: "select",
      options: [
        { value: "", label: "None (ideal pins)" },
        { value: "model", label: "Package model" },
      ],
      help: "A transmission-line trace between pad and die capacitances, terminated against the reference (IEEE 802.3 Annex 93A form); empty fields take that annex's values.",
    },
    {
      path: `package.${side}.dieCapacitance_F`,
      label: `${who} die capacitance`,
      unit: "fF",
      scale: 1e-15,
      kind: "number",
      optional: true,
      placeholder: "250",
      help: "Capacitance at the die, single-ended.",
    },
    {
      path: `package.${side}.padCapacitance_F`,
      label: `${who} pad capacitance`,
      unit: "fF",
      scale: 1e-15,
      kind: "number",
      optional: true,
      placeholder: "180",
      help: "Capacitance at the board pad, single-ended.",
    },
    {
      path: `package.${side}.traceLength_m`,
      label: `${who} package trace`,
      unit: "mm",
      scale: 1e-3,
      kind: "number",
      optional: true,
      placeholder: "12",
      help: "Length of the package's transmission line.",
    },
    {
      path: `package.${side}.traceImpedance_Ohm`,
      label: `${who} trace impedance`,
      unit: "Ω",
      kind: "number",
      optional: true,
      placeholder: "78.2",
      help: "Single-ended impedance of the package trace.",
    },
    {
      path: `package.${side}.termination_Ohm`,
      label: `${who} termination`,
      unit: "Ω",
      kind: "number",
      optional: true,
      placeholder: "55",
      help: "On-die termination, single-ended, against a 50 Ω reference: Γ = (R − 50)/(R + 50).",
    },
  ];
}

export const budgetForm: FieldGroup[] = [
  {
    title: "Signalling",
    fields: [
      {
        path: "modulation",
        label: "Modulation",
        kind: "select",
        options: [
          { value: "nrz", label: "NRZ" },
          { value: "pam4", label: "PAM4" },
        ],
        help: "NRZ carries one bit per symbol; PAM4 two, with eyes a third as tall.",
      },
      {
        path: "bitRate_bps",
        label: "Bit rate",
        unit: "Gb/s",
        scale: 1e9,
        kind: "number",
        optional: true,
        help: "When given, a run checks that the channel was derived for this rate.",
      },
      {
        path: "txSwing_Vppd",
        label: "Transmit swing",
        unit: "mVppd",
        scale: 1e-3,
        kind: "number",
        help: "Peak-to-peak differential swing; symbols drive ± half of it.",
      },
      {
        path: "targetBer",
        label: "Target BER",
        kind: "ber",
        help: "Error ratio at which eye height and width are measured, e.g. 1e-12 (NRZ) or 1e-6 (PAM4 ahead of FEC).",
      },
    ],
  },
  {
    title: "Receiver and limiter",
    fields: [
      {
        path: "noiseRms_V",
        label: "Noise at the limiter",
        unit: "mV rms",
        scale: 1e-3,
        kind: "number",
        help: "Gaussian noise at the limiting amplifier's input, after the CTLE (not shaped by it).",
      },
      {
        path: "inputNoiseRms_V",
        label: "Front-end noise",
        unit: "mV rms",
        scale: 1e-3,
        kind: "number",
        optional: true,
        placeholder: "0",
        help: "Noise ahead of the CTLE; scaled by the CTLE's noise gain up to Nyquist.",
      },
      {
        path: "limiterSensitivity_V",
        label: "Limiter sensitivity",
        unit: "mV",
        scale: 1e-3,
        kind: "number",
        help: "Smallest eye the limiting amplifier resolves (after offset calibration typically 5–20 mV).",
      },
      {
        path: "requiredHeadroom_V",
        label: "Required headroom",
        unit: "mV",
        scale: 1e-3,
        kind: "number",
        optional: true,
        placeholder: "0",
        help: "Limiter headroom the link must keep; below it the verdict flags the link.",
      },
    ],
  },
  {
    title: "Jitter",
    intro: "Dual-Dirac model of the transmitted data's jitter.",
    fields: [
      {
        path: "jitter.rjRms_UI",
        label: "Random jitter",
        unit: "UI rms",
        kind: "number",
        optional: true,
        placeholder: "0",
        help: "Gaussian jitter, rms, e.g. 0.01 UI.",
      },
      {
        path: "jitter.djPp_UI",
        label: "Deterministic jitter",
        unit: "UI pp",
        kind: "number",
        optional: true,
        placeholder: "0",
        help: "Bounded jitter, peak to peak (the dual-Dirac separation), e.g. 0.05 UI.",
      },
    ],
  },
  {
    title: "Transmit FIR",
    intro: "Taps are fractions of the peak swing; their magnitudes sum to at most 1.",
    fields: [
      { path: "tx.pre", label: "Pre-cursor taps", kind: "int", help: "0 … 4; one pre-cursor tap gives pre-shoot." },
      { path: "tx.post", label: "Post-cursor taps", kind: "int", help: "0 … 8; post-cursor taps give de-emphasis." },
      {
        path: "tx.step",
        label: "Tap step",
        kind: "number",
        optional: true,
        placeholder: "continuous",
        help: "The DAC's resolution as a fraction of the swing, e.g. 0.025 (1/40); empty for continuous taps.",
      },
      {
        path: "tx.ranges",
        label: "Per-tap ranges",
        kind: "ranges",
        optional: true,
        placeholder: "-0.25..0; 0.5..1; -0.4..0",
        help: "Optional, earliest tap first: min..max for each tap, separated by semicolons.",
      },
    ],
  },
  {
    title: "CTLE",
    intro:
      "The Annex 93A continuous-time form: a zero, two poles and an optional low-frequency stage. The run searches the gain grid.",
    fields: [
      {
        path: "ctle.gDc_dB.0",
        label: "DC gain from",
        unit: "dB",
        kind: "number",
        help: "Lowest DC gain of the grid (most peaking), e.g. −12.",
      },
      {
        path: "ctle.gDc_dB.1",
        label: "DC gain to",
        unit: "dB",
        kind: "number",
        help: "Highest DC gain (least peaking), usually 0.",
      },
      { path: "ctle.gDc_dB.2", label: "DC gain step", unit: "dB", kind: "number", help: "Grid step, e.g. 1 dB." },
      {
        path: "ctle.fz_Hz",
        label: "Zero",
        unit: "GHz",
        scale: 1e9,
        kind: "number",
        help: "Zero frequency; often baud/4 (NRZ) or baud/2.5.",
      },
      {
        path: "ctle.fp1_Hz",
        label: "First pole",
        unit: "GHz",
        scale: 1e9,
        kind: "number",
        help: "Usually equal to the zero.",
      },
      {
        path: "ctle.fp2_Hz",
        label: "Second pole",
        unit: "GHz",
        scale: 1e9,
        kind: "number",
        help: "Usually the baud rate.",
      },
      {
        path: "ctle.gDc2_dB",
        label: "Low-frequency gain",
        unit: "dB",
        kind: "gain-or-grid",
        optional: true,
        placeholder: "none",
        help: "Optional second stage: a fixed gain (e.g. −2) or a grid min..max..step (e.g. -4..0..1).",
      },
      {
        path: "ctle.fLf_Hz",
        label: "Low-frequency corner",
        unit: "GHz",
        scale: 1e9,
        kind: "number",
        optional: true,
        placeholder: "none",
        help: "Pole/zero of the second stage, e.g. baud/40; needed when its gain is not 0.",
      },
    ],
  },
  {
    title: "DFE",
    fields: [
      {
        path: "dfe.taps",
        label: "DFE taps",
        kind: "int",
        help: "0 … 32; each cancels one post-cursor at the sampler.",
      },
      {
        path: "dfe.limits_V",
        label: "Tap limits",
        unit: "mV",
        scale: 1e-3,
        kind: "list",
        optional: true,
        placeholder: "no limit",
        help: "Largest |tap| at the limiter input: one value for every tap or one per tap (e.g. 100; 50; 50).",
      },
    ],
  },
  {
    title: "Packages and receiver front end",
    intro:
      "Optional: applied to the channel and to every aggressor before the CTLE. Leave a package at None for ideal pins.",
    fields: [
      ...packageFields("tx", "Transmitter"),
      ...packageFields("rx", "Receiver"),
      {
        path: "frontEnd.rxBandwidth_Hz",
        label: "Receiver bandwidth",
        unit: "GHz",
        scale: 1e9,
        kind: "number",
        optional: true,
        placeholder: "none",
        help: "−3 dB frequency of a 4th-order Butterworth filter at the receiver (IEEE 802.3 Annex 93A form); 0.75 × baud is usual.",
      },
    ],
  },
  {
    title: "Receive FFE",
    intro:
      "Optional: a feed-forward filter after the CTLE, designed per CTLE setting as the feed-forward part of an MMSE-DFE against the noise and crosstalk that reach it.",
    fields: [
      {
        path: "ffe.pre",
        label: "FFE pre-cursor taps",
        kind: "int",
        optional: true,
        placeholder: "none",
        help: "0 … 8; leave both empty for no FFE.",
      },
      {
        path: "ffe.post",
        label: "FFE post-cursor taps",
        kind: "int",
        optional: true,
        placeholder: "none",
        help: "0 … 16.",
      },
    ],
  },
  {
    title: "Clocking",
    fields: [
      {
        path: "clocking.scheme",
        label: "Clock",
        kind: "select",
        options: [
          { value: "recovered", label: "Recovered (CDR)" },
          { value: "forwarded", label: "Forwarded" },
        ],
        help: "A forwarded clock cancels correlated transmit jitter up to its tracking bandwidth; a CDR tracks only inside its loop bandwidth.",
      },
      {
        path: "clocking.bandwidth_Hz",
        label: "Tracking bandwidth",
        unit: "MHz",
        scale: 1e6,
        kind: "number",
        optional: true,
        placeholder: "default",
        help: "Loop or tracking bandwidth; empty for baud/1667 (CDR) or baud/10 (forwarded).",
      },
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
  return path
    .split(".")
    .reduce<unknown>((o, k) => (o && typeof o === "object" ? (o as Record<string, unknown>)[k] : undefined), obj);
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

/** A text value that is not a number stays a string, so that the schema names the field at fault. */
function num(text: string, scale = 1): number | string {
  const t = text.trim().replace(/^−/, "-");
  if (t === "" || !Number.isFinite(Number(t))) return text;
  return round(Number(t) * scale);
}

/** A value for people: numbers in display units, lists joined with "; ". */
function plainText(v: unknown, f: FieldSpec): string {
  if (Array.isArray(v)) return v.map((x) => display(x, f.scale)).join("; ");
  return typeof v === "number" ? display(v, f.scale) : String(v);
}

/** Text ↔ value, per kind of field (values in SI units, text in the field's display unit). */
const codecs: Record<
  FieldKind,
  { toText(v: unknown, f: FieldSpec): string; fromText(text: string, f: FieldSpec): unknown }
> = {
  number: { toText: plainText, fromText: (t, f) => num(t, f.scale) },
  int: { toText: plainText, fromText: (t, f) => num(t, f.scale) },
  ber: {
    toText: (v, f) =>
      typeof v === "number"
        ? v
            .toExponential()
            .replace(/\.?0+e/, "e")
            .replace("e+", "e")
        : plainText(v, f),
    fromText: (t) => num(t),
  },
  select: { toText: plainText, fromText: (t) => t },
  list: {
    toText: plainText,
    fromText: (t, f) => {
      const parts = t
        .split(/[;,]/)
        .filter((s) => s.trim())
        .map((x) => num(x, f.scale));
      return parts.length === 1 ? parts[0] : parts;
    },
  },
  ranges: {
    toText: (v) => (v as [number, number][]).map(([a, b]) => `${a}..${b}`).join("; "),
    fromText: (t) =>
      t
        .split(";")
        .filter((s) => s.trim())
        .map((r) => r.split("..").map((x) => num(x))),
  },
  "gain-or-grid": {
    toText: (v) => (Array.isArray(v) ? v.join("..") : String(v)),
    fromText: (t) => (t.includes("..") ? t.split("..").map((x) => num(x)) : num(t)),
  },
};

/** The select that includes a package ("package.tx" / "package.rx"); its detail fields lie under it. */
function isPackageSwitch(path: string): boolean {
  return path === "package.tx" || path === "package.rx";
}

/** The form's text values for a budget (display units). */
export function draftFromBudget(budget: BudgetInput): Draft {
  const draft: Draft = {};
  for (const f of budgetForm.flatMap((g) => g.fields)) {
    const v = getPath(budget, f.path);
    if (isPackageSwitch(f.path)) draft[f.path] = v === undefined || v === null ? "" : "model";
    else draft[f.path] = v === undefined || v === null ? "" : codecs[f.kind].toText(v, f);
  }
  return draft;
}

/** The budget object (SI units) for the form's text values; the schema then validates it. */
export function budgetFromDraft(draft: Draft): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const f of budgetForm.flatMap((g) => g.fields)) {
    const text = (draft[f.path] ?? "").trim();
    if (isPackageSwitch(f.path)) {
      // "model" includes the package (the schema fills its fields from Annex 93A); "" leaves it out.
      if (text !== "") setPath(out, f.path, {});
      continue;
    }
    const within = /^package\.(tx|rx)\./.exec(f.path);
    if (within && (draft[`package.${within[1]}`] ?? "").trim() === "") continue;
    if (text === "" && f.optional) continue;
    setPath(out, f.path, codecs[f.kind].fromText(text, f));
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
