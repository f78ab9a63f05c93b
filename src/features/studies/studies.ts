// Architecture studies: request schemas, the shapes a study stores and the API answers, and small
// presentation helpers. No server code here: islands import this file.
import { z } from "zod";
import type { BudgetInput } from "@lib/contract/budget";
import type { StoredPulse } from "@/features/channels/channels";
import type { RunAggressor } from "@/features/runs/runs";
import { architectureSchema, type Architecture } from "./architecture";

/** Largest number of channels one study evaluates. */
export const MAX_STUDY_CHANNELS = 64;
/** Largest number of candidate architectures in one study. */
export const MAX_CANDIDATES = 16;

/** POST /api/v1/studies. Without `candidates`, the usual ones for the budget are evaluated. */
export const createStudyRequest = z.object({
  name: z.string().trim().min(1, "Give the study a name.").max(200, "Keep the name under 200 characters.").optional(),
  channelIds: z
    .array(z.int({ error: "Channel ids are whole numbers." }).positive(), {
      error: "Give channelIds as a list of channel ids.",
    })
    .min(1, "Choose at least one channel.")
    .max(MAX_STUDY_CHANNELS, `A study covers at most ${MAX_STUDY_CHANNELS} channels.`)
    .refine((ids) => new Set(ids).size === ids.length, "A channel appears twice; list each channel once."),
  budgetId: z.int({ error: "Choose a budget (budgetId)." }).positive(),
  candidates: z
    .array(architectureSchema)
    .min(1, "Give at least one candidate architecture.")
    .max(MAX_CANDIDATES, `At most ${MAX_CANDIDATES} candidates.`)
    .refine((cs) => new Set(cs.map((c) => c.key)).size === cs.length, "Two candidates have the same key.")
    .optional(),
});
export type CreateStudyRequest = z.infer<typeof createStudyRequest>;

/** PUT /api/v1/studies/:id/decision: the architecture chosen, and why. */
export const decisionRequest = z.object({
  candidateKey: z.string().trim().min(1, "Choose the candidate the product uses."),
  rationale: z
    .string({ error: "Say why (the rationale)." })
    .trim()
    .min(20, "Say why in a sentence or two (at least 20 characters): reviewers read this.")
    .max(4000, "Keep the rationale under 4000 characters."),
});
export type DecisionRequest = z.infer<typeof decisionRequest>;

export const studyParams = z.object({
  id: z.coerce.number({ error: "The study id must be a number." }).int().positive(),
});
export const listQuery = z.object({
  limit: z.coerce.number().int().min(1).max(200).default(50),
  cursor: z.coerce.number().int().positive().optional(),
});

/** The architecture a study's designer chose, and why. */
export interface StudyDecision {
  candidateKey: string;
  rationale: string;
}

/** What a study was computed from (copies taken at its start). */
export interface StudyInputs {
  budget: { id: number; name: string; params: BudgetInput };
  /** With each channel's aggressors, when it has any (copied like the pulse). */
  channels: {
    id: number;
    name: string;
    lossAtNyquist_dB: number | null;
    pulse: StoredPulse;
    aggressors?: RunAggressor[];
  }[];
  candidates: Architecture[];
}

/** One candidate's figures across the study's channels. */
export interface CandidateResult {
  key: string;
  label: string;
  architecture: Architecture;
  /** Tap count (adjustable taps and gains). */
  complexity: number;
  worstHeadroom_V: number;
  medianHeadroom_V: number;
  worstChannel: { id: number; name: string };
  channels: { id: number; name: string; headroom_V: number }[];
}

export interface StudyResult {
  engineVersion: string;
  requiredHeadroom_V: number;
  targetBer: number;
  candidates: CandidateResult[];
}

/** The decision record as the API shows it. */
export interface DecisionView {
  candidateKey: string;
  candidateLabel: string;
  rationale: string;
  decidedBy: string | null;
  decidedAt: string | Date | null;
}

/**
 * Candidates on the efficient frontier: none other reaches at least the same worst-case headroom
 * with fewer or equal taps (and strictly better in one). A presentation aid for the chart.
 */
export function frontierKeys(
  cs: readonly Pick<CandidateResult, "key" | "complexity" | "worstHeadroom_V">[],
): Set<string> {
  const keys = new Set<string>();
  for (const c of cs) {
    const dominated = cs.some(
      (o) =>
        o.key !== c.key &&
        o.complexity <= c.complexity &&
        o.worstHeadroom_V >= c.worstHeadroom_V &&
        (o.complexity < c.complexity || o.worstHeadroom_V > c.worstHeadroom_V),
    );
    if (!dominated) keys.add(c.key);
  }
  return keys;
}
