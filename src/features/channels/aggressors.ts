// Aggressors of a channel: how an upload names them (a pair of the victim's multi-port file, a file
// of their own, or the coupling model), what the engine derives for each, and presentation helpers.
// No server code here: islands import this file.
import { z } from "zod";
import type { StoredCurve, StoredPulse } from "./channels";

/** Near-end or far-end crosstalk (the database schema's `kind` of an aggressor). */
export const aggressorKinds = ["next", "fext"] as const;
export type AggressorKindName = (typeof aggressorKinds)[number];

/** Where an aggressor came from: a pair of the victim's multi-port file, a file of its own, or the coupling model. */
export const aggressorSources = ["ports", "file", "coupling"] as const;
export type AggressorSource = (typeof aggressorSources)[number];

/** Most aggressors per channel. */
export const MAX_CHANNEL_AGGRESSORS = 8;
/** Peak amplitude of the aggressor the stored ICN is computed for: a 1 Vppd transmitter. */
export const ICN_REFERENCE_AMPLITUDE_V = 0.5;
/** Multipart fields that may carry aggressors' own files. */
export const AGGRESSOR_FILE_FIELD = /^aggressor[0-7]$/;

const kind = z.enum(["next", "fext"], { error: 'kind must be "next" or "fext".' });
const name = z
  .string()
  .trim()
  .min(1, "An aggressor's name must not be empty.")
  .max(200, "Keep an aggressor's name under 200 characters.")
  .optional();
const port = z.int("Ports are whole numbers.").min(1, "Ports are numbered from 1.").max(64, "Ports go up to 64.");
const csvKind = z.enum(["pulse-csv", "step-csv", "impulse-csv"], {
  error: "csvKind must be pulse-csv, step-csv or impulse-csv.",
});
const pairs = z
  .object({ inP: port, inN: port, outP: port, outN: port })
  .refine((p) => new Set([p.inP, p.inN, p.outP, p.outN]).size === 4, {
    message: "The four ports of a pairing must be different.",
  });

/** The synthetic coupling of an aggressor (see lib/crosstalk/couplingModel): NEXT's K_b or FEXT's K_f·T_D, over a line. */
export const couplingSpec = z.object({
  backwardCoefficient: z.number().min(0, "K_b is at least 0.").max(0.5, "K_b is at most 0.5.").optional(),
  forwardCoupling_s: z
    .number()
    .min(-1e-9, "K_f·T_D is at least −1 ns.")
    .max(1e-9, "K_f·T_D is at most 1 ns.")
    .optional(),
  lossAtNyquist_dB: z
    .number()
    .min(0, "The line's loss must be at least 0 dB.")
    .max(60, "The line's loss must be at most 60 dB."),
  delay_s: z
    .number()
    .min(0, "The line's delay must be ≥ 0.")
    .max(20e-9, "The line's delay must be at most 20 ns.")
    .default(0),
});
export type CouplingSpec = z.output<typeof couplingSpec>;

/** One aggressor of an upload. */
export const aggressorSpec = z
  .discriminatedUnion(
    "source",
    [
      z.object({ source: z.literal("ports"), kind, name, p: port, n: port }),
      z.object({
        source: z.literal("file"),
        kind,
        name,
        field: z
          .string()
          .regex(
            AGGRESSOR_FILE_FIELD,
            "field names the multipart field of the aggressor's file: aggressor0 … aggressor7.",
          ),
        csvKind: csvKind.optional(),
        pairs: pairs.optional(),
      }),
      z.object({ source: z.literal("coupling"), kind, name, coupling: couplingSpec }),
    ],
    {
      error:
        'An aggressor needs source "ports" (a pair of the victim\'s file), "file" (a file of its own) or "coupling" (the coupling model).',
    },
  )
  .superRefine((a, ctx) => {
    if (a.source === "ports" && a.p === a.n)
      ctx.addIssue({ code: "custom", path: ["n"], message: "An aggressor's pair needs two different ports." });
    if (a.source !== "coupling") return;
    const want = a.kind === "next" ? "backwardCoefficient" : "forwardCoupling_s";
    if (a.coupling[want] === undefined) {
      ctx.addIssue({
        code: "custom",
        path: ["coupling", want],
        message: `A ${a.kind.toUpperCase()} coupling model needs ${want}.`,
      });
    }
  });
export type AggressorSpec = z.output<typeof aggressorSpec>;

export const aggressorSpecs = z
  .array(aggressorSpec)
  .max(MAX_CHANNEL_AGGRESSORS, `At most ${MAX_CHANNEL_AGGRESSORS} aggressors per channel.`);

/** `aggressors` in a multipart form: the JSON array of {@link aggressorSpec}. */
export const aggressorsField = z
  .string()
  .trim()
  .transform((s, ctx) => {
    try {
      return JSON.parse(s) as unknown;
    } catch {
      ctx.addIssue({
        code: "custom",
        message: 'Give aggressors as a JSON array, e.g. [{"source":"ports","kind":"next","p":7,"n":8}].',
      });
      return z.NEVER;
    }
  })
  .pipe(aggressorSpecs);

/** What the engine derived for one aggressor (the preview, and what a channel stores). */
export interface DerivedAggressor {
  name: string;
  kind: AggressorKindName;
  source: AggressorSource;
  pulse: StoredPulse;
  coupling: StoredCurve | null;
  /** ICN for a 1 Vppd aggressor (peak 0.5 V), volts rms. */
  icnRms_V: number;
  derivation: Record<string, unknown>;
}

/** An aggressor as the API answers it. */
export interface AggressorView extends DerivedAggressor {
  position: number;
  /** The aggressor's own file (source "file"), else null. */
  file: { filename: string; bytes: number; sha256: string } | null;
}

/** ICN of a set of aggressors, NEXT and FEXT apart (powers add), for the same 1 Vppd reference. */
export function icnTotals(aggressors: readonly { kind: AggressorKindName; icnRms_V: number }[]) {
  let next = 0;
  let fext = 0;
  for (const a of aggressors) {
    if (a.kind === "next") next += a.icnRms_V ** 2;
    else fext += a.icnRms_V ** 2;
  }
  return { rms_V: Math.sqrt(next + fext), next_V: Math.sqrt(next), fext_V: Math.sqrt(fext) };
}

export const aggressorKindLabels: Record<AggressorKindName, string> = { next: "NEXT", fext: "FEXT" };
export const aggressorSourceLabels: Record<AggressorSource, string> = {
  ports: "pair of the victim's file",
  file: "its own file",
  coupling: "coupling model",
};

/** The default name of the i-th aggressor of a spec. */
export function aggressorName(a: AggressorSpec, i: number): string {
  if (a.name) return a.name;
  const k = aggressorKindLabels[a.kind];
  return a.source === "ports" ? `${k} ports ${a.p}/${a.n}` : `${k} ${i + 1}`;
}
