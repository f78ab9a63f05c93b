// The job queue kept in MariaDB. Features register what to do with a kind of job; the dispatcher
// claims queued jobs (SELECT … FOR UPDATE SKIP LOCKED), runs them in the worker pool off the event
// loop, writes progress, and stores the result and the job's end in one transaction.
import { randomUUID } from "node:crypto";
import { and, asc, eq, lt, or, sql } from "drizzle-orm";
import { db, type DbOrTx, type Tx } from "../db.server";
import { jobs, type Job, type JobKind } from "@/db/schema";
import { runInPool, workerCount } from "./pool.server";

/** What the server does around the worker for one kind of job. */
export interface JobHandler {
  /** The worker's input, read from the job's target row. */
  input(targetId: number): Promise<unknown>;
  /** Stores the worker's result on the target row (inside the job's closing transaction). */
  save(tx: Tx, targetId: number, result: unknown): Promise<void>;
  /** Marks the target row as failed, when it has a state of its own. */
  fail?(tx: Tx, targetId: number, message: string): Promise<void>;
}

const handlers = new Map<JobKind, JobHandler>();
export function registerJobKind(kind: JobKind, handler: JobHandler): void {
  handlers.set(kind, handler);
}

const SERVER_ID = `${process.pid}-${randomUUID().slice(0, 8)}`;
const LOCK_S = 30;
const MAX_ATTEMPTS = 3;
let active = 0;

/** Adds a job inside the caller's transaction; call `pumpJobs()` after the commit. */
export async function enqueueJob(tx: DbOrTx, kind: JobKind, targetId: number): Promise<number> {
  const [{ id }] = await tx.insert(jobs).values({ kind, targetId }).$returningId();
  return id;
}

async function claim(): Promise<Job | null> {
  return db.transaction(async (tx) => {
    const [job] = await tx
      .select()
      .from(jobs)
      .where(or(eq(jobs.status, "queued"), and(eq(jobs.status, "running"), lt(jobs.lockedUntil, sql`NOW(3)`))))
      .orderBy(asc(jobs.id))
      .limit(1)
      .for("update", { skipLocked: true });
    if (!job) return null;
    if (job.attempts >= MAX_ATTEMPTS) {
      await finishFailed(tx, job, "The server stopped while computing this job several times; start it again.");
      return null;
    }
    await tx
      .update(jobs)
      .set({
        status: "running",
        lockedBy: SERVER_ID,
        lockedUntil: sql`NOW(3) + INTERVAL ${LOCK_S} SECOND`,
        startedAt: sql`NOW(3)`,
        attempts: job.attempts + 1,
        progress: 0,
        error: null,
      })
      .where(eq(jobs.id, job.id));
    return { ...job, attempts: job.attempts + 1 };
  });
}

async function finishFailed(tx: Tx, job: Job, message: string) {
  await tx
    .update(jobs)
    .set({ status: "failed", error: message.slice(0, 2000), finishedAt: sql`NOW(3)`, lockedBy: null, lockedUntil: null })
    .where(eq(jobs.id, job.id));
  await handlers.get(job.kind)?.fail?.(tx, job.targetId, message);
}

/** Turns an engine error into a sentence for the person who started the job. */
function reason(e: unknown): string {
  const message = e instanceof Error ? e.message : String(e);
  return message.length > 0 ? message : "The engine stopped without saying why.";
}

async function execute(job: Job): Promise<void> {
  const handler = handlers.get(job.kind);
  const mine = and(eq(jobs.id, job.id), eq(jobs.lockedBy, SERVER_ID));
  const heartbeat = setInterval(() => {
    void db.update(jobs).set({ lockedUntil: sql`NOW(3) + INTERVAL ${LOCK_S} SECOND` }).where(mine).catch(() => {});
  }, (LOCK_S * 1000) / 3);
  let lastWrite = 0;
  const started = performance.now();
  try {
    if (!handler) throw new Error(`No handler for jobs of kind ${job.kind}.`);
    const input = await handler.input(job.targetId);
    const result = await runInPool(job.kind, input, (progress) => {
      const now = Date.now();
      if (now - lastWrite < 250) return;
      lastWrite = now;
      void db.update(jobs).set({ progress: Math.min(0.99, Math.max(0, progress)) }).where(mine).catch(() => {});
    });
    const compute_ms = Math.round(performance.now() - started);
    await db.transaction(async (tx) => {
      await handler.save(tx, job.targetId, result);
      await tx
        .update(jobs)
        .set({ status: "done", progress: 1, finishedAt: sql`NOW(3)`, compute_ms, lockedBy: null, lockedUntil: null })
        .where(mine);
    });
  } catch (e) {
    await db.transaction((tx) => finishFailed(tx, job, reason(e))).catch((err) => console.error("[tapwright] job bookkeeping:", err));
  } finally {
    clearInterval(heartbeat);
  }
}

let pumping = false;
/** Claims and starts jobs while workers are free. Safe to call often. */
export async function pumpJobs(): Promise<void> {
  if (pumping) return;
  pumping = true;
  try {
    while (active < workerCount) {
      const job = await claim();
      if (!job) break;
      active++;
      void execute(job).finally(() => {
        active--;
        void pumpJobs();
      });
    }
  } catch (e) {
    console.error("[tapwright] job queue:", e);
  } finally {
    pumping = false;
  }
}

let timer: NodeJS.Timeout | undefined;
/** Polls the queue every two seconds (jobs from other processes, lapsed locks). */
export function startJobDispatcher(): void {
  timer ??= setInterval(() => void pumpJobs(), 2000).unref();
  void pumpJobs();
}

export async function jobById(id: number): Promise<Job | null> {
  const [job] = await db.select().from(jobs).where(eq(jobs.id, id));
  return job ?? null;
}

/** The status fields the API shows for a job. */
export function jobStatus(job: Job) {
  return {
    status: job.status,
    progress: job.progress,
    ...(job.error ? { error: { message: job.error } } : {}),
    startedAt: job.startedAt,
    finishedAt: job.finishedAt,
    compute_ms: job.compute_ms,
  };
}
