// The distributed queue's standalone worker process (dist/worker.mjs): built when missing or older
// than the code, started with the settings of this checkout or of the environment.
import { spawn } from "node:child_process";
import { existsSync, readdirSync, statSync } from "node:fs";
import { join } from "node:path";
import { distDir, root } from "./config.mjs";
import { runStep } from "./server.mjs";

function newestMtime(dir) {
  let newest = 0;
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    const p = join(dir, entry.name);
    newest = Math.max(newest, entry.isDirectory() ? newestMtime(p) : statSync(p).mtimeMs);
  }
  return newest;
}

/** Builds dist/worker.mjs (and the engine worker beside it) unless it is newer than src/ and lib/. */
export function ensureWorkerBuilt(env) {
  const bundle = join(distDir, "worker.mjs");
  const fresh =
    existsSync(bundle) &&
    statSync(bundle).mtimeMs > Math.max(newestMtime(join(root, "src")), newestMtime(join(root, "lib")));
  if (!fresh) runStep("Worker build", process.execPath, ["scripts/build-worker.mjs"], env);
}

/** Starts one worker process; its output goes to this console with a prefix-free pass-through. */
export function startWorker(env) {
  return spawn(process.execPath, [join(distDir, "worker.mjs")], {
    cwd: root,
    env: { ...process.env, ...env, TAPWRIGHT_QUEUE: "bullmq" },
    stdio: "inherit",
  });
}
