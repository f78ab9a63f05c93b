// Building and serving the Astro app (the Node adapter's standalone server), and waiting for it.
import { spawn, spawnSync } from "node:child_process";
import { join } from "node:path";
import { setTimeout as sleep } from "node:timers/promises";
import { root } from "./config.mjs";
import { log } from "./log.mjs";

const bin = (name) => join(root, "node_modules", ".bin", name);

export function runStep(label, command, args, env) {
  const r = spawnSync(command, args, { cwd: root, stdio: "inherit", env: { ...process.env, ...env } });
  if (r.status !== 0) throw new Error(`${label} failed (exit ${r.status}).`);
}

export function build(env) {
  log("Building the app (astro build and the engine worker)…");
  runStep("astro build", bin("astro"), ["build", "--silent"], env);
  runStep("Engine worker build", process.execPath, ["scripts/build-worker.mjs"], env);
  runStep("Precompressing assets", process.execPath, ["scripts/precompress.mjs"], env);
}

export function seed(env) {
  runStep("Seeding", bin("tsx"), ["scripts/seed.ts"], env);
}

/** Starts `node scripts/serve.mjs` (the built app); resolves once /api/v1/health answers. */
export async function serve(env, { quiet = false } = {}) {
  const child = spawn(process.execPath, [join(root, "scripts", "serve.mjs")], {
    cwd: root,
    env: { ...process.env, ...env },
    stdio: quiet ? ["ignore", "ignore", "inherit"] : "inherit",
  });
  const url = `http://127.0.0.1:${env.PORT}/api/v1/health`;
  const until = Date.now() + 30_000;
  while (Date.now() < until) {
    if (child.exitCode !== null) throw new Error(`The web server exited (code ${child.exitCode}) while starting.`);
    try {
      const r = await fetch(url);
      if (r.ok) return child;
    } catch {
      /* not listening yet */
    }
    await sleep(100);
  }
  child.kill();
  throw new Error(`The web server did not answer ${url} within 30 s.`);
}
