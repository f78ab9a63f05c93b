// Channels: request schemas (shared by the API and the upload form), the shapes the API answers,
// and small presentation helpers. No server code here: islands import this file.
import { z } from "zod";
import { modulationSchema } from "@lib/contract/common";
import type { InputQuality } from "@lib/channel";
import type { Modulation } from "@lib/types";
import { aggressorsField, aggressorSpecs, type AggressorView, type DerivedAggressor } from "./aggressors";

/** Where a channel's pulse came from (the database schema's `kind` column). */
export const channelKinds = ["pulse-csv", "step-csv", "impulse-csv", "touchstone", "synthetic"] as const;
export type ChannelKind = (typeof channelKinds)[number];

/** A pulse response as stored (plain JSON numbers; see lib/types.ts for the engine's form). */
export interface StoredPulse {
  ui_s: number;
  samplesPerUi: number;
  values_V: number[];
  mainIndex: number;
}

/** An insertion-loss curve as stored, for plotting. */
export interface StoredCurve {
  freqs_Hz: number[];
  magnitude_dB: number[];
}

/** How a pulse was derived: the modulation it was derived for, the loss model, the port pairing, the response kind… */
export interface ChannelDerivation {
  modulation?: Modulation;
  [detail: string]: unknown;
}

/** Largest uploaded file, in bytes (the API answers 413 above it). */
export const MAX_UPLOAD_BYTES = 50 * 1024 * 1024;
/** Samples per UI of every derived pulse. */
export const SAMPLES_PER_UI = 32;
/** UIs kept before and after the main cursor when a derived pulse is stored. */
export const PULSE_KEEP_UI = { pre: 16, post: 240 } as const;

/** The file kinds an upload may declare; Touchstone is recognised by its extension. */
export const fileKinds = ["pulse-csv", "step-csv", "impulse-csv", "touchstone"] as const;
export type FileKind = (typeof fileKinds)[number];

export const kindLabels: Record<ChannelKind, string> = {
  "pulse-csv": "Pulse response (CSV)",
  "step-csv": "Step response (CSV)",
  "impulse-csv": "Impulse response (CSV)",
  touchstone: "Touchstone",
  synthetic: "Synthetic loss model",
};

/** Unit interval in seconds for a bit rate and modulation (PAM4 carries two bits per symbol). */
export function unitInterval_s(bitRate_bps: number, modulation: Modulation): number {
  return (modulation === "pam4" ? 2 : 1) / bitRate_bps;
}

const name = z
  .string({ error: "Give the channel a name." })
  .trim()
  .min(1, "Give the channel a name.")
  .max(200, "Keep the name under 200 characters.");
const bitRateRange = (n: z.ZodNumber) =>
  n
    .min(1e8, "The bit rate must be at least 0.1 Gb/s (1e8 bit/s).")
    .max(4e11, "The bit rate must be at most 400 Gb/s (4e11 bit/s).");
const bitRateMessage = { error: "Give the bit rate in bit/s, e.g. 28e9." };
const program = z.string().trim().min(1).max(200).optional();

/** Which single-ended ports of a 4-port (or multi-port) file form the victim's input and output pairs. */
export const portPairsSchema = z
  .object({
    inP: z.int().min(1).max(64),
    inN: z.int().min(1).max(64),
    outP: z.int().min(1).max(64),
    outN: z.int().min(1).max(64),
  })
  .refine((p) => new Set([p.inP, p.inN, p.outP, p.outN]).size === 4, {
    message: "The four ports of the pairing must be different (e.g. 1,2 in and 3,4 out).",
  });
export type PortPairs = z.infer<typeof portPairsSchema>;

/** The common pairings of a 4-port file, offered as choices in the upload form. */
export const commonPairings: { label: string; pairs: PortPairs }[] = [
  { label: "1,2 → 3,4 (inputs on 1 and 2)", pairs: { inP: 1, inN: 2, outP: 3, outN: 4 } },
  { label: "1,3 → 2,4 (thrus 1→2 and 3→4)", pairs: { inP: 1, inN: 3, outP: 2, outN: 4 } },
];

/** `pairs` in a multipart form: JSON (`{"inP":1,…}`) or four port numbers (`1,2,3,4`). */
const pairsField = z
  .string()
  .trim()
  .transform((s, ctx) => {
    try {
      if (s.startsWith("{")) return JSON.parse(s) as unknown;
      const ports = s.split(/[\s,;]+/).map(Number);
      if (ports.length === 4) return { inP: ports[0], inN: ports[1], outP: ports[2], outN: ports[3] };
    } catch {
      /* reported below */
    }
    ctx.addIssue({
      code: "custom",
      message: 'Give pairs as JSON {"inP":1,"inN":2,"outP":3,"outN":4} or as "1,2,3,4".',
    });
    return z.NEVER;
  })
  .pipe(portPairsSchema);

/** The text fields of a multipart upload (`file` is read separately). */
export const uploadFields = z.object({
  name,
  bitRate_bps: z
    .string(bitRateMessage)
    .trim()
    .regex(/^[0-9.eE+-]+$/, "Give the bit rate in bit/s, e.g. 28e9.")
    .pipe(z.coerce.number())
    .pipe(bitRateRange(z.number(bitRateMessage))),
  modulation: modulationSchema.default("nrz"),
  kind: z.enum(fileKinds, { error: `kind must be one of ${fileKinds.join(", ")}.` }).optional(),
  pairs: pairsField.optional(),
  riseTime_s: z.coerce
    .number()
    .refine(Number.isFinite, "riseTime_s must be a number of seconds.")
    .min(0, "riseTime_s must be ≥ 0.")
    .max(1e-9, "riseTime_s must be at most 1 ns.")
    .optional(),
  program,
  aggressors: aggressorsField.optional(),
});
export type UploadFields = z.infer<typeof uploadFields>;

/** The synthetic line's parameters (the engine's loss-model source). */
export const lossModelSchema = z.object({
  lossAtNyquist_dB: z
    .number({ error: "lossAtNyquist_dB must be a number of dB." })
    .min(0.5, "The loss at Nyquist must be at least 0.5 dB.")
    .max(60, "The loss at Nyquist must be at most 60 dB."),
  delay_s: z.number().min(0, "delay_s must be ≥ 0.").max(20e-9, "delay_s must be at most 20 ns.").optional(),
  skinFraction: z
    .number()
    .min(0, "skinFraction must be between 0 and 1.")
    .max(1, "skinFraction must be between 0 and 1.")
    .optional(),
});
export type LossModel = z.infer<typeof lossModelSchema>;

/** POST /api/v1/channels as JSON: a synthetic channel. */
export const syntheticRequest = z.object({
  name,
  bitRate_bps: bitRateRange(z.number(bitRateMessage)),
  modulation: modulationSchema.default("nrz"),
  lossModel: lossModelSchema,
  program,
  aggressors: aggressorSpecs.optional(),
});
export type SyntheticRequest = z.infer<typeof syntheticRequest>;

export const sortKeys = ["name", "kind", "bitRate", "loss", "mainCursor", "createdBy", "createdAt"] as const;
export type SortKey = (typeof sortKeys)[number];

/** GET /api/v1/channels query. */
export const listQuery = z.object({
  limit: z.coerce.number().int().min(1).max(200).default(50),
  cursor: z.coerce.number().int().min(0).optional(),
  q: z.string().trim().max(200).optional(),
  kind: z.enum([...fileKinds, "synthetic"]).optional(),
  program: z.coerce.number().int().positive().optional(),
  sort: z.enum(sortKeys).default("createdAt"),
  dir: z.enum(["asc", "desc"]).default("desc"),
});
export type ListQuery = z.infer<typeof listQuery>;

export const idParams = z.object({ id: z.coerce.number({ error: "The id must be a number." }).int().positive() });

/** A row of the channel list. */
export interface ChannelListItem {
  id: number;
  name: string;
  kind: ChannelKind;
  program: string;
  bitRate_bps: number;
  modulation: Modulation;
  lossAtNyquist_dB: number | null;
  mainCursor_V: number;
  createdBy: string | null;
  createdAt: string | Date;
}

/** The uploaded file behind a channel. */
export interface ChannelSourceInfo {
  filename: string;
  contentType: string;
  bytes: number;
  sha256: string;
}

/** GET /api/v1/channels/:id. */
export interface ChannelDetail extends ChannelListItem {
  programId: number;
  pulse: StoredPulse;
  insertionLoss: StoredCurve | null;
  derivation: ChannelDerivation;
  source: ChannelSourceInfo | null;
  runCount: number;
  aggressors: AggressorView[];
  /** The judgement of the uploaded Touchstone file; null for other sources and older channels. */
  quality: InputQuality | null;
}

/** What the engine derived from a file or a loss model (the preview, and what a channel stores). */
export interface DerivedChannel {
  kind: ChannelKind;
  pulse: StoredPulse;
  insertionLoss: StoredCurve | null;
  lossAtNyquist_dB: number | null;
  mainCursor_V: number;
  derivation: ChannelDerivation;
  /** The judgement of a Touchstone file (see lib/channel inputQuality); null for other sources. */
  quality: InputQuality | null;
  /** The victim's aggressors (none for a lane alone). */
  aggressors: DerivedAggressor[];
}

/** Bit rate for people: "28 Gb/s", "106.25 Gb/s". */
export function formatBitRate(bps: number): string {
  return `${Number((bps / 1e9).toPrecision(6))} Gb/s`;
}

/** A value in dB with one decimal, or a dash. */
export function formatDb(value: number | null | undefined): string {
  return value === null || value === undefined ? "—" : `${value.toFixed(1)} dB`;
}

/** A byte count for people. */
export function formatBytes(n: number): string {
  if (n < 1024) return `${n} B`;
  if (n < 1024 * 1024) return `${(n / 1024).toFixed(1)} KiB`;
  return `${(n / 1024 / 1024).toFixed(1)} MiB`;
}

/**
 * The pulse as chart series: time in UI from the main cursor and values in mV, plus the
 * symbol-spaced cursors (every `samplesPerUi`-th sample from the main cursor) inside `[fromUi, toUi]`.
 */
export function pulseForChart(pulse: StoredPulse, fromUi: number, toUi: number) {
  const { samplesPerUi: spu, mainIndex, values_V } = pulse;
  const t: number[] = [];
  const v: number[] = [];
  const first = Math.max(0, Math.floor(mainIndex + fromUi * spu));
  const last = Math.min(values_V.length - 1, Math.ceil(mainIndex + toUi * spu));
  for (let i = first; i <= last; i++) {
    t.push((i - mainIndex) / spu);
    v.push(values_V[i] * 1e3);
  }
  const ct: number[] = [];
  const cv: number[] = [];
  for (let k = Math.ceil(fromUi); k <= Math.floor(toUi); k++) {
    const i = mainIndex + k * spu;
    if (i < 0 || i >= values_V.length) continue;
    ct.push(k);
    cv.push(values_V[i] * 1e3);
  }
  return { time_UI: t, values_mV: v, cursorTime_UI: ct, cursors_mV: cv };
}

/** UIs available before and after the main cursor (for the chart's range choices). */
export function pulseSpanUi(pulse: StoredPulse): { before: number; after: number } {
  return {
    before: Math.floor(pulse.mainIndex / pulse.samplesPerUi),
    after: Math.floor((pulse.values_V.length - 1 - pulse.mainIndex) / pulse.samplesPerUi),
  };
}
