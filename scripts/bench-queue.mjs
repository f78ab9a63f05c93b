#!/usr/bin/env node
// `npm run bench:queue`: the distributed queue's figures on this machine, against real services —
// a private MariaDB database `tapwright_bench`, a private Redis of its own (.data/redis-bench), the
// built web server with TAPWRIGHT_QUEUE=bullmq, and standalone worker processes with one engine
// thread each (a one-core machine each):
// - sweep throughput (pairs per second) with 1 and with 2 worker processes, rounds interleaved so
//   that load from other work falls on both alike;
// - the per-pair engine cost (the joint search, from the stored compute times);
// - the queue's overhead per job: a sweep of trivial pairs (a one-setting budget), whose wall time
//   per job less its engine time is what the queue, MariaDB and the pool hand-off cost;
// - a tap table version of 4 classes over 24 channels, with 1 and with 2 worker processes;
// - what limits more machines: Redis commands per job (INFO's total_commands_processed, idle
//   polling included) and MariaDB write statements per pair (Com_insert + Com_update + Com_delete).
// The load average before and after says how busy the machine was with other work.
// TAPWRIGHT_SKIP_BUILD=1 reuses the last build; BENCH_ROUNDS (default 3) sets the rounds.
import { spawn } from "node:child_process";
import { join } from "node:path";
import { ensureNpmPackages } from "./lib/deps.mjs";
import { dataDir, distDir, root } from "./lib/config.mjs";
import { log } from "./lib/log.mjs";

ensureNpmPackages();
process.env.DB_NAME ??= "tapwright_bench";
process.env.TAPWRIGHT_DB_FAST ??= "1";
const { settings } = await import("./lib/config.mjs");
const { startMariadb, ensureDatabase, runningPid } = await import("./lib/mariadb.mjs");
const { readFileSync } = await import("node:fs");
const { startRedis, stopRedis } = await import("./lib/redis.mjs");
const { migrate } = await import("./lib/migrate.mjs");
const { build, seed, serve } = await import("./lib/server.mjs");
const mysql = await import("mysql2/promise");
const { createServer } = await import("node:net");
const { loadavg } = await import("node:os");
const { Redis } = await import("ioredis");

const ROUNDS = Number(process.env.BENCH_ROUNDS ?? 3);
const freePort = () =>
  new Promise((resolve) => {
    const probe = createServer().listen(0, "127.0.0.1", () => {
      const { port } = probe.address();
      probe.close(() => resolve(port));
    });
  });

const cfg = settings("test");
// A port the system says is free (a fixed neighbour of the test port may be another checkout's).
const redis = { ...cfg.redis, dir: join(dataDir, "redis-bench"), port: await freePort() };
redis.url = `redis://:${encodeURIComponent(redis.password)}@127.0.0.1:${redis.port}`;
const port = await freePort();
const base = `http://127.0.0.1:${port}`;
const env = {
  ...cfg.env,
  PORT: String(port),
  BETTER_AUTH_URL: base,
  TAPWRIGHT_QUEUE: "bullmq",
  REDIS_URL: redis.url,
  TAPWRIGHT_SIGN_IN_LIMIT: "1000/60",
};

await startMariadb(cfg.db);
await ensureDatabase(cfg.db, { fresh: true });
await migrate(env.DATABASE_URL);
seed(env);
await startRedis(redis, { fresh: true });
if (process.env.TAPWRIGHT_SKIP_BUILD !== "1") build(env);
const server = await serve(env, { quiet: true });
const db = mysql.createPool({ uri: env.DATABASE_URL, connectionLimit: 2 });
const redisClient = new Redis(redis.url, { lazyConnect: true });
await redisClient.connect();
const load = () =>
  loadavg()
    .map((x) => x.toFixed(1))
    .join(" / ");
const loadBefore = load();

/** Redis commands served so far (the INFO call itself included, a constant). */
async function redisCommands() {
  const info = await redisClient.info("stats");
  return Number(/total_commands_processed:(\d+)/.exec(info)[1]);
}
/** CPU seconds Redis has used so far (INFO cpu: user + system, main thread and children). */
async function redisCpu_s() {
  const info = await redisClient.info("cpu");
  return ["used_cpu_user", "used_cpu_sys"].reduce((t, k) => t + Number(new RegExp(`${k}:([\\d.]+)`).exec(info)[1]), 0);
}
/** CPU seconds the MariaDB server process has used so far (/proc: utime + stime, at 100 ticks a second). */
function mariadbCpu_s() {
  const fields = readFileSync(`/proc/${runningPid(cfg.db)}/stat`, "utf8")
    .split(") ")[1]
    .split(" ");
  return (Number(fields[11]) + Number(fields[12])) / 100;
}
/** Writing statements MariaDB has run so far (the whole private server: nothing else uses it during the bench). */
async function dbWrites() {
  const [rows] = await db.query("SHOW GLOBAL STATUS WHERE Variable_name IN ('Com_insert', 'Com_update', 'Com_delete')");
  return rows.reduce((t, r) => t + Number(r.Value), 0);
}

let cookie = "";
async function call(method, path, body) {
  const r = await fetch(base + path, {
    method,
    headers: { cookie, origin: base, ...(body ? { "content-type": "application/json" } : {}) },
    body: body ? JSON.stringify(body) : undefined,
  });
  if (!r.ok) throw new Error(`${method} ${path}: ${r.status} ${await r.text()}`);
  if (path.includes("/auth/"))
    cookie = r.headers
      .getSetCookie()
      .map((c) => c.split(";")[0])
      .join("; ");
  return r.json();
}

function startWorkers(n) {
  return Promise.all(
    Array.from({ length: n }, (_, i) => {
      const child = spawn(process.execPath, [join(distDir, "worker.mjs")], {
        cwd: root,
        env: { ...process.env, ...env, TAPWRIGHT_WORKERS: "1", TAPWRIGHT_WORKER_NAME: `bench-${n}-${i}` },
        stdio: ["ignore", "pipe", "inherit"],
      });
      return new Promise((resolve, reject) => {
        child.stdout.on("data", (d) => d.toString().includes("taking jobs") && resolve(child));
        child.once("exit", (code) => reject(new Error(`worker exited (${code})`)));
      });
    }),
  );
}
const stopWorkers = (list) => Promise.all(list.map((c) => new Promise((r) => (c.once("exit", r), c.kill("SIGTERM")))));

async function waitDone(path) {
  for (;;) {
    const s = await call("GET", path);
    const status = s.status ?? s.job?.status;
    if (status === "done") return s;
    if (status === "failed") throw new Error(`${path} failed: ${JSON.stringify(s.error ?? s.job?.error)}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

async function timedSweep(name, channelIds, budgetId, corners) {
  const [commands0, writes0, redisCpu0, dbCpu0] = [
    await redisCommands(),
    await dbWrites(),
    await redisCpu_s(),
    mariadbCpu_s(),
  ];
  const t0 = performance.now();
  const { id } = await call("POST", "/api/v1/sweeps", { name, channelIds, budgetId, corners });
  const s = await waitDone(`/api/v1/sweeps/${id}`);
  const wall_s = (performance.now() - t0) / 1000;
  const [commands1, writes1, redisCpu1, dbCpu1] = [
    await redisCommands(),
    await dbWrites(),
    await redisCpu_s(),
    mariadbCpu_s(),
  ];
  const [[jobsRow]] = await db.query(
    "SELECT COUNT(*) AS n FROM jobs WHERE parent_id = (SELECT job_id FROM sweeps WHERE id = ?)",
    [id],
  );
  const engine_ms = s.results.reduce((t, r) => t + r.compute_ms, 0);
  // The parent counts as a job too: it is queued, claimed and completed like its batches.
  const jobs = Number(jobsRow.n);
  return {
    wall_s,
    pairs: s.results.length,
    jobs,
    engine_ms,
    redisPerJob: (commands1 - commands0) / (jobs + 1),
    redisCpuPerJob_ms: ((redisCpu1 - redisCpu0) * 1000) / (jobs + 1),
    writesPerPair: (writes1 - writes0) / s.results.length,
    // The bench's own progress polls (every 100 ms) are in this too: an upper bound.
    dbCpuPerPair_ms: ((dbCpu1 - dbCpu0) * 1000) / s.results.length,
  };
}

try {
  await call("POST", "/api/auth/sign-in/email", {
    email: "designer@tapwright.test",
    password: process.env.DEMO_PASSWORD ?? "tapwright-demo",
  });
  const budgets = (await call("GET", "/api/v1/budgets")).items;
  const backplane = budgets.find((b) => b.name === "28 Gb/s NRZ backplane");
  const channelIds = [];
  for (let i = 0; i < 24; i++) {
    const c = await call("POST", "/api/v1/channels", {
      name: `Bench lane ${i + 1}`,
      bitRate_bps: 28e9,
      lossModel: { lossAtNyquist_dB: 6 + i },
    });
    channelIds.push(c.id);
  }
  const corners = [
    { name: "nominal" },
    { name: "loss −10 %", lossScale: 0.9 },
    { name: "loss +10 %", lossScale: 1.1 },
    { name: "slow", lossScale: 1.1, txSwingScale: 0.9, noiseScale: 1.2 },
  ];
  // A lighter budget than the demo's (transmit FIR 1/1 in 1/20 steps, CTLE, DFE 3) keeps a round short.
  const sweepBudget = await call("POST", "/api/v1/budgets", {
    ...backplane,
    name: "Bench sweep budget",
    tx: { pre: 1, post: 1, step: 0.05 },
    dfe: { taps: 3, limits_V: 0.1 },
  });
  const trivial = await call("POST", "/api/v1/budgets", {
    ...backplane,
    name: "Bench trivial budget",
    jitter: undefined,
    tx: { pre: 0, post: 0, step: 0.5 },
    ctle: { ...backplane.ctle, gDc_dB: [0, 0, 1] },
    dfe: { taps: 0 },
  });

  const rounds = { 1: [], 2: [] };
  for (let r = 0; r < ROUNDS; r++) {
    for (const n of r % 2 === 0 ? [1, 2] : [2, 1]) {
      const workers = await startWorkers(n);
      const t = await timedSweep(`Bench ${n} worker(s) round ${r + 1}`, channelIds, sweepBudget.id, corners);
      await stopWorkers(workers);
      rounds[n].push(t);
      log(
        `round ${r + 1}, ${n} worker process(es): ${t.pairs} pairs in ${t.wall_s.toFixed(1)} s = ${(t.pairs / t.wall_s).toFixed(2)} pairs/s`,
      );
    }
  }

  const one = await startWorkers(1);
  const o = await timedSweep(
    "Bench queue overhead",
    channelIds,
    trivial.id,
    Array.from({ length: 8 }, (_, i) => ({ name: `c${i}`, lossScale: 1 + i / 100 })),
  );
  await stopWorkers(one);
  // The table `npm run bench` times in one thread (4 classes over 24 channels), fanned out.
  const tableSeconds = {};
  for (const n of [1, 2]) {
    const workers = await startWorkers(n);
    const t0 = performance.now();
    const table = await call("POST", "/api/v1/tap-tables", {
      name: `Bench table, ${n} worker(s)`,
      budgetId: backplane.id,
      architecture: {
        key: "tx-ctle-dfe5",
        label: "Transmit FIR + CTLE + 5-tap DFE",
        tx: { pre: 1, post: 2 },
        ctle: true,
        dfeTaps: 5,
        ffe: null,
      },
      grouping: { mode: "loss-bins", channelIds, edges_dB: [12, 18, 24] },
    });
    await waitDone(`/api/v1/tap-tables/${table.id}/versions/1`);
    tableSeconds[n] = (performance.now() - t0) / 1000;
    await stopWorkers(workers);
    log(`tap table, ${n} worker process(es): ${tableSeconds[n].toFixed(1)} s`);
  }

  const rate = (list) => list.map((t) => t.pairs / t.wall_s);
  const r1 = rate(rounds[1]);
  const r2 = rate(rounds[2]);
  const mean = (a) => a.reduce((s, x) => s + x, 0) / a.length;
  const perPair = [...rounds[1], ...rounds[2]].map((t) => t.engine_ms / t.pairs);
  const overhead_ms = (o.wall_s * 1000 - o.engine_ms) / o.jobs;
  console.log("");
  console.log("| what | figure |");
  console.log("| --- | --- |");
  console.log(
    `| sweep, 1 worker process | ${Math.min(...r1).toFixed(2)}–${Math.max(...r1).toFixed(2)} pairs/s (mean ${mean(r1).toFixed(2)}) |`,
  );
  console.log(
    `| sweep, 2 worker processes | ${Math.min(...r2).toFixed(2)}–${Math.max(...r2).toFixed(2)} pairs/s (mean ${mean(r2).toFixed(2)}) |`,
  );
  console.log(
    `| speed-up with 2 | ${(mean(r2) / mean(r1)).toFixed(2)}× (rounds: ${r2.map((x, i) => (x / r1[i]).toFixed(2)).join(", ")}) |`,
  );
  console.log(`| engine time per pair | ${Math.min(...perPair).toFixed(0)}–${Math.max(...perPair).toFixed(0)} ms |`);
  console.log(
    `| queue overhead per job (${o.jobs} jobs of 4 trivial pairs, 1 worker) | ${overhead_ms.toFixed(1)} ms (engine ${(o.engine_ms / o.jobs).toFixed(1)} ms per job) |`,
  );
  console.log(
    `| tap table, 4 classes over 24 channels | ${tableSeconds[1].toFixed(1)} s with 1 worker process, ${tableSeconds[2].toFixed(1)} s with 2 |`,
  );
  const all = [...rounds[1], ...rounds[2]];
  const spread = (xs, digits = 0) => `${Math.min(...xs).toFixed(digits)}–${Math.max(...xs).toFixed(digits)}`;
  console.log(
    `| Redis commands per job (${all[0].jobs} batch jobs + the parent per sweep) | ${spread(all.map((t) => t.redisPerJob))} |`,
  );
  console.log(
    `| Redis CPU per job | ${spread(
      all.map((t) => t.redisCpuPerJob_ms),
      2,
    )} ms |`,
  );
  console.log(
    `| MariaDB write statements per pair | ${spread(
      all.map((t) => t.writesPerPair),
      1,
    )} |`,
  );
  console.log(
    `| MariaDB CPU per pair (the bench's 100 ms progress polls included) | ${spread(
      all.map((t) => t.dbCpuPerPair_ms),
      2,
    )} ms |`,
  );
  console.log(`| load average (1 / 5 / 15 min) before → after | ${loadBefore} → ${load()} |`);
} finally {
  redisClient.disconnect();
  await db.end();
  server.kill("SIGTERM");
  await stopRedis(redis);
}
