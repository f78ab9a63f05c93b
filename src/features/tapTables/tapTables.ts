// Tap tables: the request schemas (API and forms), the shapes a version stores and the API answers,
// and small presentation helpers. No server code here: islands import this file.
import { z } from "zod";
import type { BudgetInput } from "@lib/contract/budget";
import type { ChannelKind, StoredPulse } from "@/features/channels/channels";
import type { Corner } from "@lib/contract/corner";
import type { RunAggressor } from "@/features/runs/runs";
import type { EyeFigure } from "@lib/run";
import { architectureSchema, type Architecture } from "@/features/studies/architecture";
import { registerMapSchema, type RegisterField } from "./registerMap";

export { architectureSchema, type Architecture };

/** computing → ready → in-review → approved (frozen) | changes-requested; failed when the job failed (the schema's enum). */
export const versionStates = ["computing", "failed", "ready", "in-review", "approved", "changes-requested"] as const;
export type VersionState = (typeof versionStates)[number];

const name = z
  .string({ error: "Give the tap table a name." })
  .trim()
  .min(1, "Give the tap table a name.")
  .max(200, "Keep the name under 200 characters.");
const note = z.string().trim().max(2000, "Keep the note under 2000 characters.");
const channelIds = z
  .array(z.int({ error: "Channel ids are whole numbers." }).positive(), {
    error: "Give the channels as a list of ids.",
  })
  .min(1, "Choose at least one channel.")
  .max(200, "A tap table covers at most 200 channels.")
  .refine((ids) => new Set(ids).size === ids.length, "A channel appears twice; list each channel once.");

/** Largest number of channel classes in one table. */
export const MAX_CLASSES = 16;

const edgesSchema = z
  .array(
    z
      .number({ error: "Bin edges are numbers of dB." })
      .min(0, "Bin edges are ≥ 0 dB.")
      .max(80, "Bin edges are ≤ 80 dB."),
    {
      error: "Give the bin edges in dB, e.g. [12, 20, 28].",
    },
  )
  .max(MAX_CLASSES - 1, `At most ${MAX_CLASSES - 1} edges (${MAX_CLASSES} classes).`)
  .refine((e) => e.every((x, i) => i === 0 || x > e[i - 1]), "Bin edges must ascend, e.g. [12, 20, 28].");

/**
 * How channels are grouped into classes: by insertion loss at Nyquist in bins (edges in dB, each
 * class holding `lo ≤ loss < hi`), or by hand (named classes listing their channels).
 */
export const groupingSchema = z.discriminatedUnion(
  "mode",
  [
    z.object({
      mode: z.literal("loss-bins"),
      channelIds,
      edges_dB: edgesSchema,
    }),
    z.object({
      mode: z.literal("manual"),
      classes: z
        .array(
          z.object({
            name: z.string().trim().min(1, "Name every class.").max(100, "Keep class names under 100 characters."),
            channelIds,
          }),
        )
        .min(1, "Give at least one class.")
        .max(MAX_CLASSES, `At most ${MAX_CLASSES} classes.`)
        .refine(
          (cs) => new Set(cs.map((c) => c.name.toLowerCase())).size === cs.length,
          "Two classes have the same name.",
        )
        .refine((cs) => {
          const all = cs.flatMap((c) => c.channelIds);
          return new Set(all).size === all.length;
        }, "A channel is in two classes; put each channel in one class."),
    }),
  ],
  { error: 'grouping.mode must be "loss-bins" or "manual".' },
);
export type Grouping = z.infer<typeof groupingSchema>;

/** POST /api/v1/tap-tables: a new table and its first version. */
export const createTapTableRequest = z.object({
  name,
  description: z.string().trim().max(2000).optional(),
  budgetId: z.int({ error: "Choose a budget." }).positive(),
  /** The study whose recorded decision gives the architecture; or give `architecture` by hand. */
  studyId: z.int().positive().optional(),
  architecture: architectureSchema.optional(),
  registerMap: registerMapSchema.optional(),
  grouping: groupingSchema,
  /** A finished sweep whose corners every class default must hold at (the worst over channels and corners). */
  sweepId: z.int({ error: "The sweep id is a whole number." }).positive().optional(),
  note: note.optional(),
});
export type CreateTapTableRequest = z.infer<typeof createTapTableRequest>;

/** POST /api/v1/tap-tables/:id/versions: a new version; what is left out is taken from the latest one. */
export const createVersionRequest = z
  .object({
    budgetId: z.int().positive().optional(),
    studyId: z.int().positive().optional(),
    architecture: architectureSchema.optional(),
    registerMap: registerMapSchema.optional(),
    grouping: groupingSchema.optional(),
    /** New loss-bin edges for the same channels (instead of a whole grouping). */
    edges_dB: edgesSchema.optional(),
    /** The corners of this sweep (null: none); left out, the latest version's corners are kept. */
    sweepId: z
      .int({ error: "The sweep id is a whole number, or null for no corners." })
      .positive()
      .nullable()
      .optional(),
    note: note.optional(),
  })
  .refine((r) => !(r.grouping && r.edges_dB), {
    message: "Give either grouping or edges_dB, not both.",
    path: ["edges_dB"],
  });
export type CreateVersionRequest = z.infer<typeof createVersionRequest>;

/** PUT /api/v1/tap-tables/:id/versions/:v: edit a version that is not frozen or in review. */
export const updateVersionRequest = z
  .object({ note: note.optional(), registerMap: registerMapSchema.optional() })
  .refine((r) => r.note !== undefined || r.registerMap !== undefined, "Give a note or a registerMap to change.");
export type UpdateVersionRequest = z.infer<typeof updateVersionRequest>;

export const exportFormats = ["csv", "json", "c"] as const;
export type ExportFormat = (typeof exportFormats)[number];
export const exportQuery = z.object({
  format: z.enum(exportFormats, { error: 'format must be "csv", "json" or "c".' }).default("json"),
});

export const tapTableParams = z.object({
  id: z.coerce.number({ error: "The table id must be a number." }).int().positive(),
});
export const versionParams = tapTableParams.extend({
  v: z.coerce.number({ error: "The version must be a number (1, 2, …)." }).int().positive(),
});
export const listQuery = z.object({
  limit: z.coerce.number().int().min(1).max(200).default(50),
  cursor: z.coerce.number().int().positive().optional(),
});

/** A channel as a version keeps it (a copy taken when the version was created). */
export interface VersionChannel {
  id: number;
  name: string;
  lossAtNyquist_dB: number | null;
  pulse: StoredPulse;
  /** What the channel was made of, to rebuild it at the corners' losses (absent in older versions). */
  kind?: ChannelKind;
  derivation?: Record<string, unknown>;
  /** Its aggressors (crosstalk pulses at the receiver's pins), when it has any. */
  aggressors?: RunAggressor[];
}

/** One class as a version keeps it. */
export interface VersionClass {
  name: string;
  /** `[lo, hi)` in dB for loss bins (null ends are open); null for classes made by hand. */
  lossRange_dB: [number | null, number | null] | null;
  channels: VersionChannel[];
}

/** What a version was computed from, copied at its creation so that it never changes afterwards. */
export interface VersionInputs {
  budget: { id: number; name: string; params: BudgetInput };
  architecture: Architecture;
  /** The study and its decision record, when the architecture came from one. */
  study: {
    id: number;
    name: string;
    decision: { candidateKey: string; rationale: string; decidedBy: string | null; decidedAt: string | null };
  } | null;
  registerMap: RegisterField[];
  grouping: { mode: Grouping["mode"]; edges_dB?: number[] };
  classes: VersionClass[];
  /** The corners every default must hold at (taken from a sweep), or null (absent in older versions). */
  corners?: Corner[] | null;
  sweep?: { id: number; name: string } | null;
}

/** A channel's figures in a computed version. */
export interface ChannelHeadroom {
  id: number;
  name: string;
  lossAtNyquist_dB: number | null;
  /** Limiter headroom with the class default (quantized), volts. */
  defaultHeadroom_V: number;
  /** Limiter headroom with the channel's own optimum, volts. */
  ownHeadroom_V: number;
  /** Eye height at the target BER with the class default, volts. */
  defaultEyeHeight_V: number;
  /** The channel's own optimum setting (transmit FIR taps and CTLE gains). */
  own: { tx: number[]; ctle: { gDc_dB: number; gDc2_dB: number } };
  /**
   * With corners: the corner that binds the channel under its class default (its figures above are
   * at that corner), and the figures at every corner.
   */
  worstCorner?: string;
  corners?: { name: string; defaultHeadroom_V: number; ownHeadroom_V: number }[];
  /** Crosstalk rms at the sampler with the class default, all its aggressors together (absent: none), volts. */
  crosstalkRms_V?: number;
}

/** One class's result: its default in codes and physical values, and its channels. */
export interface ClassResult {
  index: number;
  name: string;
  lossRange_dB: [number | null, number | null] | null;
  codes: Record<string, number>;
  values: Record<string, number>;
  worstHeadroom_V: number;
  channels: ChannelHeadroom[];
}

/**
 * The worst channel of the whole table under its class default, with the engine's tuning-run eyes
 * of that setting: at the receiver's input (the default's transmit FIR applied, before the CTLE
 * and DFE) and at the limiter (CTLE, the DFE adapted).
 */
export interface WorstEye {
  channelId: number;
  channelName: string;
  className: string;
  /** The corner it is worst at, with corners. */
  corner?: string;
  headroom_V: number;
  eyeHeight_V: number;
  before: EyeFigure;
  after: EyeFigure;
}

/** One voltage extent for two eyes, so that before and after compare at a glance. */
export function sharedVoltageDomain(a: EyeFigure, b: EyeFigure): [number, number] {
  const all = [...a.image.voltage_V, ...b.image.voltage_V];
  return [Math.min(...all), Math.max(...all)];
}

/** What a computed version holds. */
export interface VersionResult {
  engineVersion: string;
  requiredHeadroom_V: number;
  targetBer: number;
  classes: ClassResult[];
  worstEye: WorstEye;
}

export const stateLabels: Record<VersionState, string> = {
  computing: "Computing",
  failed: "Failed",
  ready: "Ready for sign-off",
  "in-review": "In review",
  approved: "Signed off",
  "changes-requested": "Changes requested",
};

/** Badge classes per state (theme tokens). */
export const stateBadge: Record<VersionState, string> = {
  computing: "bg-paper text-ink-soft",
  failed: "bg-bad-soft text-bad",
  ready: "bg-accent-soft text-accent-strong",
  "in-review": "bg-warn-soft text-warn",
  approved: "bg-good-soft text-good",
  "changes-requested": "bg-bad-soft text-bad",
};

/** Whether a version may still be edited (not frozen, not under review, not computing). */
export function isEditable(state: VersionState): boolean {
  return state === "ready" || state === "changes-requested" || state === "failed";
}

/** Whether a channel's headroom with its class default meets the budget's required headroom. */
export function meetsRequiredHeadroom(headroom_V: number, required_V: number): boolean {
  return headroom_V >= required_V;
}

/** A channel's row on the table and sign-off pages: its figures with its class default, its class, and whether it meets the requirement. */
export interface HeadroomRow extends ChannelHeadroom {
  className: string;
  meetsRequired: boolean;
}

/**
 * Every channel of a computed version with its class, classes in their order and the lowest loss
 * first within each (an unknown loss counts as 0), checked against the required headroom.
 */
export function headroomRows(classes: readonly ClassResult[], required_V: number): HeadroomRow[] {
  return classes.flatMap((c) =>
    [...c.channels]
      .sort((a, b) => (a.lossAtNyquist_dB ?? 0) - (b.lossAtNyquist_dB ?? 0))
      .map((ch) => ({
        ...ch,
        className: c.name,
        meetsRequired: meetsRequiredHeadroom(ch.defaultHeadroom_V, required_V),
      })),
  );
}

/** A loss range for people: "12–20 dB", "< 12 dB", "≥ 28 dB", "by hand". */
export function formatLossRange(range: [number | null, number | null] | null): string {
  if (!range) return "by hand";
  const [lo, hi] = range;
  if (lo === null && hi === null) return "all";
  if (lo === null) return `< ${hi} dB`;
  if (hi === null) return `≥ ${lo} dB`;
  return `${lo}–${hi} dB`;
}
