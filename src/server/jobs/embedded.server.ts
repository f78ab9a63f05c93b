// The embedded backend (the default, no extra service): this web server claims queued jobs from
// MariaDB (SELECT … FOR UPDATE SKIP LOCKED) and runs them in its own worker-thread pool. Several
// web servers on one database share the queue; a job whose server died is claimed again once its
// lock lapses.
import { randomUUID } from "node:crypto";
import { hostname } from "node:os";
import { claimNext, runClaimed } from "./attempt.server";
import { runInPool, workerCount } from "./pool.server";
import { config } from "../config.server";
import { logError } from "../http/logError";

const OWNER = `${hostname()}:${process.pid}:${randomUUID().slice(0, 8)}`;
let active = 0;
let pumping = false;

/** Claims and starts jobs while worker threads are free. Safe to call often. */
export async function pumpEmbedded(): Promise<void> {
  if (pumping) return;
  pumping = true;
  try {
    while (active < workerCount) {
      const claim = await claimNext(OWNER);
      if (!claim) break;
      active++;
      void runClaimed(claim, runInPool)
        .catch((e) =>
          logError(
            `job ${claim.job.id} (${claim.job.kind}) could not be closed; it will be tried again once its lock lapses`,
            e,
          ),
        )
        .finally(() => {
          active--;
          void pumpEmbedded();
        });
    }
  } catch (e) {
    logError("job queue", e);
  } finally {
    pumping = false;
  }
}

let timer: NodeJS.Timeout | undefined;
/** Polls the queue every `TAPWRIGHT_QUEUE_POLL_S` (2 s): jobs queued by other processes, lapsed locks. */
export function startEmbeddedDispatcher(): void {
  timer ??= setInterval(() => void pumpEmbedded(), config.queue.poll_s * 1000).unref();
  void pumpEmbedded();
}

/** This process's share of the embedded queue, for the admin page. */
export function embeddedWorker() {
  return { name: OWNER, threads: workerCount, active };
}
