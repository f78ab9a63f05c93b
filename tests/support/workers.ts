// Standalone workers of the distributed queue (dist/worker.mjs) and the test run's private Redis, for
// the tests that kill a worker or restart Redis under a running sweep.
import { spawn, type ChildProcess } from "node:child_process";
import { join } from "node:path";
// The start scripts' own Redis helpers: the same start and stop as `npm test` uses.
import { startRedis, stopRedis } from "../../scripts/lib/redis.mjs";

const root = join(import.meta.dirname, "..", "..");

export interface TestWorker {
  name: string;
  pid: number;
  /** What the process has printed so far. */
  output(): string;
  /** Ends the process with a signal (SIGKILL: as a crash would). */
  kill(signal: NodeJS.Signals): Promise<void>;
}

/**
 * Starts one worker process with one engine thread (a one-core machine) and a short lock, so a dead
 * worker's job is handed on within seconds; resolves once it takes jobs.
 */
export async function startWorker(name: string, env: Record<string, string> = {}): Promise<TestWorker> {
  const child: ChildProcess = spawn(
    process.execPath,
    [join(root, process.env.TAPWRIGHT_OUT_DIR ?? "dist", "worker.mjs")],
    {
      cwd: root,
      env: {
        ...process.env,
        TAPWRIGHT_QUEUE: "bullmq",
        TAPWRIGHT_WORKERS: "1",
        TAPWRIGHT_JOB_LOCK_S: "3",
        TAPWRIGHT_WORKER_NAME: name,
        ...env,
      },
      stdio: ["ignore", "pipe", "inherit"],
    },
  );
  let out = "";
  await new Promise<void>((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`worker ${name} did not start: ${out}`)), 30_000);
    child.stdout!.on("data", (chunk: Buffer) => {
      out += chunk.toString();
      if (out.includes("taking jobs")) {
        clearTimeout(timer);
        resolve();
      }
    });
    child.once("exit", (code) => {
      clearTimeout(timer);
      reject(new Error(`worker ${name} exited (${code}): ${out}`));
    });
  });
  // The listener above keeps collecting what the worker prints (and keeps its pipe flowing).
  return {
    name,
    pid: child.pid!,
    output: () => out,
    kill: (signal) =>
      new Promise<void>((resolve) => {
        if (child.exitCode !== null || child.signalCode !== null) return resolve();
        child.once("exit", () => resolve());
        child.kill(signal);
      }),
  };
}

/** The test run's private Redis (see scripts/test.mjs): its folder, port and password. */
function testRedis() {
  const url = new URL(process.env.REDIS_URL!);
  return {
    dir: process.env.TAPWRIGHT_REDIS_DIR!,
    port: Number(url.port),
    password: decodeURIComponent(url.password) || null,
  };
}

/** Stops Redis (SHUTDOWN: the append-only file is flushed) and starts it again on the same data. */
export async function restartRedis(down_ms = 1000): Promise<void> {
  const redis = testRedis();
  await stopRedis(redis);
  await new Promise((r) => setTimeout(r, down_ms));
  await startRedis(redis);
}
