// Corner sweeps in MariaDB: start one (copies of its inputs, a parent job waiting for one batch job
// per channel × corner run, in one transaction), read it with its progress and results, list them,
// export them as CSV. The batches store one row per pair; the parent gathers the binding corners.
import { and, asc, count, desc, eq, inArray, lt, min } from "drizzle-orm";
import { cornerBudget } from "@lib/corners";
import { db, type Tx } from "@/server/db.server";
import {
  channels,
  jobs,
  programs,
  sweepChannels,
  sweepResults,
  sweeps,
  users,
  type Job,
  type SweepResult,
} from "@/db/schema";
import { notFound, unprocessable } from "@/server/http/errors";
import { recordAudit } from "@/server/audit/audit.server";
import { apiStatus, cancelJobFor, enqueueJob, registerJobKind, startJobs } from "@/server/jobs/queue.server";
import type { SessionUser } from "@/server/auth/sessionUser";
import { budgetCopy, channelSourceText, checkBudgetFits, checkOneRate } from "@/server/sources.server";
import { needsTouchstone } from "@/features/channels/lossCorners";
import { config } from "@/server/config.server";
import type { SweepBatchInput, SweepBatchResult } from "./sweeps.job";
import {
  headroomHistogram,
  MAX_PAIRS,
  sweepBatches,
  sweepCsv,
  timeLeft_s,
  worstPerChannel,
  type Corner,
  type CreateSweepRequest,
  type PairResult,
  type SweepInputs,
  type SweepSummary,
} from "./sweeps";

/** The channels a request names, in its order (a program's: by name); 404 for a missing one. */
async function requestedChannels(tx: Tx, req: CreateSweepRequest) {
  const cols = {
    id: channels.id,
    name: channels.name,
    kind: channels.kind,
    lossAtNyquist_dB: channels.lossAtNyquist_dB,
    pulse: channels.pulse,
    derivation: channels.derivation,
  };
  if (req.programId !== undefined) {
    const [program] = await tx.select({ name: programs.name }).from(programs).where(eq(programs.id, req.programId));
    if (!program) throw notFound(`Program ${req.programId}`);
    const list = await tx
      .select(cols)
      .from(channels)
      .where(eq(channels.programId, req.programId))
      .orderBy(asc(channels.name));
    if (list.length === 0) throw unprocessable(`The program “${program.name}” has no channels yet.`, "programId");
    return list;
  }
  const ids = req.channelIds ?? [];
  const byId = new Map((await tx.select(cols).from(channels).where(inArray(channels.id, ids))).map((c) => [c.id, c]));
  const missing = ids.find((id) => !byId.has(id));
  if (missing !== undefined) throw notFound(`Channel ${missing}`);
  return ids.map((id) => byId.get(id)!);
}

/**
 * POST /api/v1/sweeps: checks every corner against the budget (422 naming the corner), copies the
 * inputs, and queues the parent job with one batch job per channel and run of corners.
 */
export async function startSweep(user: SessionUser, req: CreateSweepRequest) {
  const { id, jobId } = await db.transaction(async (tx) => {
    const budget = await budgetCopy(tx, req.budgetId);
    const chans = await requestedChannels(tx, req);
    const path = req.programId !== undefined ? "programId" : "channelIds";
    checkOneRate(chans, path);
    checkBudgetFits(budget.params, budget.name, chans);
    const pairCount = chans.length * req.corners.length;
    if (pairCount > MAX_PAIRS) {
      throw unprocessable(
        `${chans.length} channels × ${req.corners.length} corners make ${pairCount} pairs; a sweep computes at most ${MAX_PAIRS}.`,
        path,
      );
    }
    req.corners.forEach((c, i) => {
      try {
        cornerBudget(budget.params, c);
      } catch (e) {
        if (e instanceof RangeError) throw unprocessable(e.message, `corners.${i}`);
        throw e;
      }
    });
    const inputs: SweepInputs = {
      budget: { id: budget.id, name: budget.name, params: budget.params },
      corners: req.corners,
      channels: chans.map((c) => ({ id: c.id, name: c.name, lossAtNyquist_dB: c.lossAtNyquist_dB })),
    };
    const jobId = await enqueueJob(tx, "sweep", 0, { waitForChildren: true });
    const [{ id }] = await tx
      .insert(sweeps)
      .values({ name: req.name, jobId, budgetId: budget.id, inputs, pairCount, createdBy: user.id })
      .$returningId();
    await tx.update(jobs).set({ targetId: id }).where(eq(jobs.id, jobId));
    await tx.insert(sweepChannels).values(
      chans.map((c, position) => ({
        sweepId: id,
        position,
        channelId: c.id,
        kind: c.kind,
        pulse: c.pulse,
        derivation: c.derivation,
      })),
    );
    const batches = sweepBatches(chans.length, req.corners.length);
    await tx.insert(jobs).values(
      batches.map((_, part) => ({
        kind: "sweep-batch" as const,
        targetId: id,
        queue: config.queue.backend,
        parentId: jobId,
        part,
        status: "queued" as const,
      })),
    );
    await recordAudit(tx, user, "sweep.start", "sweep", id, {
      name: req.name,
      budget: budget.name,
      channels: chans.length,
      corners: req.corners.map((c) => c.name),
    });
    return { id, jobId };
  });
  startJobs(jobId);
  return { id, status: "queued" as const };
}

async function sweepRow(id: number) {
  const [row] = await db
    .select({ sweep: sweeps, job: jobs, by: users.name })
    .from(sweeps)
    .innerJoin(jobs, eq(jobs.id, sweeps.jobId))
    .leftJoin(users, eq(users.id, sweeps.createdBy))
    .where(eq(sweeps.id, id));
  if (!row) throw notFound(`Sweep ${id}`);
  return row;
}

const asPair = (r: SweepResult): PairResult => ({
  channelId: r.channelId,
  cornerIndex: r.cornerIndex,
  limiterHeadroom_V: r.limiterHeadroom_V,
  eyeHeight_V: r.eyeHeight_V,
  linearHeadroom_V: r.linearHeadroom_V,
  linearReachExhausted: r.linearReachExhausted,
  fewestDfeTaps: r.fewestDfeTaps,
  setting: r.setting,
  error: r.error,
});

async function resultsOf(sweepId: number): Promise<SweepResult[]> {
  return db.select().from(sweepResults).where(eq(sweepResults.sweepId, sweepId)).orderBy(asc(sweepResults.id));
}

/** Progress of a sweep: pairs done of all, and the time left at the pace so far. */
async function progressOf(sweepId: number, pairCount: number, job: Job) {
  const [{ done }] = await db.select({ done: count() }).from(sweepResults).where(eq(sweepResults.sweepId, sweepId));
  const [{ first }] = await db
    .select({ first: min(jobs.startedAt) })
    .from(jobs)
    .where(eq(jobs.parentId, job.id));
  const elapsed_s = first ? (Date.now() - new Date(first).getTime()) / 1000 : 0;
  const status = apiStatus(job.status);
  return {
    status: status === "running" && done === 0 && first === null ? ("queued" as const) : status,
    progress: job.status === "done" ? 1 : pairCount === 0 ? 0 : Math.min(0.99, done / pairCount),
    done,
    total: pairCount,
    timeLeft_s: job.status === "done" ? 0 : timeLeft_s(done, pairCount, elapsed_s),
  };
}

/** Cancels a sweep that has not finished, with every batch not yet done: it ends failed, "Cancelled by <name>."; 409 once finished. */
export async function cancelSweep(user: SessionUser, id: number) {
  const { sweep } = await sweepRow(id);
  return {
    id,
    ...(await cancelJobFor(sweep.jobId, user, "sweep", (tx) => recordAudit(tx, user, "sweep.cancel", "sweep", id))),
  };
}

/** GET /api/v1/sweeps/:id?fields=status: only the progress (cheap polling). */
export async function getSweepStatus(id: number) {
  const { sweep, job } = await sweepRow(id);
  return {
    id,
    ...(await progressOf(id, sweep.pairCount, job)),
    ...(job.error ? { error: { message: job.error } } : {}),
  };
}

/**
 * GET /api/v1/sweeps/:id: the inputs, the progress, and the results so far; once done the binding
 * corner of every channel (`worst`).
 */
export async function getSweep(id: number) {
  const { sweep, job, by } = await sweepRow(id);
  const rows = await resultsOf(id);
  const inputs = sweep.inputs;
  const corner = (i: number) => inputs.corners[i]?.name ?? `#${i}`;
  const summary: SweepSummary | null = sweep.summary;
  return {
    id: sweep.id,
    name: sweep.name,
    ...(await progressOf(id, sweep.pairCount, job)),
    ...(job.error ? { error: { message: job.error } } : {}),
    budget: { id: inputs.budget.id, name: inputs.budget.name },
    corners: inputs.corners,
    channels: inputs.channels,
    results: rows.map((r) => ({ ...asPair(r), corner: corner(r.cornerIndex), compute_ms: r.compute_ms })),
    worst: summary
      ? summary.worst.map((w) => ({ channelId: w.channelId, corner: w.corner, limiterHeadroom_V: w.limiterHeadroom_V }))
      : null,
    summary,
    requiredHeadroom_V:
      typeof inputs.budget.params.requiredHeadroom_V === "number" ? inputs.budget.params.requiredHeadroom_V : 0,
    engineVersion: sweep.engineVersion,
    createdBy: by,
    createdAt: sweep.createdAt,
  };
}

/** The sweep page's figures: the heat map's cells, the binding corners, the histogram (from the results so far). */
export async function sweepFigures(id: number) {
  const view = await getSweep(id);
  const byPair = new Map(view.results.map((r) => [`${r.channelId}:${r.cornerIndex}`, r]));
  const worst = worstPerChannel(view.channels, view.corners, view.results);
  const bindingOf = new Map(worst.map((w) => [w.channelId, w.cornerIndex]));
  return {
    view,
    cells: view.channels.map((ch) =>
      view.corners.map((_, k) => {
        const r = byPair.get(`${ch.id}:${k}`);
        return {
          headroom_mV: r?.limiterHeadroom_V === null || r === undefined ? null : r.limiterHeadroom_V * 1e3,
          linearReachExhausted: r?.linearReachExhausted ?? null,
        };
      }),
    ),
    binding: view.channels.map((ch) => bindingOf.get(ch.id) ?? -1),
    worst,
    histogram: headroomHistogram(
      view.results.flatMap((r) => (r.limiterHeadroom_V === null ? [] : [r.limiterHeadroom_V])),
    ),
  };
}

/** GET /api/v1/sweeps/:id/export: every pair as CSV. */
export async function exportSweep(id: number) {
  const { sweep } = await sweepRow(id);
  const rows = await resultsOf(id);
  return {
    filename: `${sweep.name.replace(/[^A-Za-z0-9._-]+/g, "_").replace(/^_+|_+$/g, "") || "sweep"}_${id}.csv`,
    body: sweepCsv(sweep.inputs, rows.map(asPair)),
  };
}

/** GET /api/v1/sweeps: newest first, with progress. */
export async function listSweeps(limit: number, cursor?: number) {
  const rows = await db
    .select({ sweep: sweeps, job: jobs, by: users.name })
    .from(sweeps)
    .innerJoin(jobs, eq(jobs.id, sweeps.jobId))
    .leftJoin(users, eq(users.id, sweeps.createdBy))
    .where(cursor ? lt(sweeps.id, cursor) : undefined)
    .orderBy(desc(sweeps.id))
    .limit(limit + 1);
  const page = rows.slice(0, limit);
  const done = page.length
    ? await db
        .select({ sweepId: sweepResults.sweepId, n: count() })
        .from(sweepResults)
        .where(
          inArray(
            sweepResults.sweepId,
            page.map((r) => r.sweep.id),
          ),
        )
        .groupBy(sweepResults.sweepId)
    : [];
  const doneOf = new Map(done.map((d) => [d.sweepId, Number(d.n)]));
  const items = page.map(({ sweep, job, by }) => {
    const worst = sweep.summary?.worst ?? [];
    return {
      id: sweep.id,
      name: sweep.name,
      status: apiStatus(job.status),
      done: doneOf.get(sweep.id) ?? 0,
      total: sweep.pairCount,
      budget: sweep.inputs.budget.name,
      channelCount: sweep.inputs.channels.length,
      cornerCount: sweep.inputs.corners.length,
      worstHeadroom_V: worst.length ? Math.min(...worst.map((w) => w.limiterHeadroom_V)) : null,
      createdBy: by,
      createdAt: sweep.createdAt,
    };
  });
  return { items, nextCursor: rows.length > limit ? String(page[page.length - 1].sweep.id) : null };
}

/** Number of sweeps (the overview's count). */
export async function countSweeps(): Promise<number> {
  const [{ n }] = await db.select({ n: count() }).from(sweeps);
  return n;
}

/** A sweep's corners, for a tap table version that must hold at them. */
export interface SweepCorners {
  corners: Corner[];
  sweep: { id: number; name: string };
}

/** The corners of sweep `id` (404 when there is none). */
export async function sweepCorners(tx: Tx, id: number): Promise<SweepCorners> {
  const [row] = await tx.select({ name: sweeps.name, inputs: sweeps.inputs }).from(sweeps).where(eq(sweeps.id, id));
  if (!row) throw notFound(`Sweep ${id}`);
  return { corners: row.inputs.corners, sweep: { id, name: row.name } };
}

/** Sweeps whose every pair is done, for the tap-table form (a version can take a sweep's corners). */
export async function finishedSweeps() {
  const rows = await db
    .select({ id: sweeps.id, name: sweeps.name, inputs: sweeps.inputs })
    .from(sweeps)
    .innerJoin(jobs, and(eq(jobs.id, sweeps.jobId), eq(jobs.status, "done")))
    .orderBy(desc(sweeps.id))
    .limit(200);
  return rows.map((r) => ({ id: r.id, name: r.name, corners: r.inputs.corners, budgetId: r.inputs.budget.id }));
}

registerJobKind("sweep-batch", {
  async input(job): Promise<SweepBatchInput> {
    const [sweep] = await db
      .select({ inputs: sweeps.inputs, pairCount: sweeps.pairCount })
      .from(sweeps)
      .where(eq(sweeps.id, job.targetId));
    if (!sweep) throw new Error(`Sweep ${job.targetId} no longer exists.`);
    const batch = sweepBatches(sweep.inputs.channels.length, sweep.inputs.corners.length)[job.part ?? -1];
    if (!batch) throw new Error(`Sweep ${job.targetId} has no batch ${job.part}.`);
    const [ch] = await db
      .select()
      .from(sweepChannels)
      .where(and(eq(sweepChannels.sweepId, job.targetId), eq(sweepChannels.position, batch.channelIndex)));
    const corners = batch.cornerIndices.map((index) => sweep.inputs.corners[index]);
    let touchstone: string | null = null;
    if (needsTouchstone(ch.kind, corners)) {
      touchstone = await channelSourceText(db, ch.channelId);
      if (touchstone === null)
        throw new Error(
          `The Touchstone file of “${sweep.inputs.channels[batch.channelIndex].name}” was deleted; its loss corners cannot be rebuilt.`,
        );
    }
    return {
      budget: sweep.inputs.budget.params,
      channel: { id: ch.channelId, kind: ch.kind, pulse: ch.pulse, derivation: ch.derivation, touchstone },
      corners: batch.cornerIndices.map((index) => ({ index, corner: sweep.inputs.corners[index] })),
    };
  },
  async save(tx, job, result) {
    const r = result as SweepBatchResult;
    await tx.insert(sweepResults).values(r.pairs.map((p) => ({ sweepId: job.targetId, jobId: job.id, ...p })));
    await tx.update(sweeps).set({ engineVersion: r.engineVersion }).where(eq(sweeps.id, job.targetId));
  },
});

registerJobKind("sweep", {
  async input(job) {
    const [sweep] = await db.select({ inputs: sweeps.inputs }).from(sweeps).where(eq(sweeps.id, job.targetId));
    if (!sweep) throw new Error(`Sweep ${job.targetId} no longer exists.`);
    return {
      inputs: sweep.inputs,
      results: (await resultsOf(job.targetId)).map((r) => ({ ...asPair(r), compute_ms: r.compute_ms })),
    };
  },
  async save(tx, job, result) {
    await tx
      .update(sweeps)
      .set({ summary: result as SweepSummary })
      .where(eq(sweeps.id, job.targetId));
  },
});
