// Architecture studies: start one (a job in the worker pool), list and read them, and record the
// decision (the chosen architecture and why). Every write is one transaction with its audit event.
import { and, asc, count, desc, eq, inArray, isNotNull, lt, sql } from "drizzle-orm";
import { budgetSchema, type Budget } from "@lib/contract/budget";
import { db, type Tx } from "@/server/db.server";
import { budgets, jobs, studies, users, type Study } from "@/db/schema";
import { conflict, notFound, unprocessable } from "@/server/http/errors";
import { recordAudit } from "@/server/audit/audit.server";
import { apiStatus, cancelJobFor, enqueueJob, jobStatus, registerJobKind, startJobs } from "@/server/jobs/queue.server";
import type { SessionUser } from "@/server/auth/sessionUser";
import { defaultCandidates } from "./architecture";
import { budgetCopy, channelCopies, checkBudgetFits } from "@/server/sources.server";
import { finishHere, type RunHere } from "@/server/jobs/inlineJob.server";
import type { StudyBudgetChoice } from "./newStudyStore";
import type { CreateStudyRequest, DecisionRequest, DecisionView, StudyInputs, StudyResult } from "./studies";

/** DFE taps the default candidates go up to when the budget has none. */
const DEFAULT_MAX_DFE = 4;

/**
 * Starts a study: copies its inputs and queues the job, in one transaction; the worker pool computes
 * it — or, with `here` (the demo seed), this process does before returning.
 */
export async function startStudy(user: SessionUser, req: CreateStudyRequest, here?: RunHere<StudyInputs, StudyResult>) {
  const { id, jobId, inputs } = await db.transaction(async (tx) => {
    const budget = await budgetCopy(tx, req.budgetId);
    const chans = await channelCopies(tx, req.channelIds);
    checkBudgetFits(budget.params, budget.name, chans);
    const maxDfe = budget.budget.dfe.taps > 0 ? budget.budget.dfe.taps : DEFAULT_MAX_DFE;
    const candidates = req.candidates ?? defaultCandidates(budget.budget.tx, maxDfe);
    const inputs: StudyInputs = {
      budget: { id: budget.id, name: budget.name, params: budget.params },
      channels: chans,
      candidates,
    };
    const name = req.name ?? `${budget.name} · ${chans.length} channel${chans.length === 1 ? "" : "s"}`;
    const jobId = await enqueueJob(tx, "study", 0);
    const [{ id }] = await tx
      .insert(studies)
      .values({ name, jobId, budgetId: budget.id, inputs, createdBy: user.id })
      .$returningId();
    await tx.update(jobs).set({ targetId: id }).where(eq(jobs.id, jobId));
    await recordAudit(tx, user, "study.start", "study", id, {
      name,
      budget: budget.name,
      channels: chans.length,
      candidates: candidates.map((c) => c.key),
    });
    return { id, jobId, inputs };
  });
  if (here) await finishHere(jobId, inputs, here, (tx, result) => saveStudy(tx, id, result));
  else startJobs(jobId);
  return { id, status: here ? ("done" as const) : ("queued" as const) };
}

async function saveStudy(tx: Tx, id: number, r: StudyResult) {
  await tx.update(studies).set({ result: r, engineVersion: r.engineVersion }).where(eq(studies.id, id));
}

async function studyRow(tx: Tx | typeof db, id: number) {
  const [row] = await tx
    .select({ study: studies, job: jobs })
    .from(studies)
    .innerJoin(jobs, eq(jobs.id, studies.jobId))
    .where(eq(studies.id, id));
  if (!row) throw notFound(`Study ${id}`);
  return row;
}

async function personName(id: string | null): Promise<string | null> {
  if (!id) return null;
  const [u] = await db.select({ name: users.name }).from(users).where(eq(users.id, id));
  return u?.name ?? null;
}

/** The decision record of a study for people: the candidate's label, who decided and when. */
async function decisionView(
  study: Pick<Study, "decision" | "decidedBy" | "decidedAt">,
  candidates: StudyInputs["candidates"],
): Promise<DecisionView | null> {
  if (!study.decision) return null;
  const c = candidates.find((x) => x.key === study.decision!.candidateKey);
  return {
    candidateKey: study.decision.candidateKey,
    candidateLabel: c?.label ?? study.decision.candidateKey,
    rationale: study.decision.rationale,
    decidedBy: await personName(study.decidedBy),
    decidedAt: study.decidedAt,
  };
}

/**
 * GET /api/v1/studies/:id: inputs (without pulses), status and progress, result and decision. The
 * channels are read in SQL as their ids, names and losses: the stored inputs carry their pulses.
 */
export async function getStudy(id: number) {
  const [row] = await db
    .select({
      id: studies.id,
      name: studies.name,
      result: studies.result,
      engineVersion: studies.engineVersion,
      decision: studies.decision,
      decidedBy: studies.decidedBy,
      decidedAt: studies.decidedAt,
      createdBy: studies.createdBy,
      createdAt: studies.createdAt,
      budgetId: sql<number>`JSON_VALUE(${studies.inputs}, '$.budget.id')`,
      budgetName: sql<string>`JSON_VALUE(${studies.inputs}, '$.budget.name')`,
      channelIds: sql<unknown>`JSON_EXTRACT(${studies.inputs}, '$.channels[*].id')`,
      channelNames: sql<unknown>`JSON_EXTRACT(${studies.inputs}, '$.channels[*].name')`,
      channelLosses: sql<unknown>`JSON_EXTRACT(${studies.inputs}, '$.channels[*].lossAtNyquist_dB')`,
      candidates: sql<unknown>`JSON_EXTRACT(${studies.inputs}, '$.candidates')`,
      job: {
        status: jobs.status,
        progress: jobs.progress,
        error: jobs.error,
        startedAt: jobs.startedAt,
        finishedAt: jobs.finishedAt,
        compute_ms: jobs.compute_ms,
      },
    })
    .from(studies)
    .innerJoin(jobs, eq(jobs.id, studies.jobId))
    .where(eq(studies.id, id));
  if (!row) throw notFound(`Study ${id}`);
  const names = parsedJson<string[]>(row.channelNames) ?? [];
  const losses = parsedJson<(number | null)[]>(row.channelLosses) ?? [];
  const channels = (parsedJson<number[]>(row.channelIds) ?? []).map((cid, i) => ({
    id: cid,
    name: names[i],
    lossAtNyquist_dB: losses[i] ?? null,
  }));
  const candidates = parsedJson<StudyInputs["candidates"]>(row.candidates) ?? [];
  return {
    id: row.id,
    name: row.name,
    ...jobStatus(row.job),
    budget: { id: Number(row.budgetId), name: row.budgetName },
    channels,
    candidates,
    result: row.result ?? null,
    engineVersion: row.engineVersion,
    decision: await decisionView(row, candidates),
    createdBy: await personName(row.createdBy),
    createdAt: row.createdAt,
  };
}

/** Cancels a queued or running study: it ends failed, "Cancelled by <name>."; 409 once finished. */
export async function cancelStudy(user: SessionUser, id: number) {
  const { study } = await studyRow(db, id);
  return {
    id,
    ...(await cancelJobFor(study.jobId, user, "study", (tx) => recordAudit(tx, user, "study.cancel", "study", id))),
  };
}

/** Number of studies (the overview's count). */
export async function countStudies(): Promise<number> {
  const [{ n }] = await db.select({ n: count() }).from(studies);
  return n;
}

/** A JSON value read in SQL: MariaDB answers JSON_EXTRACT as text (mysql2 parses only JSON columns). */
function parsedJson<T>(v: unknown): T | null {
  if (v === null || v === undefined) return null;
  return (typeof v === "string" ? JSON.parse(v) : v) as T;
}

/**
 * Newest first. The figures the list shows are read in SQL from the inputs and the result (never
 * the inputs themselves: they hold every channel's pulse).
 */
export async function listStudies(limit: number, cursor?: number) {
  const rows = await db
    .select({
      id: studies.id,
      name: studies.name,
      decision: studies.decision,
      createdAt: studies.createdAt,
      status: jobs.status,
      progress: jobs.progress,
      by: users.name,
      budget: sql<string | null>`JSON_VALUE(${studies.inputs}, '$.budget.name')`,
      channelCount: sql<number | null>`JSON_LENGTH(${studies.inputs}, '$.channels')`,
      candidateKeys: sql<unknown>`JSON_EXTRACT(${studies.inputs}, '$.candidates[*].key')`,
      candidateLabels: sql<unknown>`JSON_EXTRACT(${studies.inputs}, '$.candidates[*].label')`,
      resultLabels: sql<unknown>`JSON_EXTRACT(${studies.result}, '$.candidates[*].label')`,
      resultHeadrooms: sql<unknown>`JSON_EXTRACT(${studies.result}, '$.candidates[*].worstHeadroom_V')`,
    })
    .from(studies)
    .innerJoin(jobs, eq(jobs.id, studies.jobId))
    .leftJoin(users, eq(users.id, studies.createdBy))
    .where(cursor ? lt(studies.id, cursor) : undefined)
    .orderBy(desc(studies.id))
    .limit(limit + 1);
  const items = rows.slice(0, limit).map((r) => {
    const keys = parsedJson<string[]>(r.candidateKeys) ?? [];
    const labels = parsedJson<string[]>(r.candidateLabels) ?? [];
    const chosen = r.decision ? keys.indexOf(r.decision.candidateKey) : -1;
    const resultLabels = parsedJson<string[]>(r.resultLabels);
    const headrooms = parsedJson<number[]>(r.resultHeadrooms) ?? [];
    // The candidate with the largest worst-case headroom (the first of equals, as a stable sort gives).
    let best: number | null = null;
    for (let i = 0; i < headrooms.length; i++) if (best === null || headrooms[i] > headrooms[best]) best = i;
    return {
      id: r.id,
      name: r.name,
      status: apiStatus(r.status),
      progress: r.progress,
      budget: r.budget ?? "",
      channelCount: Number(r.channelCount ?? 0),
      candidateCount: keys.length,
      decision: chosen >= 0 ? { candidateKey: keys[chosen], label: labels[chosen] } : null,
      best: resultLabels && best !== null ? (resultLabels[best] ?? null) : null,
      createdBy: r.by,
      createdAt: r.createdAt,
    };
  });
  return { items, nextCursor: rows.length > limit ? String(items[items.length - 1].id) : null };
}

/** Records (or revises) the chosen architecture and its rationale; the study must be finished. */
export async function decideStudy(user: SessionUser, id: number, req: DecisionRequest) {
  await db.transaction(async (tx) => {
    const [row] = await tx.select().from(studies).where(eq(studies.id, id)).for("update");
    if (!row) throw notFound(`Study ${id}`);
    const [job] = await tx.select().from(jobs).where(eq(jobs.id, row.jobId));
    const result = row.result;
    if (job.status !== "done" || !result)
      throw conflict("The study has not finished; record the decision once its results are in.");
    if (!result.candidates.some((c) => c.key === req.candidateKey)) {
      throw unprocessable(`“${req.candidateKey}” is not one of this study's candidates.`, "candidateKey");
    }
    await tx
      .update(studies)
      .set({
        decision: { candidateKey: req.candidateKey, rationale: req.rationale },
        decidedBy: user.id,
        decidedAt: new Date(),
      })
      .where(eq(studies.id, id));
    await recordAudit(tx, user, "study.decide", "study", id, {
      candidateKey: req.candidateKey,
      ...(row.decision ? { previous: row.decision.candidateKey } : {}),
    });
  });
  return getStudy(id);
}

/** Budgets for the study and tap-table forms, each with its usual candidates (budgets that no longer validate are left out). */
export async function studyBudgetChoices(): Promise<(StudyBudgetChoice & { params: Budget })[]> {
  const rows = await db
    .select({ id: budgets.id, name: budgets.name, params: budgets.params })
    .from(budgets)
    .orderBy(asc(budgets.name));
  return rows.flatMap((r) => {
    const parsed = budgetSchema.safeParse(r.params);
    if (!parsed.success) return [];
    const b = parsed.data;
    return [
      {
        id: r.id,
        name: r.name,
        modulation: b.modulation,
        bitRate_bps: b.bitRate_bps ?? null,
        candidates: defaultCandidates(b.tx, b.dfe.taps > 0 ? b.dfe.taps : DEFAULT_MAX_DFE),
        params: b,
      },
    ];
  });
}

/**
 * Studies whose job is done and that carry a decision (the tap-table form offers these): the budget,
 * channel ids and candidates read in SQL, without the channels' pulses.
 */
export async function decidedStudies() {
  const rows = await db
    .select({
      id: studies.id,
      name: studies.name,
      decision: studies.decision,
      budgetId: sql<number>`JSON_VALUE(${studies.inputs}, '$.budget.id')`,
      channelIds: sql<unknown>`JSON_EXTRACT(${studies.inputs}, '$.channels[*].id')`,
      candidates: sql<unknown>`JSON_EXTRACT(${studies.inputs}, '$.candidates')`,
    })
    .from(studies)
    .innerJoin(jobs, and(eq(jobs.id, studies.jobId), inArray(jobs.status, ["done"])))
    .where(isNotNull(studies.decision))
    .orderBy(desc(studies.id))
    .limit(200);
  return rows
    .filter((r) => r.decision)
    .map((r) => {
      const candidates = parsedJson<StudyInputs["candidates"]>(r.candidates) ?? [];
      const chosen = candidates.find((c) => c.key === r.decision!.candidateKey)!;
      return {
        id: r.id,
        name: r.name,
        budgetId: Number(r.budgetId),
        channelIds: parsedJson<number[]>(r.channelIds) ?? [],
        architecture: chosen,
        rationale: r.decision!.rationale,
      };
    });
}

registerJobKind("study", {
  async input(job) {
    const [row] = await db.select({ inputs: studies.inputs }).from(studies).where(eq(studies.id, job.targetId));
    if (!row) throw new Error(`Study ${job.targetId} no longer exists.`);
    return row.inputs;
  },
  save: (tx, job, result) => saveStudy(tx, job.targetId, result as StudyResult),
});
