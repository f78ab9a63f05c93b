// Tuning runs in MariaDB: starting one (a copy of its inputs and a queued job in one transaction),
// running it again, reading one, listing them. The job queue runs them in the worker pool
// (runs.job.ts); this module tells the queue how to read a run's input and store its result.
import { and, count, desc, eq, sql, type SQL } from "drizzle-orm";
import { db, type Tx } from "@/server/db.server";
import { budgets, channelAggressors, channels, jobs, runs, users } from "@/db/schema";
import type { JobStatus } from "@/features/jobs/jobs";
import { apiStatus, cancelJobFor, enqueueJob, registerJobKind, startJobs } from "@/server/jobs/queue.server";
import { notFound, unprocessable } from "@/server/http/errors";
import { frozenJsonResponse } from "@/server/http/frozenJson.server";
import { recordAudit } from "@/server/audit/audit.server";
import type { SessionUser } from "@/server/auth/sessionUser";
import type { TuningRunResult } from "@lib/run";
import type { BudgetInput } from "@lib/contract/budget";
import { checkBudgetFits } from "@/server/sources.server";
import {
  listQuery,
  type RunInputs,
  type RunListItem,
  type RunListQuery,
  type RunSummary,
  type RunView,
  type StartRunRequest,
} from "./runs";

/** Adds the run and its queued job; the job's target is the run (so the job comes first, then points back). */
async function insertRun(
  tx: Tx,
  user: SessionUser | null,
  inputs: RunInputs,
  links: { channelId: number | null; budgetId: number | null; rerunOf?: number },
) {
  const jobId = await enqueueJob(tx, "run", 0);
  const [{ id }] = await tx
    .insert(runs)
    .values({
      jobId,
      channelId: links.channelId,
      budgetId: links.budgetId,
      inputs,
      rerunOf: links.rerunOf ?? null,
      createdBy: user?.id ?? null,
    })
    .$returningId();
  await tx.update(jobs).set({ targetId: id }).where(eq(jobs.id, jobId));
  return id;
}

async function runJobId(runId: number): Promise<number> {
  const [row] = await db.select({ jobId: runs.jobId }).from(runs).where(eq(runs.id, runId));
  return row.jobId;
}

/** Stores a finished run's result, engine version and list summary (inside the job's closing transaction). */
export async function storeRunResult(tx: Tx, runId: number, result: TuningRunResult): Promise<void> {
  const summary: RunSummary = {
    limiterHeadroom_V: result.metrics.limiterHeadroom_V,
    eyeHeight_V: result.metrics.eyeHeight_V,
    linearReachExhausted: result.verdict.linearReachExhausted,
    closes: result.verdict.fewestDfeTaps !== null,
  };
  await tx.update(runs).set({ result: result, engineVersion: result.engineVersion, summary }).where(eq(runs.id, runId));
}

/** The worker's input for a run: its own copies of the channel's pulse and the budget. */
export async function runJobInput(runId: number) {
  const [row] = await db.select({ inputs: runs.inputs }).from(runs).where(eq(runs.id, runId));
  if (!row) throw new Error(`Run ${runId} has gone.`);
  const aggressors = row.inputs.channel.aggressors ?? [];
  return {
    pulse: row.inputs.channel.pulse,
    budget: row.inputs.budget.params,
    ...(aggressors.length > 0 ? { aggressors } : {}),
  };
}

/**
 * Records a run computed outside the queue (the demo seed) exactly as the worker's would be: the
 * inputs, a job marked done with its timing, and the stored result.
 */
export async function recordFinishedRun(
  user: SessionUser | null,
  inputs: RunInputs,
  result: TuningRunResult,
  compute_ms: number,
) {
  return db.transaction(async (tx) => {
    const id = await insertRun(tx, user, inputs, { channelId: inputs.channel.id, budgetId: inputs.budget.id });
    const [{ jobId }] = await tx.select({ jobId: runs.jobId }).from(runs).where(eq(runs.id, id));
    await tx
      .update(jobs)
      .set({
        status: "done",
        progress: 1,
        attempts: 1,
        createdAt: sql`NOW(3) - INTERVAL ${compute_ms * 1000} MICROSECOND`,
        startedAt: sql`NOW(3) - INTERVAL ${compute_ms * 1000} MICROSECOND`,
        finishedAt: sql`NOW(3)`,
        compute_ms,
      })
      .where(eq(jobs.id, jobId));
    await storeRunResult(tx, id, result);
    await recordAudit(tx, user, "run.start", "run", id, {
      channel: inputs.channel.name,
      budget: inputs.budget.name,
      seeded: true,
    });
    return id;
  });
}

/** Copies the channel's pulse and the budget into a new run and queues it. Answers 202's body. */
export async function startRun(user: SessionUser | null, req: StartRunRequest) {
  const id = await db.transaction(async (tx) => {
    const [channel] = await tx
      .select({ id: channels.id, name: channels.name, bitRate_bps: channels.bitRate_bps, pulse: channels.pulse })
      .from(channels)
      .where(eq(channels.id, req.channelId));
    if (!channel) throw unprocessable(`There is no channel ${req.channelId}.`, "channelId");
    const [budget] = await tx
      .select({ id: budgets.id, name: budgets.name, params: budgets.params })
      .from(budgets)
      .where(eq(budgets.id, req.budgetId));
    if (!budget) throw unprocessable(`There is no budget ${req.budgetId}.`, "budgetId");
    // Refused here (422), not queued and failed later: a budget whose bit rate or grids the channel cannot take.
    checkBudgetFits(budget.params as BudgetInput, budget.name, [{ ...channel, lossAtNyquist_dB: null }]);
    const aggressors = await tx
      .select({ name: channelAggressors.name, kind: channelAggressors.kind, pulse: channelAggressors.pulse })
      .from(channelAggressors)
      .where(eq(channelAggressors.channelId, channel.id))
      .orderBy(channelAggressors.position);
    const copy = aggressors.length > 0 ? { ...channel, aggressors } : channel;
    const id = await insertRun(tx, user, { channel: copy, budget }, { channelId: channel.id, budgetId: budget.id });
    await recordAudit(tx, user, "run.start", "run", id, { channel: channel.name, budget: budget.name });
    return id;
  });
  startJobs(await runJobId(id));
  return { id, status: "queued" as const };
}

/** Runs a finished (or failed) run again from its own copy of the inputs. */
export async function rerun(user: SessionUser, runId: number) {
  const id = await db.transaction(async (tx) => {
    const [old] = await tx.select().from(runs).where(eq(runs.id, runId));
    if (!old) throw notFound(`Run ${runId}`);
    const id = await insertRun(tx, user, old.inputs, {
      channelId: old.channelId,
      budgetId: old.budgetId,
      rerunOf: old.id,
    });
    await recordAudit(tx, user, "run.rerun", "run", id, { of: old.id });
    return id;
  });
  startJobs(await runJobId(id));
  return { id, status: "queued" as const };
}

/** Cancels a queued or running run: it ends failed, "Cancelled by <name>.", and keeps its inputs; 409 once finished. */
export async function cancelRun(user: SessionUser, runId: number) {
  const [row] = await db.select({ jobId: runs.jobId }).from(runs).where(eq(runs.id, runId));
  if (!row) throw notFound(`Run ${runId}`);
  const out = await cancelJobFor(row.jobId, user, "run", (tx) => recordAudit(tx, user, "run.cancel", "run", runId));
  return { id: runId, ...out };
}

const listColumns = {
  id: runs.id,
  jobId: runs.jobId,
  status: jobs.status,
  progress: jobs.progress,
  error: jobs.error,
  channelId: runs.channelId,
  budgetId: runs.budgetId,
  // Names from the run's own copy of its inputs (read in SQL, so lists never load the pulse).
  channelName: sql<string>`JSON_VALUE(${runs.inputs}, '$.channel.name')`,
  budgetName: sql<string>`JSON_VALUE(${runs.inputs}, '$.budget.name')`,
  summary: runs.summary,
  createdBy: users.name,
  createdAt: runs.createdAt,
  finishedAt: jobs.finishedAt,
};

interface Row {
  id: number;
  status: JobStatus;
  progress: number;
  error: string | null;
  channelId: number | null;
  budgetId: number | null;
  channelName: string;
  budgetName: string;
  summary: RunSummary | null;
  createdBy: string | null;
  createdAt: Date;
  finishedAt: Date | null;
}

function toItem(r: Row): RunListItem {
  return {
    id: r.id,
    status: apiStatus(r.status),
    progress: r.progress,
    channel: { id: r.channelId, name: r.channelName },
    budget: { id: r.budgetId, name: r.budgetName },
    summary: r.summary ?? null,
    error: r.error ? { message: r.error } : null,
    createdBy: r.createdBy ?? null,
    createdAt: r.createdAt,
    finishedAt: r.finishedAt ?? null,
  };
}

/** Newest first, optionally for one channel or budget. */
export async function listRuns(query: RunListQuery) {
  const q = listQuery.parse(query);
  const where: SQL[] = [];
  if (q.channelId) where.push(eq(runs.channelId, q.channelId));
  if (q.budgetId) where.push(eq(runs.budgetId, q.budgetId));
  const offset = q.cursor ?? 0;
  const rows = await db
    .select(listColumns)
    .from(runs)
    .innerJoin(jobs, eq(jobs.id, runs.jobId))
    .leftJoin(users, eq(users.id, runs.createdBy))
    .where(where.length ? and(...where) : undefined)
    .orderBy(desc(runs.id))
    .limit(q.limit + 1)
    .offset(offset);
  const items = rows.slice(0, q.limit).map(toItem);
  return { items, nextCursor: rows.length > q.limit ? String(offset + q.limit) : null };
}

/** GET /api/v1/runs/:id: status, progress, inputs, and the result when done. */
export async function getRun(id: number): Promise<RunView> {
  const [r] = await db
    .select({
      ...listColumns,
      inputs: runs.inputs,
      result: runs.result,
      engineVersion: runs.engineVersion,
      rerunOf: runs.rerunOf,
      queuedAt: jobs.createdAt,
      startedAt: jobs.startedAt,
      compute_ms: jobs.compute_ms,
    })
    .from(runs)
    .innerJoin(jobs, eq(jobs.id, runs.jobId))
    .leftJoin(users, eq(users.id, runs.createdBy))
    .where(eq(runs.id, id));
  if (!r) throw notFound(`Run ${id}`);
  return {
    ...toItem(r),
    jobId: r.jobId,
    inputs: r.inputs,
    result: r.result ?? null,
    engineVersion: r.engineVersion ?? null,
    rerunOf: r.rerunOf ?? null,
    timings: { queuedAt: r.queuedAt, startedAt: r.startedAt, finishedAt: r.finishedAt, compute_ms: r.compute_ms },
  };
}

/**
 * GET /api/v1/runs/:id for a person or a script: a run that has finished never changes but for its
 * links (a deleted channel or budget, a renamed author), so its detail is serialized and compressed
 * once and then served as bytes (`frozenJsonResponse`), keyed by those links; an unfinished run is
 * read afresh.
 */
export async function runDetailResponse(request: Request, id: number): Promise<Response | RunView> {
  const [r] = await db
    .select({
      status: jobs.status,
      channelId: runs.channelId,
      budgetId: runs.budgetId,
      createdBy: users.name,
      finishedAt: jobs.finishedAt,
    })
    .from(runs)
    .innerJoin(jobs, eq(jobs.id, runs.jobId))
    .leftJoin(users, eq(users.id, runs.createdBy))
    .where(eq(runs.id, id));
  if (!r) throw notFound(`Run ${id}`);
  if (r.status !== "done" && r.status !== "failed") return getRun(id);
  const key = `run:${id}:${JSON.stringify([r.channelId, r.budgetId, r.createdBy, r.finishedAt?.getTime() ?? null])}`;
  return frozenJsonResponse(request, key, () => getRun(id));
}

/** Status and progress only (for polling). */
export async function runStatus(id: number) {
  const [r] = await db
    .select({
      id: runs.id,
      status: jobs.status,
      progress: jobs.progress,
      error: jobs.error,
      startedAt: jobs.startedAt,
      finishedAt: jobs.finishedAt,
    })
    .from(runs)
    .innerJoin(jobs, eq(jobs.id, runs.jobId))
    .where(eq(runs.id, id));
  if (!r) throw notFound(`Run ${id}`);
  return {
    id: r.id,
    status: apiStatus(r.status),
    progress: r.progress,
    ...(r.error ? { error: { message: r.error } } : {}),
    startedAt: r.startedAt,
    finishedAt: r.finishedAt,
  };
}

/** How many tuning runs the workspace holds. */
export async function countRuns(): Promise<number> {
  const [{ n }] = await db.select({ n: count() }).from(runs);
  return n;
}

registerJobKind("run", {
  input: (job) => runJobInput(job.targetId),
  save: (tx, job, result) => storeRunResult(tx, job.targetId, result as TuningRunResult),
});
