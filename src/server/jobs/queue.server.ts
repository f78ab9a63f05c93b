// Long work behind one interface, whichever backend runs it: services add job rows inside their
// own transaction (`enqueueJob`) and, after the commit, start them (`startJobs`). The embedded
// backend (the default) runs them in this web server's worker pool; with TAPWRIGHT_QUEUE=bullmq they
// go to BullMQ on Redis for standalone workers. The rows in MariaDB carry status and progress either way.
import { count, eq, inArray } from "drizzle-orm";
import { db, type DbOrTx, type Tx } from "../db.server";
import { jobs, type Job } from "@/db/schema";
import type { ApiJobStatus, JobKind, JobStatus } from "@/features/jobs/jobs";
import { config } from "../config.server";
import { embeddedWorker, pumpEmbedded, startEmbeddedDispatcher } from "./embedded.server";
import { cancelJob, stopLocalAttempt } from "./attempt.server";
import { conflict } from "../http/errors";
import { logError } from "../http/logError";

export { registerJobKind, type JobHandler } from "./kinds.server";

export interface EnqueueOptions {
  /** The parent this job is a share of (the parent waits for all its children). */
  parentId?: number;
  /** Which share of the parent's target this is (a sweep's batch). */
  part?: number;
  /** A parent added before its children: it waits until they are all done. */
  waitForChildren?: boolean;
}

/** Adds a job inside the caller's transaction; call `startJobs` with the root's id after the commit. */
export async function enqueueJob(
  tx: DbOrTx,
  kind: JobKind,
  targetId: number,
  options: EnqueueOptions = {},
): Promise<number> {
  const [{ id }] = await tx
    .insert(jobs)
    .values({
      kind,
      targetId,
      queue: config.queue.backend,
      parentId: options.parentId ?? null,
      part: options.part ?? null,
      status: options.waitForChildren ? "waiting" : "queued",
    })
    .$returningId();
  return id;
}

/**
 * Starts a committed job and its children: the embedded dispatcher claims them, or they are handed
 * to BullMQ. Never throws: a job that could not be handed over stays queued in MariaDB, where the
 * embedded dispatcher's polling or the distributed reconciler picks it up.
 */
export function startJobs(rootId: number): void {
  if (config.queue.backend === "embedded") {
    void pumpEmbedded();
    return;
  }
  void import("./bullmq.server")
    .then((b) => b.publishJob(rootId))
    .catch((e) => logError(`job ${rootId} stays queued until the reconciler hands it over`, e));
}

/**
 * Cancels a job that has not finished (and its children), for the person who asked: the job fails
 * with "Cancelled by <name>." and any attempt computing it is stopped (here at once, elsewhere at
 * its next heartbeat). 409 when the job has already finished.
 */
export async function cancelJobFor(
  jobId: number,
  by: { name: string },
  what: string,
  also?: (tx: Tx) => Promise<void>,
): Promise<{ status: "failed"; error: { message: string } }> {
  const message = `Cancelled by ${by.name}.`;
  const out = await cancelJob(jobId, message, also);
  if (!out.cancelled)
    throw conflict(
      `The ${what} has already ${out.status === "done" ? "finished" : "failed"}; there is nothing to cancel.`,
    );
  for (const id of out.jobIds) stopLocalAttempt(id);
  return { status: "failed", error: { message } };
}

/** Starts this web server's share of the work: the embedded dispatcher (nothing with BullMQ: workers compute). */
export function startJobBackend(): void {
  if (config.queue.backend === "embedded") startEmbeddedDispatcher();
}

export async function jobById(id: number): Promise<Job | null> {
  const [job] = await db.select().from(jobs).where(eq(jobs.id, id));
  return job ?? null;
}

/** A job's status as the API tells it: a parent waiting for its children is running. */
export function apiStatus(status: JobStatus): ApiJobStatus {
  return status === "waiting" ? "running" : status;
}

/** The status fields the API shows for a job. */
export function jobStatus(job: Pick<Job, "status" | "progress" | "error" | "startedAt" | "finishedAt" | "compute_ms">) {
  return {
    status: apiStatus(job.status),
    progress: job.progress,
    ...(job.error ? { error: { message: job.error } } : {}),
    startedAt: job.startedAt,
    finishedAt: job.finishedAt,
    compute_ms: job.compute_ms,
  };
}

/** The admin page's view of the queue: backend, job rows by status, and the workers computing them. */
export async function queueOverview() {
  const byStatus = await db.select({ status: jobs.status, n: count() }).from(jobs).groupBy(jobs.status);
  const rows = Object.fromEntries(byStatus.map((r) => [r.status, Number(r.n)])) as Partial<Record<JobStatus, number>>;
  const running = await db
    .select({ lockedBy: jobs.lockedBy, n: count() })
    .from(jobs)
    .where(inArray(jobs.status, ["running"]))
    .groupBy(jobs.lockedBy);
  const busy = running.map((r) => ({ name: r.lockedBy ?? "—", running: Number(r.n) }));
  if (config.queue.backend === "embedded") {
    return { backend: "embedded" as const, rows, busy, here: embeddedWorker(), distributed: null };
  }
  const { distributedOverview } = await import("./bullmq.server");
  return { backend: "bullmq" as const, rows, busy, here: null, distributed: await distributedOverview() };
}
