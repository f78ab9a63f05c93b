// Engine jobs are bounded: a search past the size limit is refused (422, saying what to coarsen) when
// a budget is saved and whenever a run, study, sweep or tap table starts; a job past its wall time,
// or whose worker runs out of memory, is stopped and failed with the reason, and the pool goes on
// with the next job in a fresh worker (a fresh pool when workers die while starting); a heartbeat
// that keeps failing is logged and ends the attempt; the embedded queue goes on pumping after it
// fails a job that is out of attempts.
import mysql from "mysql2/promise";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eventually, signIn, type Client } from "../support/http";
import { freePort, startServer, type TestServer } from "../support/server";
import { finished, rowCounts, unique } from "../fixtures/workspace";
import { population, type Population } from "./handoff.fixture";
import { budget, budgetBody } from "../support/budget";
// The start and test scripts' own helpers: a private database for the queue test.
import { settings } from "../../scripts/lib/config.mjs";
import { ensureDatabase } from "../../scripts/lib/mariadb.mjs";
import { migrate } from "../../scripts/lib/migrate.mjs";

let db: mysql.Pool;
let designer: Client;
let pop: Population;
const servers: TestServer[] = [];

const query = async <T = Record<string, unknown>>(sql: string, params: unknown[] = []) =>
  (await db.query(sql, params))[0] as T[];

/** A search past the limit for any channel: 2 pre, 4 post taps at 0.01 (1.8e10 FIR settings). */
const hugeTx = { pre: 2, post: 4, step: 0.01 };

interface PrivateQueue {
  /** Queues a run of these inputs (`attempts` already spent) straight into the private database. */
  queueRun(inputs: unknown, attempts?: number): Promise<number>;
  status(jobId: number): Promise<{ status: string; error: string | null; attempts: number }>;
  query(sql: string): Promise<unknown>;
  /** Starts a web server on the private database (its dispatcher is the only one that sees it). */
  start(env: Record<string, string>): Promise<TestServer>;
  drop(): Promise<void>;
}

let databases = 0;
/**
 * A database of its own, so that only the server started on it computes its jobs (the suite's
 * server, without the limits under test, would otherwise claim some of them).
 */
async function privateQueue(): Promise<PrivateQueue> {
  const cfg = settings("test");
  const name = `${cfg.db.name}_bounds${++databases}`;
  const url = new URL(process.env.DATABASE_URL!);
  url.pathname = `/${name}`;
  await ensureDatabase({ ...cfg.db, name }, { fresh: true });
  await migrate(url.toString());
  const own = await mysql.createConnection({ uri: url.toString() });
  return {
    async queueRun(inputs, attempts = 0) {
      const [job] = await own.query(
        "INSERT INTO jobs (kind, target_id, status, attempts) VALUES ('run', 0, 'queued', ?)",
        [attempts],
      );
      const jobId = (job as { insertId: number }).insertId;
      const [r] = await own.query("INSERT INTO runs (job_id, inputs) VALUES (?, ?)", [jobId, JSON.stringify(inputs)]);
      await own.query("UPDATE jobs SET target_id = ? WHERE id = ?", [(r as { insertId: number }).insertId, jobId]);
      return jobId;
    },
    async status(jobId) {
      return (
        (await own.query("SELECT status, error, attempts FROM jobs WHERE id = ?", [jobId]))[0] as {
          status: string;
          error: string | null;
          attempts: number;
        }[]
      )[0];
    },
    query: (sql) => own.query(sql),
    async start(env) {
      const s = await startServer(await freePort(), { DATABASE_URL: url.toString(), ...env });
      servers.push(s);
      return s;
    },
    async drop() {
      await own.end();
      const root = await mysql.createConnection({ uri: process.env.DATABASE_URL! });
      await root.query(`DROP DATABASE IF EXISTS \`${name}\``).finally(() => root.end());
    },
  };
}

const settled = (q: PrivateQueue, jobId: number) =>
  eventually(
    async () => {
      const s = await q.status(jobId);
      return s.status === "done" || s.status === "failed" ? s : undefined;
    },
    90_000,
    `job ${jobId} to finish`,
  );

/** The inputs of a run of the quick budget, computed by the suite's server (a real copy of a channel and a budget). */
let quickInputs: { channel: unknown; budget: { id: number; name: string; params: Record<string, unknown> } };

beforeAll(async () => {
  db = mysql.createPool({ uri: process.env.DATABASE_URL!, connectionLimit: 2 });
  designer = await signIn("designer");
  pop = await population(designer, [8, 20, 30]);
  const res = await designer.send("POST", "/api/v1/runs", { channelId: pop.channelIds[0], budgetId: pop.budgetId });
  const { id } = await res.json();
  expect((await finished(designer, id)).status).toBe("done");
  quickInputs = (await (await designer.get(`/api/v1/runs/${id}`)).json()).inputs;
}, 120_000);
afterAll(async () => {
  await Promise.all(servers.map((s) => s.stop()));
  await db?.end();
});

describe("the search size", () => {
  it("is checked when a budget is saved: past the limit it is refused, saying what to coarsen, and nothing is stored", async () => {
    const before = await rowCounts();
    const res = await designer.send("POST", "/api/v1/budgets", budgetBody(unique("Huge"), { tx: hugeTx }));
    expect(res.status).toBe(422);
    const body = await res.json();
    expect(body.error.path).toBe("tx");
    expect(body.error.message).toMatch(
      /^The search is too large: 4 CTLE settings × 1\.8e10 transmit FIR settings \(2 pre, 4 post taps at step 0\.01\) × 32 sampling phases = 2\.3e12, above the limit of 1\.0e10\./,
    );
    expect(body.error.message).toMatch(/Coarsen it: a transmit FIR step of 0\.04 or more/);
    expect((await rowCounts()).budgets).toBe(before.budgets);
  });

  it("is checked again when a run, a study or a sweep starts (a budget stored before the limit): 422, nothing queued", async () => {
    const b = await designer.send("POST", "/api/v1/budgets", budgetBody(unique("Grown")));
    const budgetId = (await b.json()).id;
    await query(
      "UPDATE budgets SET params = JSON_SET(params, '$.tx', JSON_OBJECT('pre', 2, 'post', 4, 'step', 0.01)) WHERE id = ?",
      [budgetId],
    );
    const before = await rowCounts();
    const channelIds = pop.channelIds.slice(0, 1);
    for (const [path, body] of [
      ["/api/v1/runs", { channelId: channelIds[0], budgetId }],
      ["/api/v1/studies", { name: unique("Huge study"), channelIds, budgetId }],
      ["/api/v1/sweeps", { name: unique("Huge sweep"), channelIds, budgetId, corners: [{ name: "nominal" }] }],
    ] as const) {
      const res = await designer.send("POST", path, body);
      expect(res.status, path).toBe(422);
      const { error } = await res.json();
      expect(error.path, path).toBe("budgetId");
      expect(error.message, path).toMatch(
        /The search is too large: .* Coarsen it: a transmit FIR step of 0\.04 or more/,
      );
    }
    const after = await rowCounts();
    expect([after.runs, after.jobs]).toEqual([before.runs, before.jobs]);
  });

  it("counts a tap-table class's channels together: each channel alone fits, the class of three does not", async () => {
    // 13 CTLE settings × 26⁵ FIR settings × 32 phases = 4.9e9 for one channel (saved), × 3 = 1.5e10 for the class.
    const tx = { pre: 1, post: 4, step: 0.02 };
    const b = await designer.send(
      "POST",
      "/api/v1/budgets",
      budgetBody(unique("Wide FIR"), { tx, ctle: { gDc_dB: [-12, 0, 1] } }),
    );
    expect(b.status, await b.clone().text()).toBe(201);
    const budgetId = (await b.json()).id;
    const [before] = await query<{ n: number }>("SELECT COUNT(*) AS n FROM tap_tables");
    const res = await designer.send("POST", "/api/v1/tap-tables", {
      name: unique("Too wide"),
      budgetId,
      architecture: {
        key: "tx-ctle",
        label: "TX FIR + CTLE",
        tx: { pre: 1, post: 4 },
        ctle: true,
        dfeTaps: 0,
        ffe: null,
      },
      grouping: { mode: "manual", classes: [{ name: "All", channelIds: pop.channelIds }] },
    });
    expect(res.status, await res.clone().text()).toBe(422);
    expect((await res.json()).error.message).toMatch(
      /× 3 channels together = 1\.5e10, above the limit of 1\.0e10\. Coarsen it: .*fewer channels per class/,
    );
    const [after] = await query<{ n: number }>("SELECT COUNT(*) AS n FROM tap_tables");
    expect(after.n).toBe(before.n);
  });
});

describe("a job past its bounds", () => {
  it("past its wall-time limit is stopped and failed with the reason; the pool takes the next job in a fresh worker", async () => {
    // A search of minutes or more (2 pre, 4 post taps at 0.01 over 13 CTLE settings) against a limit of 1 s.
    const params = {
      ...quickInputs.budget.params,
      tx: { pre: 2, post: 4, step: 0.01 },
      ctle: { ...budget().ctle, gDc_dB: [-12, 0, 1] },
    };
    const q = await privateQueue();
    try {
      const ids = [
        await q.queueRun({ ...quickInputs, budget: { ...quickInputs.budget, params } }),
        await q.queueRun({ ...quickInputs, budget: { ...quickInputs.budget, params } }),
      ];
      const s = await q.start({ TAPWRIGHT_JOB_TIME_LIMIT_S: "1", TAPWRIGHT_WORKERS: "1" });
      for (const id of ids) {
        const end = await settled(q, id);
        expect(end.status).toBe("failed");
        expect(end.error).toMatch(
          /^The job ran longer than its limit of 1 s and was stopped\. Coarsen the budget's grids/,
        );
      }
      await s.stop();
    } finally {
      await q.drop();
    }
  }, 180_000);

  it("whose worker runs out of memory fails with the reason; the next job gets a fresh worker", async () => {
    const q = await privateQueue();
    try {
      const ids = [await q.queueRun(quickInputs), await q.queueRun(quickInputs)];
      // 11 MB: enough to load the engine, too little for a run (about 14 MB of heap).
      const s = await q.start({ TAPWRIGHT_WORKER_MEMORY_MB: "11", TAPWRIGHT_WORKERS: "1" });
      for (const id of ids) {
        const end = await settled(q, id);
        expect(end.status).toBe("failed");
        expect(end.error).toMatch(
          /^The engine ran out of memory \(each worker may use 11 MB of heap\) and its worker was stopped and replaced\./,
        );
      }
      await s.stop();
    } finally {
      await q.drop();
    }
  }, 180_000);
});

describe("a heartbeat that fails", () => {
  it("is logged and ends the attempt (its worker stopped), and the job is taken again once the lease lapses", async () => {
    // A search of minutes; leases of 2 s renewed every ⅔ s. While the column the heartbeat writes
    // is renamed away, renewals fail; two in a row end the attempt, which frees the only worker.
    const params = {
      ...quickInputs.budget.params,
      tx: { pre: 2, post: 4, step: 0.01 },
      ctle: { ...budget().ctle, gDc_dB: [-12, 0, 1] },
    };
    const q = await privateQueue();
    try {
      const id = await q.queueRun({ ...quickInputs, budget: { ...quickInputs.budget, params } });
      const s = await q.start({ TAPWRIGHT_JOB_LOCK_S: "2", TAPWRIGHT_WORKERS: "1", TAPWRIGHT_JOB_TIME_LIMIT_S: "120" });
      await eventually(
        async () => ((await q.status(id)).status === "running" ? true : undefined),
        30_000,
        "the run to start",
      );
      await q.query("ALTER TABLE jobs RENAME COLUMN locked_until TO locked_until_away");
      await new Promise((r) => setTimeout(r, 3000));
      await q.query("ALTER TABLE jobs RENAME COLUMN locked_until_away TO locked_until");
      await eventually(
        async () => ((await q.status(id)).attempts >= 2 ? true : undefined),
        30_000,
        "the run to be taken again",
      );
      expect(s.stderr()).toMatch(new RegExp(`job ${id} \\(run\\): heartbeat failed, ending the attempt`));
      await s.stop();
    } finally {
      await q.drop();
    }
  }, 180_000);
});

describe("the embedded queue", () => {
  it("goes on to the next job after failing one that is out of attempts", async () => {
    // Its dispatcher polls only once an hour: the run is computed only if the pass that fails the
    // exhausted job goes on to the next one.
    const q = await privateQueue();
    try {
      const exhausted = await q.queueRun(quickInputs, 3);
      const next = await q.queueRun(quickInputs);
      const s = await q.start({ TAPWRIGHT_QUEUE_POLL_S: "3600" });
      expect((await settled(q, next)).status).toBe("done");
      const failed = await q.status(exhausted);
      expect(failed.status).toBe("failed");
      expect(failed.error).toMatch(/stopped 3 times before it could finish/);
      await s.stop();
    } finally {
      await q.drop();
    }
  }, 180_000);
});
