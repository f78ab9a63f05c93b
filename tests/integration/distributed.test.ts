// The distributed backend against the test run's real private Redis and MariaDB: a web server with
// TAPWRIGHT_QUEUE=bullmq and two standalone worker processes (one engine thread each). A sweep of
// 52 channel × corner pairs completes with each pair stored once even when a worker is killed with
// SIGKILL mid-sweep (BullMQ hands its job to the other) or Redis restarts mid-sweep; a worker frozen
// past its lock (SIGSTOP) loses its batch to the other and its late result is refused; the numbers
// equal the same sweep on the embedded queue; the admin page lists the workers and the queue.
import { readFileSync, statSync } from "node:fs";
import { join } from "node:path";
import mysql from "mysql2/promise";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eventually, signIn, type Client } from "../support/http";
import { freePort, startServer, type TestServer } from "../support/server";
import { restartRedis, startWorker, type TestWorker } from "../support/workers";
import { closeDb, unique } from "../fixtures/workspace";
import { population, type Population } from "./handoff.fixture";

/** 13 channels × 4 corners = 52 pairs; a transmit FIR with a pre-cursor tap makes each pair ≈ 0.1–0.4 s. */
const LOSSES = [6, 8, 10, 12, 14, 16, 18, 20, 22, 24, 26, 28, 30];
const CORNERS = [
  { name: "nominal" },
  { name: "loss −10 %", lossScale: 0.9 },
  { name: "loss +10 %", lossScale: 1.1 },
  { name: "slow", lossScale: 1.1, txSwingScale: 0.9, noiseScale: 1.2, jitterScale: 1.2, sensitivityScale: 1.2 },
];

let server: TestServer;
let workers: TestWorker[] = [];
let bullDesigner: Client;
let embeddedDesigner: Client;
let pop: Population;
let db: mysql.Pool;

interface Pair {
  channelId: number;
  cornerIndex: number;
  limiterHeadroom_V: number | null;
  linearReachExhausted: boolean | null;
}

const progressOf = async (client: Client, id: number) =>
  (await (await client.get(`/api/v1/sweeps/${id}?fields=status`)).json()) as {
    status: string;
    done: number;
    total: number;
  };
const sweepDone = (client: Client, id: number, timeout_ms = 300_000) =>
  eventually(
    async () => {
      const s = await (await client.get(`/api/v1/sweeps/${id}`)).json();
      return s.status === "done" || s.status === "failed" ? s : undefined;
    },
    timeout_ms,
    `sweep ${id} to finish`,
  );
const startSweep = async (client: Client, name: string) => {
  const r = await client.send("POST", "/api/v1/sweeps", {
    name: unique(name),
    channelIds: pop.channelIds,
    budgetId: pop.budgetId,
    corners: CORNERS,
  });
  expect(r.status).toBe(202);
  return (await r.json()).id as number;
};
/** Result rows per pair, straight from MariaDB: every pair must have exactly one. */
async function rowsPerPair(sweepId: number): Promise<number[]> {
  const [rows] = await db.query(
    "SELECT COUNT(*) AS n FROM sweep_results WHERE sweep_id = ? GROUP BY channel_id, corner_index",
    [sweepId],
  );
  return (rows as { n: number }[]).map((r) => Number(r.n));
}

beforeAll(async () => {
  db = mysql.createPool({ uri: process.env.DATABASE_URL!, connectionLimit: 2 });
  const port = await freePort();
  server = await startServer(port, {
    TAPWRIGHT_QUEUE: "bullmq",
    REDIS_URL: process.env.REDIS_URL!,
    TAPWRIGHT_JOB_LOCK_S: "3",
  });
  workers = await Promise.all([startWorker("worker-a"), startWorker("worker-b")]);
  [bullDesigner, embeddedDesigner] = await Promise.all([
    signIn("designer", undefined, server.base),
    signIn("designer"),
  ]);
  pop = await population(bullDesigner, LOSSES, { tx: { pre: 1, post: 1, step: 0.05 } });
}, 120_000);

afterAll(async () => {
  await Promise.all(workers.map((w) => w.kill("SIGTERM")));
  await server?.stop();
  await db?.end();
  await closeDb();
});

describe("the distributed queue (BullMQ on Redis, two worker processes)", () => {
  let bullSweep: number;

  it("a worker killed with SIGKILL mid-sweep: the sweep completes and each of the 52 pairs is stored exactly once", async () => {
    bullSweep = await startSweep(bullDesigner, "Distributed");
    await eventually(
      async () => ((await progressOf(bullDesigner, bullSweep)).done >= 6 ? true : undefined),
      120_000,
      "the first pairs",
    );
    const victim = workers[0];
    const [held] = await db.query("SELECT COUNT(*) AS n FROM jobs WHERE status = 'running' AND locked_by = ?", [
      victim.name,
    ]);
    await victim.kill("SIGKILL");
    const mid = await progressOf(bullDesigner, bullSweep);
    expect(mid.done).toBeLessThan(52);
    const s = await sweepDone(bullDesigner, bullSweep);
    expect(s.status).toBe("done");
    expect(s.done).toBe(52);
    const counts = await rowsPerPair(bullSweep);
    expect(counts).toHaveLength(52);
    expect(counts.every((n) => n === 1)).toBe(true);
    // The batch the dead worker held was taken over by a new attempt (when it held one at the kill).
    if (Number((held as { n: number }[])[0].n) > 0) {
      const [retried] = await db.query(
        "SELECT COUNT(*) AS n FROM jobs WHERE parent_id = (SELECT job_id FROM sweeps WHERE id = ?) AND attempts > 1",
        [bullSweep],
      );
      expect(Number((retried as { n: number }[])[0].n)).toBeGreaterThanOrEqual(1);
    }
    workers[0] = await startWorker("worker-c");
  });

  it("Redis restarted mid-sweep: nothing is lost", async () => {
    const id = await startSweep(bullDesigner, "Through a Redis restart");
    await eventually(
      async () => ((await progressOf(bullDesigner, id)).done >= 6 ? true : undefined),
      120_000,
      "the first pairs",
    );
    await restartRedis(1500);
    const s = await sweepDone(bullDesigner, id);
    expect(s.status).toBe("done");
    const counts = await rowsPerPair(id);
    expect(counts).toHaveLength(52);
    expect(counts.every((n) => n === 1)).toBe(true);
  });

  it("a worker frozen past its lock (SIGSTOP): the other takes its batch over, and the frozen one's result is refused when it wakes", async () => {
    const r = await bullDesigner.send("POST", "/api/v1/sweeps", {
      name: unique("Frozen worker"),
      channelIds: pop.channelIds.slice(0, 4),
      budgetId: pop.budgetId,
      corners: CORNERS,
    });
    expect(r.status).toBe(202);
    const id = (await r.json()).id as number;
    const victim = workers[1];
    const runningOn = async (who: string) => {
      const [rows] = await db.query(
        "SELECT j.id, j.attempts FROM jobs j JOIN sweeps s ON j.parent_id = s.job_id WHERE s.id = ? AND j.status = 'running' AND j.locked_by = ?",
        [id, who],
      );
      return (rows as { id: number; attempts: number }[])[0];
    };
    // Freeze the victim while it holds a batch (if it finished that batch in the instant before, wake it and wait for its next).
    let held: { id: number; attempts: number } | undefined;
    while (held === undefined) {
      const candidate = await eventually(() => runningOn(victim.name), 60_000, `${victim.name} to take a batch`);
      process.kill(victim.pid, "SIGSTOP");
      if ((await runningOn(victim.name))?.id === candidate.id) held = candidate;
      else process.kill(victim.pid, "SIGCONT");
    }
    try {
      await eventually(
        async () => {
          const [rows] = await db.query("SELECT attempts FROM jobs WHERE id = ?", [held.id]);
          return Number((rows as { attempts: number }[])[0].attempts) > held.attempts ? true : undefined;
        },
        60_000,
        "the other worker to take the frozen one's batch over",
      );
    } finally {
      process.kill(victim.pid, "SIGCONT");
    }
    await eventually(
      async () => (victim.output().includes(`job ${held.id} was taken over by a newer attempt`) ? true : undefined),
      60_000,
      "the woken worker to drop its result",
    );
    const s = await sweepDone(bullDesigner, id);
    expect(s.status).toBe("done");
    const counts = await rowsPerPair(id);
    expect(counts).toHaveLength(16);
    expect(counts.every((n) => n === 1)).toBe(true);
  });

  it.runIf(process.getuid?.() === 0)(
    "run as root, the private Redis runs as the unprivileged redis account, which owns its data (after the restart too)",
    () => {
      const pid = Number(readFileSync(join(process.env.TAPWRIGHT_REDIS_DIR!, "redis.pid"), "utf8").trim());
      const uid = Number(/^Uid:\s+(\d+)/m.exec(readFileSync(`/proc/${pid}/status`, "utf8"))![1]);
      const redisUid = Number(
        readFileSync("/etc/passwd", "utf8")
          .split("\n")
          .find((l) => l.startsWith("redis:"))!
          .split(":")[2],
      );
      expect(uid).toBe(redisUid);
      expect(statSync(join(process.env.TAPWRIGHT_REDIS_DIR!, "data")).uid).toBe(redisUid);
    },
  );

  it("the same sweep on the embedded queue gives the same numbers", async () => {
    const embedded = await startSweep(embeddedDesigner, "Embedded twin");
    const [a, b] = await Promise.all([sweepDone(bullDesigner, bullSweep), sweepDone(embeddedDesigner, embedded)]);
    expect(b.status).toBe("done");
    const key = (p: Pair) => `${p.channelId}:${p.cornerIndex}`;
    const theirs = new Map((b.results as Pair[]).map((p) => [key(p), p]));
    for (const p of a.results as Pair[]) {
      expect(theirs.get(key(p))?.limiterHeadroom_V).toBe(p.limiterHeadroom_V);
      expect(theirs.get(key(p))?.linearReachExhausted).toBe(p.linearReachExhausted);
    }
    expect(b.worst).toEqual(a.worst);
  });

  it("a tap table version fans out over the workers (a job per channel, per class, and the version) and equals the embedded one", async () => {
    const request = (name: string) => ({
      name: unique(name),
      budgetId: pop.budgetId,
      architecture: {
        key: "tx1-1-ctle-dfe2",
        label: "TX FIR 1/1 · CTLE · DFE 2",
        tx: { pre: 1, post: 1 },
        ctle: true,
        dfeTaps: 2,
        ffe: null,
      },
      grouping: { mode: "loss-bins", channelIds: pop.channelIds.slice(0, 6), edges_dB: [12] },
    });
    const computed = async (client: Client, name: string) => {
      const { id } = await (await client.send("POST", "/api/v1/tap-tables", request(name))).json();
      return eventually(
        async () => {
          const v = await (await client.get(`/api/v1/tap-tables/${id}/versions/1`)).json();
          return v.job.status === "done" || v.job.status === "failed" ? v : undefined;
        },
        240_000,
        `tap table ${id}`,
      );
    };
    const [a, b] = await Promise.all([
      computed(bullDesigner, "Distributed table"),
      computed(embeddedDesigner, "Embedded table"),
    ]);
    expect(a.job.status, a.job.error?.message).toBe("done");
    expect(a.result.classes).toEqual(b.result.classes);
    const [parts] = await db.query(
      "SELECT kind, COUNT(*) AS n, SUM(status = 'done') AS ok FROM jobs WHERE parent_id = (SELECT job_id FROM tap_table_versions WHERE id = ?) OR parent_id IN (SELECT id FROM jobs WHERE parent_id = (SELECT job_id FROM tap_table_versions WHERE id = ?)) GROUP BY kind",
      [a.id, a.id],
    );
    expect(Object.fromEntries((parts as { kind: string; n: number }[]).map((p) => [p.kind, Number(p.n)]))).toEqual({
      "table-class": 2,
      "table-member": 6,
    });
  });

  it("the admin page shows the distributed backend, its workers and the queue's depth", async () => {
    const admin = await signIn("admin", undefined, server.base);
    const overview = await (await admin.get("/api/v1/queue")).json();
    expect(overview.backend).toBe("bullmq");
    const names = overview.distributed.workers.map((w: { name: string }) => w.name);
    expect(names).toEqual(expect.arrayContaining(["worker-b", "worker-c"]));
    expect(names).not.toContain("worker-a");
    expect(overview.distributed.counts.completed).toBeGreaterThanOrEqual(2 * 14);
    const page = await (await admin.get("/admin")).text();
    expect(page).toContain("worker-b");
    expect(page).toContain("Distributed: BullMQ on Redis");
  });
});
