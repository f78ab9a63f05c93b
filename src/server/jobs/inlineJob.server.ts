// Computing a job in this process instead of the worker pool, for the demo seed (which runs before
// the server and its dispatcher): the result is stored and the job closed as the dispatcher would.
import { eq } from "drizzle-orm";
import { db, type Tx } from "@/server/db.server";
import { jobs } from "@/db/schema";

/**
 * How a service runs the work it queued when not in the worker pool: `compute` gives the result and
 * the time computing it took (which may have been spent earlier, when the result is reused).
 */
export interface RunHere<I, R> {
  compute(input: I): { result: R; compute_ms: number };
}

/** Computes, then stores the result and marks the job done in one transaction. */
export async function finishHere<I, R>(
  jobId: number,
  input: I,
  run: RunHere<I, R>,
  save: (tx: Tx, result: R) => Promise<void>,
): Promise<void> {
  const startedAt = new Date();
  const { result, compute_ms } = run.compute(input);
  await db.transaction(async (tx) => {
    await save(tx, result);
    await tx
      .update(jobs)
      .set({ status: "done", progress: 1, attempts: 1, startedAt, finishedAt: new Date(), compute_ms })
      .where(eq(jobs.id, jobId));
  });
}
