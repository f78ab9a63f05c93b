// Architecture studies: start one (a job in the worker pool), list and read them, and record the
// decision (the chosen architecture and why). Every write is one transaction with its audit event.
import { and, asc, count, desc, eq, inArray, lt } from "drizzle-orm";
import { budgetSchema, type Budget } from "@lib/contract/budget";
import { db, type Tx } from "@/server/db.server";
import { budgets, jobs, studies, users, type Study } from "@/db/schema";
import { conflict, notFound, unprocessable } from "@/server/http/errors";
import { recordAudit } from "@/server/audit/audit.server";
import { apiStatus, cancelJobFor, enqueueJob, jobStatus, registerJobKind, startJobs } from "@/server/jobs/queue.server";
import type { SessionUser } from "@/server/auth/sessionUser";
import { defaultCandidates } from "./architecture";
import { budgetCopy, channelCopies, checkBudgetFits, withoutPulses } from "@/server/sources.server";
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
    const inputs: StudyInputs = { budget: { id: budget.id, name: budget.name, params: budget.params }, channels: chans, candidates };
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
  await tx
    .update(studies)
    .set({ result: r, engineVersion: r.engineVersion })
    .where(eq(studies.id, id));
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
async function decisionView(study: Study): Promise<DecisionView | null> {
  if (!study.decision) return null;
  const inputs = study.inputs;
  const c = inputs.candidates.find((x) => x.key === study.decision!.candidateKey);
  return {
    candidateKey: study.decision.candidateKey,
    candidateLabel: c?.label ?? study.decision.candidateKey,
    rationale: study.decision.rationale,
    decidedBy: await personName(study.decidedBy),
    decidedAt: study.decidedAt,
  };
}

/** GET /api/v1/studies/:id: inputs (without pulses), status and progress, result and decision. */
export async function getStudy(id: number) {
  const { study, job } = await studyRow(db, id);
  const inputs = study.inputs;
  return {
    id: study.id,
    name: study.name,
    ...jobStatus(job),
    budget: { id: inputs.budget.id, name: inputs.budget.name },
    channels: withoutPulses(inputs.channels),
    candidates: inputs.candidates,
    result: study.result ?? null,
    engineVersion: study.engineVersion,
    decision: await decisionView(study),
    createdBy: await personName(study.createdBy),
    createdAt: study.createdAt,
  };
}

/** Cancels a queued or running study: it ends failed, "Cancelled by <name>."; 409 once finished. */
export async function cancelStudy(user: SessionUser, id: number) {
  const { study } = await studyRow(db, id);
  return { id, ...(await cancelJobFor(study.jobId, user, "study", (tx) => recordAudit(tx, user, "study.cancel", "study", id))) };
}

/** Number of studies (the overview's count). */
export async function countStudies(): Promise<number> {
  const [{ n }] = await db.select({ n: count() }).from(studies);
  return n;
}

/** Newest first. */
export async function listStudies(limit: number, cursor?: number) {
  const rows = await db
    .select({ study: studies, job: jobs, by: users.name })
    .from(studies)
    .innerJoin(jobs, eq(jobs.id, studies.jobId))
    .leftJoin(users, eq(users.id, studies.createdBy))
    .where(cursor ? lt(studies.id, cursor) : undefined)
    .orderBy(desc(studies.id))
    .limit(limit + 1);
  const items = rows.slice(0, limit).map(({ study, job, by }) => {
    const inputs = study.inputs;
    const result = study.result;
    const chosen = study.decision ? inputs.candidates.find((c) => c.key === study.decision!.candidateKey) : undefined;
    return {
      id: study.id,
      name: study.name,
      status: apiStatus(job.status),
      progress: job.progress,
      budget: inputs.budget.name,
      channelCount: inputs.channels.length,
      candidateCount: inputs.candidates.length,
      decision: chosen ? { candidateKey: chosen.key, label: chosen.label } : null,
      best: result ? [...result.candidates].sort((a, b) => b.worstHeadroom_V - a.worstHeadroom_V)[0]?.label ?? null : null,
      createdBy: by,
      createdAt: study.createdAt,
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
    if (job.status !== "done" || !result) throw conflict("The study has not finished; record the decision once its results are in.");
    if (!result.candidates.some((c) => c.key === req.candidateKey)) {
      throw unprocessable(`“${req.candidateKey}” is not one of this study's candidates.`, "candidateKey");
    }
    await tx
      .update(studies)
      .set({ decision: { candidateKey: req.candidateKey, rationale: req.rationale }, decidedBy: user.id, decidedAt: new Date() })
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
  const rows = await db.select({ id: budgets.id, name: budgets.name, params: budgets.params }).from(budgets).orderBy(asc(budgets.name));
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

/** Studies whose job is done and that carry a decision (the tap-table form offers these). */
export async function decidedStudies() {
  const rows = await db
    .select({ study: studies })
    .from(studies)
    .innerJoin(jobs, and(eq(jobs.id, studies.jobId), inArray(jobs.status, ["done"])))
    .orderBy(desc(studies.id))
    .limit(200);
  return rows
    .filter((r) => r.study.decision)
    .map(({ study }) => {
      const inputs = study.inputs;
      const chosen = inputs.candidates.find((c) => c.key === study.decision!.candidateKey)!;
      return {
        id: study.id,
        name: study.name,
        budgetId: inputs.budget.id,
        channelIds: inputs.channels.map((c) => c.id),
        architecture: chosen,
        rationale: study.decision!.rationale,
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
