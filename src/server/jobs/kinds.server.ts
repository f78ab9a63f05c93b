// What the server does around the engine for each kind of job: how to read the worker's input and
// how to store its result. Features register their kinds once (their server module is imported by
// the web server's background work and by the standalone worker process).
import type { Tx } from "../db.server";
import type { Job } from "@/db/schema";
import type { JobKind } from "@/features/jobs/jobs";

export interface JobHandler {
  /** The worker's input, read from the job's target row (`job.targetId`, and `job.part` for a share of it). */
  input(job: Job): Promise<unknown>;
  /** Stores the worker's result (inside the job's closing transaction, which is fenced on its attempt). */
  save(tx: Tx, job: Job, result: unknown): Promise<void>;
  /** Marks the target row as failed, when it has a state of its own. */
  fail?(tx: Tx, job: Job, message: string): Promise<void>;
}

const handlers = new Map<JobKind, JobHandler>();

export function registerJobKind(kind: JobKind, handler: JobHandler): void {
  handlers.set(kind, handler);
}

export function handlerFor(kind: JobKind): JobHandler {
  const h = handlers.get(kind);
  if (!h) throw new Error(`No handler for jobs of kind ${kind}.`);
  return h;
}

/** Kinds registered in this process (the worker process checks that it knows every kind). */
export function registeredKinds(): JobKind[] {
  return [...handlers.keys()];
}
