#!/usr/bin/env node
// `npm run bench:load`: the built server under load on loopback (autocannon), bounded in time and
// connections. Sets up like `npm test` on its own database (tapwright_bench) and port, signs in as
// the demo designer, then measures:
//   1. the channel list (GET /api/v1/channels), 64 connections for 30 s;
//   2. one tuning run's detail (GET /api/v1/runs/:id, its whole result), 64 connections for 30 s;
//   3. health (GET /api/v1/health), 8 connections for 20 s while the worker pool computes runs
//      (runs are queued so that two compute at every moment).
// Prints p50 / p95 / p99 latency, requests per second and errors (non-2xx and socket errors) per
// case, and writes them to tests/output/bench-load.json. Set BENCH_SECONDS to shorten the cases.
import { mkdirSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { ensureNpmPackages } from "./lib/deps.mjs";
import { root, settings } from "./lib/config.mjs";
import { log } from "./lib/log.mjs";

process.env.DB_NAME ??= "tapwright_bench";
process.env.PORT ??= "4397";
process.env.TAPWRIGHT_DB_FAST ??= "1";
const seconds = Number(process.env.BENCH_SECONDS ?? 30);

ensureNpmPackages();
const { default: autocannon } = await import("autocannon");
const cfg = settings("test");
const { startMariadb, ensureDatabase, stopMariadb } = await import("./lib/mariadb.mjs");
const { migrate } = await import("./lib/migrate.mjs");
const { build, seed, serve } = await import("./lib/server.mjs");

const env = { ...cfg.env, TAPWRIGHT_SIGN_IN_LIMIT: "1000/60" };
const base = env.BETTER_AUTH_URL;

/** The p-th percentile (nearest rank) of sorted latencies. */
function percentile(sorted, p) {
  if (sorted.length === 0) return null;
  return Math.round(sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)] * 10) / 10;
}

/** One autocannon case; resolves to its figures (percentiles from every response's own time). */
function load(name, { path, connections, duration, headers = {} }) {
  log(`${name}: ${connections} connections for ${duration} s on ${path}…`);
  return new Promise((resolve, reject) => {
    const times_ms = [];
    const instance = autocannon(
      { url: base + path, connections, duration, headers: { "accept-encoding": "br, gzip", ...headers } },
      (err, r) => {
        if (err) return reject(err);
        times_ms.sort((a, b) => a - b);
        resolve({
          case: name,
          path,
          connections,
          duration_s: duration,
          requests: r.requests.total,
          perSecond: Math.round(r.requests.average),
          p50_ms: percentile(times_ms, 50),
          p95_ms: percentile(times_ms, 95),
          p99_ms: percentile(times_ms, 99),
          errors: r.errors + r.timeouts,
          non2xx: r.non2xx,
        });
      },
    );
    instance.on("response", (_client, _status, _bytes, responseTime_ms) => times_ms.push(responseTime_ms));
  });
}

const database = await startMariadb(cfg.db);
let server;
try {
  await ensureDatabase(cfg.db, { fresh: true });
  await migrate(env.DATABASE_URL);
  seed(env);
  if (process.env.TAPWRIGHT_SKIP_BUILD !== "1") build(env);
  server = await serve(env, { quiet: true });

  const signIn = await fetch(`${base}/api/auth/sign-in/email`, {
    method: "POST",
    headers: { "content-type": "application/json", origin: base },
    body: JSON.stringify({ email: "designer@tapwright.test", password: process.env.DEMO_PASSWORD ?? "tapwright-demo" }),
  });
  if (!signIn.ok) throw new Error(`sign-in failed: HTTP ${signIn.status}`);
  const cookie = signIn.headers
    .getSetCookie()
    .map((c) => c.split(";")[0])
    .join("; ");
  const api = (path, init = {}) =>
    fetch(base + path, {
      ...init,
      headers: { cookie, origin: base, "content-type": "application/json", ...init.headers },
    });

  const runs = (await (await api("/api/v1/runs?limit=50")).json()).items;
  const done = runs.find((r) => r.status === "done");
  if (!done) throw new Error("the demo has no finished run");
  const channels = (await (await api("/api/v1/channels?limit=50&sort=loss&dir=desc")).json()).items;
  const budgets = (await (await api("/api/v1/budgets")).json()).items;

  const results = [];
  results.push(
    await load("channel list", { path: "/api/v1/channels", connections: 64, duration: seconds, headers: { cookie } }),
  );
  results.push(
    await load("run detail", {
      path: `/api/v1/runs/${done.id}`,
      connections: 64,
      duration: seconds,
      headers: { cookie },
    }),
  );

  // Keep two runs computing while health is measured: queue enough long-reach runs to outlast it.
  const longest = channels.find((c) => budgets.some((b) => b.bitRate_bps === c.bitRate_bps)) ?? channels[0];
  const budget = budgets.find((b) => b.bitRate_bps === longest.bitRate_bps) ?? budgets[0];
  const queued = [];
  for (let i = 0; i < 24; i++) {
    const r = await api("/api/v1/runs", {
      method: "POST",
      body: JSON.stringify({ channelId: longest.id, budgetId: budget.id }),
    });
    if (r.status !== 202) throw new Error(`starting a run failed: HTTP ${r.status} ${await r.text()}`);
    queued.push((await r.json()).id);
  }
  const healthSeconds = Math.max(5, Math.round((seconds * 2) / 3));
  const health = await load("health while runs compute", {
    path: "/api/v1/health",
    connections: 8,
    duration: healthSeconds,
  });
  const states = await Promise.all(
    queued.map(async (id) => (await (await api(`/api/v1/runs/${id}?fields=status`)).json()).status),
  );
  health.runsStillQueuedOrRunning = states.filter((s) => s === "queued" || s === "running").length;
  health.runsDone = states.filter((s) => s === "done").length;
  results.push(health);

  const outDir = join(root, "tests", "output");
  mkdirSync(outDir, { recursive: true });
  writeFileSync(join(outDir, "bench-load.json"), JSON.stringify({ at: new Date().toISOString(), results }, null, 2));
  console.log("\ncase                        conn   req/s    p50 ms   p95 ms   p99 ms   errors  non-2xx");
  for (const r of results) {
    console.log(
      `${r.case.padEnd(28)}${String(r.connections).padStart(4)}${String(r.perSecond).padStart(8)}${String(r.p50_ms).padStart(10)}${String(r.p95_ms).padStart(9)}${String(r.p99_ms).padStart(9)}${String(r.errors).padStart(9)}${String(r.non2xx).padStart(9)}`,
    );
  }
  if (health.runsStillQueuedOrRunning === 0)
    log("warning: every queued run had finished before health was measured to the end.");
} finally {
  server?.kill("SIGTERM");
  if (!database.reused) await stopMariadb(cfg.db);
}
