// The distributed backend: long work goes to BullMQ on Redis and standalone worker processes
// (`npm run worker`, on any machine that reaches Redis and MariaDB) compute it. MariaDB's job rows
// stay the truth: a worker claims the row with a fresh token before computing and stores the result
// fenced on it; BullMQ decides who computes, recovers the jobs of a worker that died (stalled-job
// checks) and runs a parent once its children are done (flows). A reconciler puts back any job the
// queue lost (Redis restarted without its data, a publish that failed) from the MariaDB rows.
import { FlowProducer, Queue, UnrecoverableError, Worker, type FlowJob, type Job as BullJob } from "bullmq";
import { Redis } from "ioredis";
import { and, eq, inArray, lt, ne, sql } from "drizzle-orm";
import { db } from "../db.server";
import { jobs, type Job } from "@/db/schema";
import { config } from "../config.server";
import { claimJob, failJob, MAX_ATTEMPTS, runClaimed } from "./attempt.server";
import { runInPool } from "./pool.server";
import { logError } from "../http/logError";

/** The one BullMQ queue every kind of job goes through (the kind is the BullMQ job's name). */
export const QUEUE_NAME = "tapwright-jobs";

/** BullMQ's id for a MariaDB job: adding a job whose id exists is a no-op, so publishing twice is harmless. */
export const bullId = (id: number) => `job-${id}`;

interface Payload {
  jobId: number;
}

function redisUrl(): string {
  const url = config.queue.redisUrl;
  if (!url) throw new Error("REDIS_URL is not set; the distributed queue needs it.");
  return url;
}

/** A connection to Redis that retries for ever (a restart of Redis is waited out, not failed). */
function connect(): Redis {
  return new Redis(redisUrl(), { maxRetriesPerRequest: null, retryStrategy: (times) => Math.min(2000, 100 * times) });
}

/**
 * Logs a connection's errors at most once per 10 s: while Redis is away every reconnect attempt
 * fails, and an emitter without an error listener would end the process.
 */
function logErrors<T extends { on(event: "error", fn: (e: Error) => void): unknown }>(emitter: T, what: string): T {
  let last = 0;
  let quiet = 0;
  emitter.on("error", (e) => {
    const now = Date.now();
    if (now - last < 10_000) {
      quiet++;
      return;
    }
    logError(`${what}${quiet ? ` (and ${quiet} more errors since)` : ""}`, e);
    last = now;
    quiet = 0;
  });
  return emitter;
}

let queue: Queue<Payload> | undefined;
let flows: FlowProducer | undefined;
const theQueue = () => (queue ??= logErrors(new Queue<Payload>(QUEUE_NAME, { connection: connect() }), "job queue"));
const theFlows = () => (flows ??= logErrors(new FlowProducer({ connection: connect() }), "job queue (flows)"));

/** Options of every BullMQ job: a few retries for what fails outside the engine, bounded history. */
function jobOptions(id: number, bullJobId = bullId(id)) {
  return {
    jobId: bullJobId,
    attempts: 5,
    backoff: { type: "exponential" as const, delay: 2000 },
    removeOnComplete: { age: 24 * 3600, count: 20_000 },
    removeOnFail: { age: 7 * 24 * 3600 },
  };
}

/** The flow of a job and its not-yet-done descendants (children fail their parent when they fail for good). */
async function flowOf(job: Job): Promise<FlowJob> {
  const children = await db
    .select()
    .from(jobs)
    .where(and(eq(jobs.parentId, job.id), inArray(jobs.status, ["queued", "waiting", "running"])));
  return {
    name: job.kind,
    queueName: QUEUE_NAME,
    data: { jobId: job.id },
    opts: { ...jobOptions(job.id), ...(job.parentId !== null ? { failParentOnFailure: true } : {}) },
    children: await Promise.all(children.map(flowOf)),
  };
}

/** Hands a job (and its children, as one flow) to BullMQ. */
export async function publishJob(rootId: number): Promise<void> {
  const [root] = await db.select().from(jobs).where(eq(jobs.id, rootId));
  if (!root || root.status === "done" || root.status === "failed") return;
  const flow = await flowOf(root);
  if (flow.children && flow.children.length > 0) await theFlows().add(flow);
  else await theQueue().add(root.kind, { jobId: root.id }, jobOptions(root.id));
}

/** A BullMQ job's work: claim the MariaDB row, compute, store fenced. */
async function processJob(bullJob: BullJob<Payload>, owner: string): Promise<string> {
  const id = bullJob.data.jobId;
  const claim = await claimJob(id, owner);
  if (!claim) {
    const [row] = await db.select({ status: jobs.status }).from(jobs).where(eq(jobs.id, id));
    // A parent handed out before MariaDB saw its last child close: try again shortly.
    if (row?.status === "waiting") throw new Error(`job ${id} still waits for its children`);
    return row ? `already ${row.status}` : "gone";
  }
  const outcome = await runClaimed(claim, runInPool);
  // The engine refused: retrying gives the same answer, and the parent cannot be whole.
  if (outcome.kind === "failed") throw new UnrecoverableError(outcome.message);
  // Said in the worker's log: a worker that was paused or cut off learns why its work was dropped.
  if (outcome.kind === "fenced")
    console.log(
      `[tapwright] worker ${owner}: job ${id} was taken over by a newer attempt; this attempt's result was dropped.`,
    );
  return outcome.kind;
}

export interface DistributedWorker {
  name: string;
  close(): Promise<void>;
}

/**
 * A worker in this process: `concurrency` jobs at once (one per engine thread). A job whose worker
 * stops renewing its lock for `lock_s` is handed to another worker (BullMQ's stalled-job check);
 * a job that stalls MAX_ATTEMPTS times, or fails for good, fails its MariaDB row too.
 */
export function startDistributedWorker(name: string, concurrency: number): DistributedWorker {
  const lock_ms = config.queue.lock_s * 1000;
  const worker = new Worker<Payload>(QUEUE_NAME, (job) => processJob(job, name), {
    connection: connect(),
    concurrency,
    name,
    lockDuration: lock_ms,
    stalledInterval: lock_ms,
    maxStalledCount: MAX_ATTEMPTS - 1,
  });
  worker.on("failed", (job, err) => {
    if (!job) return;
    const final =
      err instanceof UnrecoverableError ||
      err.name === "UnrecoverableError" ||
      job.attemptsMade >= (job.opts.attempts ?? 1) ||
      /stalled/i.test(err.message);
    if (final)
      void failJob(job.data.jobId, err.message).catch((e) =>
        logError(`job ${job.data.jobId}: could not be marked failed`, e),
      );
  });
  logErrors(worker, `worker ${name}`);
  return {
    name,
    close: () => worker.close(),
  };
}

/**
 * Puts back what the queue lost, from the MariaDB rows (run by every worker process): a queued or
 * waiting job with no live BullMQ job is published again (a parent once its children are done); a
 * running job whose lock lapsed and that BullMQ no longer holds is queued again; a job BullMQ failed
 * for good fails its row. Rows touched in the last `grace_s` are left alone (their publish may be
 * under way).
 */
export async function reconcile(grace_s = 10): Promise<{ republished: number; failed: number }> {
  const q = theQueue();
  const rows = await db
    .select()
    .from(jobs)
    .where(
      and(
        eq(jobs.queue, "bullmq"),
        inArray(jobs.status, ["queued", "waiting", "running"]),
        lt(jobs.updatedAt, sql`NOW(3) - INTERVAL ${grace_s} SECOND`),
      ),
    );
  let republished = 0;
  let failed = 0;
  for (const row of rows) {
    const bj = await q.getJob(bullId(row.id));
    const state = bj ? await bj.getState() : "missing";
    if (state === "failed") {
      await failJob(row.id, bj?.failedReason || "The distributed queue gave up on this job.");
      failed++;
      continue;
    }
    const live =
      state === "waiting" ||
      state === "active" ||
      state === "delayed" ||
      state === "prioritized" ||
      state === "waiting-children";
    if (live) continue;
    if (row.status === "waiting") {
      const [open] = await db
        .select({ n: sql<number>`COUNT(*)` })
        .from(jobs)
        .where(and(eq(jobs.parentId, row.id), ne(jobs.status, "done")));
      if (Number(open.n) > 0) continue;
      await db
        .update(jobs)
        .set({ status: "queued" })
        .where(and(eq(jobs.id, row.id), eq(jobs.status, "waiting")));
    }
    if (row.status === "running") {
      if (row.lockedUntil && row.lockedUntil.getTime() > Date.now()) continue;
      await db
        .update(jobs)
        .set({ status: "queued" })
        .where(and(eq(jobs.id, row.id), eq(jobs.status, "running"), eq(jobs.attempts, row.attempts)));
    }
    // A fresh BullMQ id: the old one may linger completed (a fenced attempt) or in a lost flow.
    await q.add(row.kind, { jobId: row.id }, jobOptions(row.id, `${bullId(row.id)}-r${row.attempts}-${Date.now()}`));
    if (bj) await bj.remove().catch(() => {});
    republished++;
  }
  return { republished, failed };
}

let reconciler: NodeJS.Timeout | undefined;
/** Reconciles every `every_s` seconds (and once now). */
export function startReconciler(every_s = 15): void {
  const tick = () =>
    void reconcile()
      .then((r) => {
        if (r.republished || r.failed)
          console.log(`[tapwright] reconciler: ${r.republished} job(s) handed to the queue again, ${r.failed} failed`);
      })
      .catch((e) => logError("reconciler", e));
  reconciler ??= setInterval(tick, every_s * 1000);
  reconciler.unref();
  tick();
}

/** Queue depth and the workers connected to Redis, for the admin page. */
export async function distributedOverview() {
  const q = theQueue();
  const counts = await q.getJobCounts(
    "waiting",
    "active",
    "delayed",
    "prioritized",
    "waiting-children",
    "completed",
    "failed",
  );
  // A worker holds several named connections (its commands and its blocking wait): one row per name.
  const byName = new Map<string, { name: string; addr: string; age_s: number }>();
  for (const w of await q.getWorkers()) {
    const raw = String(w.rawname ?? "");
    const name = raw.includes(":w:") ? raw.slice(raw.indexOf(":w:") + 3) : raw;
    const age_s = Number(w.age ?? 0);
    const seen = byName.get(name);
    if (!seen || age_s > seen.age_s) byName.set(name, { name, addr: String(w.addr ?? ""), age_s });
  }
  return { counts, workers: [...byName.values()].sort((a, b) => a.name.localeCompare(b.name)) };
}

/** Closes this process's connections (tests, a worker's shutdown). */
export async function closeDistributed(): Promise<void> {
  clearInterval(reconciler);
  reconciler = undefined;
  await Promise.all([queue?.close(), flows?.close()]);
  queue = undefined;
  flows = undefined;
}
