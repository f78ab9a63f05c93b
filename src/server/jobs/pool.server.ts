// The worker-thread pool (piscina) that runs the engine off the web server's event loop. The
// worker is bundled to dist/engine-worker.mjs by scripts/build-worker.mjs.
import { existsSync } from "node:fs";
import { availableParallelism } from "node:os";
import { dirname, join, resolve } from "node:path";
import { MessageChannel } from "node:worker_threads";
import { Piscina } from "piscina";
import type { JobKind } from "@/features/jobs/jobs";
import type { DeriveInput, DeriveOutcome } from "@/features/channels/derive.job";
import { config } from "@/server/config.server";
import { logError } from "@/server/http/logError";

function workerFile(): string {
  const candidates = [
    config.workerFile,
    // Beside the web server's build (dist/server/entry.mjs) or the worker process's (dist/worker.mjs).
    process.argv[1] ? resolve(dirname(process.argv[1]), "..", "engine-worker.mjs") : undefined,
    process.argv[1] ? resolve(dirname(process.argv[1]), "engine-worker.mjs") : undefined,
    join(process.cwd(), "dist", "engine-worker.mjs"),
  ].filter((p): p is string => Boolean(p));
  const found = candidates.find((p) => existsSync(p));
  if (!found) throw new Error("The engine worker is not built; run `npm run build`.");
  return found;
}

/** Engine worker threads: TAPWRIGHT_WORKERS (default 2), at most one per core. */
export const workerCount = Math.max(1, Math.min(config.workers, availableParallelism()));

let pool: Piscina | undefined;
/** Why a pool was given up: a worker died while starting, before it took a task. */
const brokenBy = new WeakMap<Piscina, Error>();

function thePool(): Piscina {
  if (pool) return pool;
  const created = new Piscina({
    filename: workerFile(),
    maxThreads: workerCount,
    idleTimeout: 60_000,
    // A thread past its heap ends with ERR_WORKER_OUT_OF_MEMORY (its job fails) and piscina starts another.
    resourceLimits: { maxOldGenerationSizeMb: config.jobs.workerMemory_MB },
  });
  // A worker that dies while starting (e.g. a heap limit too small to load the engine) is reported
  // here, not to a task: piscina then starts no more workers and its queued tasks would wait for
  // ever (and an unheard 'error' would end the process). Give the pool up, failing its tasks with
  // the cause; the next job starts a fresh pool.
  created.on("error", (e: Error) => {
    logError("engine worker pool: a worker died while starting; its jobs fail and the next one gets a fresh pool", e);
    brokenBy.set(created, e);
    if (pool === created) pool = undefined;
    void created.destroy();
  });
  pool = created;
  return created;
}

/**
 * Runs one job in a worker; `onProgress` hears 0…1 as the engine reports it. Aborting `signal`
 * terminates the thread computing it (piscina starts a fresh one for the next task).
 */
export async function runInPool(
  kind: JobKind,
  input: unknown,
  onProgress: (p: number) => void,
  signal: AbortSignal,
): Promise<unknown> {
  const { port1, port2 } = new MessageChannel();
  port1.on("message", (p: number) => onProgress(p));
  const running = thePool();
  try {
    return await running.run({ kind, input, port: port2 }, { transferList: [port2], signal });
  } catch (e) {
    // A pool given up fails its tasks with "Terminating worker thread": say what broke it instead.
    throw brokenBy.get(running) ?? e;
  } finally {
    port1.close();
  }
}

/** Channel uploads derived at once (TAPWRIGHT_DERIVE_THREADS, default 1); more wait their turn. */
export const deriveThreads = Math.max(1, Math.min(config.deriveThreads, availableParallelism()));

let derivePool: Piscina | undefined;

/**
 * Derives an upload or a loss model in the engine worker, off the event loop. Its own threads (the
 * cap), so an upload never waits behind a run of minutes. A file's bytes are shared
 * (SharedArrayBuffer), not copied, when the request reader stored them so.
 */
export async function deriveInPool(input: DeriveInput): Promise<DeriveOutcome> {
  derivePool ??= new Piscina({
    filename: workerFile(),
    maxThreads: deriveThreads,
    idleTimeout: 60_000,
    resourceLimits: { maxOldGenerationSizeMb: config.jobs.workerMemory_MB },
  });
  return (await derivePool.run({ derive: input })) as DeriveOutcome;
}

/** Ends the pools' threads (a worker process shutting down). */
export async function closePool(): Promise<void> {
  await pool?.destroy();
  pool = undefined;
  await derivePool?.destroy();
  derivePool = undefined;
}
