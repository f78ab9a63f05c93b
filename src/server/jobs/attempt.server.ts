// One attempt at a job, the same for both backends: claim the row with a fresh lock token, read the
// input, compute in a worker pool, and close the row — storing the result only while the token is
// still the row's, so that a late or duplicate attempt (a worker thought dead, a job delivered twice)
// can never overwrite a newer result. Closing the last child of a parent queues the parent.
import { randomUUID } from "node:crypto";
import { and, asc, eq, inArray, lt, ne, or, sql } from "drizzle-orm";
import { db, type Tx } from "../db.server";
import { jobs, type Job } from "@/db/schema";
import type { JobKind } from "@/features/jobs/jobs";
import { config } from "../config.server";
import { handlerFor } from "./kinds.server";
import { logError } from "../http/logError";

/** Attempts a job gets before it is failed for good (workers that died under it count). */
export const MAX_ATTEMPTS = 3;

/** Failed lease renewals in a row that end an attempt (renewals come every third of the lease). */
export const HEARTBEAT_FAILURES_TO_END = 2;

/** A job claimed by this attempt, and the token that proves it. */
export interface Claim {
  job: Job;
  token: string;
}

/** How an attempt ended: stored, failed (the engine refused: no retry), or fenced off by a newer attempt. */
export type Outcome =
  { kind: "done"; parentQueued: number | null } | { kind: "failed"; message: string } | { kind: "fenced" };

/**
 * Computes one job's result off the event loop (the piscina pool), reporting progress 0…1; `signal`
 * aborts it (the worker thread computing it is terminated).
 */
export type Compute = (
  kind: JobKind,
  input: unknown,
  onProgress: (p: number) => void,
  signal: AbortSignal,
) => Promise<unknown>;

const lockExpiry = () => sql`NOW(3) + INTERVAL ${Math.round(config.queue.lock_s * 1e6)} MICROSECOND`;

async function takeRow(tx: Tx, job: Job, owner: string): Promise<Claim | null> {
  if (job.attempts >= MAX_ATTEMPTS) {
    await failInTx(
      tx,
      job,
      `The job stopped ${job.attempts} times before it could finish (a worker or server died under it); start it again.`,
    );
    return null;
  }
  const token = randomUUID();
  await tx
    .update(jobs)
    .set({
      status: "running",
      lockToken: token,
      lockedBy: owner.slice(0, 64),
      lockedUntil: lockExpiry(),
      startedAt: job.startedAt ?? sql`NOW(3)`,
      attempts: job.attempts + 1,
      error: null,
    })
    .where(eq(jobs.id, job.id));
  return { job: { ...job, status: "running", lockToken: token, attempts: job.attempts + 1 }, token };
}

/**
 * The embedded dispatcher's claim: the oldest queued job, or a running one whose lock lapsed (its
 * process died), skipping rows another dispatcher is claiming. A job out of attempts is failed on
 * the way, and the claim goes on to the next one (so one exhausted job never stalls the queue).
 */
export async function claimNext(owner: string): Promise<Claim | null> {
  for (;;) {
    const taken = await db.transaction(async (tx) => {
      const [job] = await tx
        .select()
        .from(jobs)
        .where(
          and(
            eq(jobs.queue, "embedded"),
            or(eq(jobs.status, "queued"), and(eq(jobs.status, "running"), lt(jobs.lockedUntil, sql`NOW(3)`))),
          ),
        )
        .orderBy(asc(jobs.id))
        .limit(1)
        .for("update", { skipLocked: true });
      return job ? ((await takeRow(tx, job, owner)) ?? ("exhausted" as const)) : null;
    });
    if (taken !== "exhausted") return taken;
  }
}

/**
 * A distributed worker's claim of the job it was handed. BullMQ hands a job to one worker at a time
 * and hands it again only once the previous holder's lock lapsed, so a running row is taken over
 * (its old token stops counting). Done, failed and waiting rows are not claimed.
 */
export async function claimJob(id: number, owner: string): Promise<Claim | null> {
  return db.transaction(async (tx) => {
    const [job] = await tx.select().from(jobs).where(eq(jobs.id, id)).for("update");
    if (!job || (job.status !== "queued" && job.status !== "running")) return null;
    return takeRow(tx, job, owner);
  });
}

/** Why an attempt was stopped from outside its computation. */
type Stop =
  /** The row is no longer this attempt's (cancelled, failed, or taken over): leave it alone. */
  | { kind: "lost" }
  /** The attempt could not renew its lease: end it; the lock lapses and the job is tried again. */
  | { kind: "heartbeat"; error: unknown }
  /** The attempt ran past the wall-time limit: the job fails (it would run as long again). */
  | { kind: "time"; limit_s: number };

/** This process's attempts in progress, by job id: how to stop each (a cancel asked for here). */
const inProgress = new Map<number, (stop: Stop) => void>();

/**
 * Stops this process's attempt at a job at once (its worker thread is terminated), when it runs
 * here; the row must already say why (a cancel commits first). Attempts elsewhere notice at their
 * next heartbeat, which finds the row no longer theirs.
 */
export function stopLocalAttempt(jobId: number): void {
  inProgress.get(jobId)?.({ kind: "lost" });
}

/** A duration for a message: "90 s", "15 min". */
function formatLimit(s: number): string {
  return s < 120 ? `${Math.round(s)} s` : `${Math.round(s / 60)} min`;
}

/** Turns an engine error (or the end of its worker) into a sentence for the person who started the job. */
export function failureReason(e: unknown): string {
  const code = (e as { code?: unknown } | null)?.code;
  if (code === "ERR_WORKER_OUT_OF_MEMORY") {
    return `The engine ran out of memory (each worker may use ${config.jobs.workerMemory_MB} MB of heap) and its worker was stopped and replaced. Coarsen the budget's grids (a larger transmit FIR step, fewer taps, a coarser CTLE grid) or use fewer channels.`;
  }
  const message = e instanceof Error ? e.message : String(e);
  if (code === "ERR_WORKER_INIT_FAILED" || /worker (thread )?exited|terminat/i.test(message)) {
    return `The engine's worker stopped unexpectedly (${message}) and was replaced; start the job again, and tell an admin if it happens again.`;
  }
  return message.length > 0 ? message : "The engine stopped without saying why.";
}

/**
 * Runs a claimed attempt to its end. The engine's refusals fail the job (they would fail again), as
 * do a worker that crashed or ran out of memory and an attempt past the wall-time limit (its worker
 * thread is terminated and replaced). A heartbeat that finds the row no longer this attempt's (a
 * cancel, a takeover) stops the computation and leaves the row alone. A heartbeat or a store that
 * fails (the database went away) is logged and thrown, so the attempt's lock lapses and the job is
 * tried again.
 */
export async function runClaimed(claim: Claim, compute: Compute): Promise<Outcome> {
  const { job, token } = claim;
  const handler = handlerFor(job.kind);
  const mine = and(eq(jobs.id, job.id), eq(jobs.lockToken, token), eq(jobs.status, "running"));
  const controller = new AbortController();
  const attempt: { stopped: Stop | null } = { stopped: null };
  const stop = (why: Stop) => {
    if (attempt.stopped !== null) return;
    attempt.stopped = why;
    controller.abort();
  };
  inProgress.set(job.id, stop);
  const limit_s = config.jobs.timeLimit_s;
  const deadline = setTimeout(() => stop({ kind: "time", limit_s }), limit_s * 1000);
  // The lease is renewed every third of its length: one failed renewal (a deadlock, a blip) is
  // logged and the next one tried; a second in a row leaves too little of the lease, so the
  // attempt ends rather than compute on while another worker may take the job over.
  let heartbeatFailures = 0;
  const heartbeat = setInterval(
    () => {
      db.update(jobs)
        .set({ lockedUntil: lockExpiry() })
        .where(mine)
        .then((r) => {
          heartbeatFailures = 0;
          if (r[0].affectedRows === 0) stop({ kind: "lost" });
        })
        .catch((e) => {
          heartbeatFailures++;
          const ending = heartbeatFailures >= HEARTBEAT_FAILURES_TO_END;
          logError(
            `job ${job.id} (${job.kind}): heartbeat failed${ending ? ", ending the attempt" : ", trying again"}`,
            e,
          );
          if (ending) stop({ kind: "heartbeat", error: e });
        });
    },
    (config.queue.lock_s * 1000) / 3,
  );
  let lastWrite = 0;
  let progressFailed = false;
  const started = performance.now();
  try {
    let result: unknown;
    try {
      const input = await handler.input(job);
      result = await compute(
        job.kind,
        input,
        (progress) => {
          const now = Date.now();
          if (now - lastWrite < 250) return;
          lastWrite = now;
          // Progress never goes back (a retried attempt, a parent whose children brought it far).
          const p = Math.min(0.99, Math.max(0, progress));
          db.update(jobs)
            .set({ progress: sql`GREATEST(${jobs.progress}, ${p})` })
            .where(mine)
            .catch((e) => {
              // Progress is advisory: the heartbeat decides whether the attempt goes on. Logged once.
              if (!progressFailed) logError(`job ${job.id} (${job.kind}): progress not stored`, e);
              progressFailed = true;
            });
        },
        controller.signal,
      );
    } catch (e) {
      const why = attempt.stopped;
      if (why?.kind === "lost") return { kind: "fenced" };
      if (why?.kind === "heartbeat") throw why.error;
      if (why?.kind === "time") {
        return await failAttempt(
          claim,
          `The job ran longer than its limit of ${formatLimit(why.limit_s)} and was stopped. Coarsen the budget's grids (a larger transmit FIR step, fewer taps, a coarser CTLE grid) or use fewer channels, then start it again.`,
        );
      }
      return await failAttempt(claim, failureReason(e));
    }
    const compute_ms = Math.round(performance.now() - started);
    return await closeAttempt(claim, async (tx) => {
      await handler.save(tx, job, result);
      await tx
        .update(jobs)
        .set({ status: "done", progress: 1, finishedAt: sql`NOW(3)`, compute_ms, lockedBy: null, lockedUntil: null })
        .where(eq(jobs.id, job.id));
    });
  } finally {
    clearTimeout(deadline);
    clearInterval(heartbeat);
    inProgress.delete(job.id);
  }
}

/**
 * One closing transaction, fenced: the parent row is locked first (siblings finishing at once take
 * turns, so exactly one of them sees the last child done), then this job's row, whose token must
 * still be this attempt's and whose status must still be running.
 */
async function closeAttempt(claim: Claim, close: (tx: Tx) => Promise<void>): Promise<Outcome> {
  const { job, token } = claim;
  return db.transaction(async (tx) => {
    if (job.parentId !== null)
      await tx.select({ id: jobs.id }).from(jobs).where(eq(jobs.id, job.parentId)).for("update");
    const [row] = await tx
      .select({ status: jobs.status, lockToken: jobs.lockToken })
      .from(jobs)
      .where(eq(jobs.id, job.id))
      .for("update");
    if (!row || row.status !== "running" || row.lockToken !== token) return { kind: "fenced" } as const;
    await close(tx);
    if (job.parentId === null) return { kind: "done", parentQueued: null } as const;
    await rollUpProgress(tx, job.parentId);
    return { kind: "done", parentQueued: await queueParentIfReady(tx, job.parentId) } as const;
  });
}

/**
 * A waiting parent's progress is its children's mean (a done child counts 1), and so on up the tree:
 * a tap table version moves as its members' own optima come in.
 */
async function rollUpProgress(tx: Tx, parentId: number): Promise<void> {
  let id: number | null = parentId;
  while (id !== null) {
    const [row] = await tx.select({ parentId: jobs.parentId, status: jobs.status }).from(jobs).where(eq(jobs.id, id));
    if (!row || row.status !== "waiting") return;
    const [mean] = await tx
      .select({ p: sql<number>`AVG(CASE WHEN ${jobs.status} = 'done' THEN 1 ELSE ${jobs.progress} END)` })
      .from(jobs)
      .where(eq(jobs.parentId, id));
    await tx
      .update(jobs)
      .set({ progress: Math.min(0.99, Number(mean.p) || 0) })
      .where(eq(jobs.id, id));
    id = row.parentId;
  }
}

/** Queues a waiting parent whose children are all done; its id, or null. */
async function queueParentIfReady(tx: Tx, parentId: number): Promise<number | null> {
  const [open] = await tx
    .select({ n: sql<number>`COUNT(*)` })
    .from(jobs)
    .where(and(eq(jobs.parentId, parentId), ne(jobs.status, "done")));
  if (Number(open.n) > 0) return null;
  const r = await tx
    .update(jobs)
    .set({ status: "queued" })
    .where(and(eq(jobs.id, parentId), eq(jobs.status, "waiting")));
  return r[0].affectedRows > 0 ? parentId : null;
}

async function failAttempt(claim: Claim, message: string): Promise<Outcome> {
  const out = await closeAttempt(claim, (tx) => failInTx(tx, claim.job, message));
  return out.kind === "fenced" ? out : { kind: "failed", message };
}

/**
 * Fails a job (and its target), its parent (a sweep with a failed share cannot be whole) and the
 * parent's other children that have not run yet.
 */
async function failInTx(tx: Tx, job: Job, message: string): Promise<void> {
  const text = message.slice(0, 2000);
  await tx
    .update(jobs)
    .set({ status: "failed", error: text, finishedAt: sql`NOW(3)`, lockedBy: null, lockedUntil: null })
    .where(eq(jobs.id, job.id));
  await handlerFor(job.kind).fail?.(tx, job, text);
  if (job.parentId === null) return;
  const [parent] = await tx.select().from(jobs).where(eq(jobs.id, job.parentId));
  if (!parent || parent.status === "failed" || parent.status === "done") return;
  await tx
    .update(jobs)
    .set({ status: "failed", error: "Another part of this job failed.", finishedAt: sql`NOW(3)` })
    .where(and(eq(jobs.parentId, job.parentId), inArray(jobs.status, ["queued", "waiting"])));
  await failInTx(tx, parent, text);
}

/** Marks a job failed from outside an attempt (a distributed job that failed for good in the queue itself). */
export async function failJob(id: number, message: string): Promise<void> {
  await db.transaction(async (tx) => {
    const [job] = await tx.select().from(jobs).where(eq(jobs.id, id)).for("update");
    if (job && job.status !== "done" && job.status !== "failed") await failInTx(tx, job, message);
  });
}

/** How a cancel ended: the job (and its children) failed with the message, or it had already finished. */
export type CancelOutcome = { cancelled: true; jobIds: number[] } | { cancelled: false; status: "done" | "failed" };

/**
 * Cancels a job that has not finished, whichever backend holds it: the job fails with `message`
 * (its target too, and a parent it is a share of), and so do its children that have not finished.
 * Attempts computing them see at their next heartbeat that the rows are no longer theirs and stop
 * (their worker threads are terminated); `stopLocalAttempt` stops this process's at once. `also`
 * runs in the same transaction (the audit event).
 */
export async function cancelJob(id: number, message: string, also?: (tx: Tx) => Promise<void>): Promise<CancelOutcome> {
  // The cancel locks the job and then its children while the attempt computing it renews its lease
  // and stores progress: InnoDB may pick the cancel as a deadlock's victim. It rolled back whole,
  // so it is simply tried again.
  for (let attempt = 1; ; attempt++) {
    try {
      return await cancelOnce(id, message, also);
    } catch (e) {
      if (attempt >= DEADLOCK_RETRIES || !isDeadlock(e)) throw e;
    }
  }
}

/** Times a transaction chosen as a deadlock's victim is tried again before the error stands. */
const DEADLOCK_RETRIES = 4;

function isDeadlock(e: unknown): boolean {
  for (let c: unknown = e; c && typeof c === "object"; c = (c as { cause?: unknown }).cause) {
    if ((c as { errno?: number }).errno === 1213) return true; // ER_LOCK_DEADLOCK
  }
  return false;
}

async function cancelOnce(id: number, message: string, also?: (tx: Tx) => Promise<void>): Promise<CancelOutcome> {
  return db.transaction(async (tx): Promise<CancelOutcome> => {
    const [job] = await tx.select().from(jobs).where(eq(jobs.id, id)).for("update");
    if (!job) throw new Error(`job ${id} has gone`);
    if (job.status === "done" || job.status === "failed") return { cancelled: false, status: job.status };
    const children = await tx
      .select({ id: jobs.id })
      .from(jobs)
      .where(and(eq(jobs.parentId, id), inArray(jobs.status, ["queued", "waiting", "running"])))
      .for("update");
    if (children.length > 0) {
      await tx
        .update(jobs)
        .set({
          status: "failed",
          error: message.slice(0, 2000),
          finishedAt: sql`NOW(3)`,
          lockedBy: null,
          lockedUntil: null,
        })
        .where(
          inArray(
            jobs.id,
            children.map((c) => c.id),
          ),
        );
    }
    await failInTx(tx, job, message);
    await also?.(tx);
    return { cancelled: true, jobIds: [id, ...children.map((c) => c.id)] };
  });
}
