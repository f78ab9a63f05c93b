// The standalone worker process (`npm run worker`, bundled to dist/worker.mjs): it takes jobs from
// BullMQ on Redis and computes them in its own engine worker pool — the same engine bundle the web
// server uses — reading inputs from and storing results in MariaDB. Run one per machine (its
// concurrency is its engine threads, TAPWRIGHT_WORKERS, at most one per core); SIGTERM lets the jobs
// in hand finish first.
import { hostname } from "node:os";
import { config } from "../config.server";
import { closeDistributed, startDistributedWorker, startReconciler } from "./bullmq.server";
import { closePool, workerCount } from "./pool.server";
import { pool as database } from "../db.server";
import "./allKinds.server";

const name = config.queue.workerName ?? `${hostname()}-${process.pid}`;
const worker = startDistributedWorker(name, workerCount);
startReconciler();
console.log(
  `[tapwright] worker ${name}: ${workerCount} engine thread${workerCount === 1 ? "" : "s"}, taking jobs from Redis.`,
);

let stopping = false;
async function stop(signal: string) {
  if (stopping) return;
  stopping = true;
  console.log(`[tapwright] worker ${name}: ${signal}, finishing the jobs in hand…`);
  await worker.close();
  await closeDistributed();
  await closePool();
  await database.end();
  process.exit(0);
}
process.on("SIGTERM", () => void stop("SIGTERM"));
process.on("SIGINT", () => void stop("SIGINT"));
