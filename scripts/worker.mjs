#!/usr/bin/env node
// `npm run worker`: one standalone worker of the distributed queue (BullMQ on Redis). On this machine
// it uses the checkout's private Redis and MariaDB; on another machine give it REDIS_URL and
// DATABASE_URL (both must be reachable from there). TAPWRIGHT_WORKERS sets its engine threads
// (default 2, at most one per core). Ctrl-C lets the jobs in hand finish, then stops it.
import { ensureNpmPackages } from "./lib/deps.mjs";
import { settings } from "./lib/config.mjs";

try {
  ensureNpmPackages();
  process.env.TAPWRIGHT_QUEUE = "bullmq";
  const cfg = settings("dev");
  const env = { ...cfg.env, TAPWRIGHT_QUEUE: "bullmq", REDIS_URL: cfg.redis.url };
  const { ensureWorkerBuilt, startWorker } = await import("./lib/worker.mjs");
  ensureWorkerBuilt(env);
  const child = startWorker(env);
  for (const signal of ["SIGINT", "SIGTERM"]) process.on(signal, () => child.kill(signal));
  child.on("exit", (code) => process.exit(code ?? 1));
} catch (e) {
  console.error(`[tapwright] ${e.message}`);
  process.exit(1);
}
