// The job queue under faults, against MariaDB and real server processes: a job whose lease was
// taken over never saves; an approved version never moves back when a stale job for it finishes;
// kill -9 of the web server mid-run and mid-upload, and of MariaDB mid-run, lose nothing committed
// and leave nothing half-written.
import { execFileSync } from "node:child_process";
import { readFileSync } from "node:fs";
import { dirname, join } from "node:path";
import mysql from "mysql2/promise";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { baseUrl, eventually, signIn, type Client } from "../support/http";
import { freePort, startServer } from "../support/server";
import { finished, unique } from "../fixtures/workspace";
import { files } from "../fixtures/channelFiles";
import { population, versionComputed, type Population } from "./handoff.fixture";
import { budgetBody } from "../support/budget";

let db: mysql.Pool;
let designer: Client;
let reviewer: Client;
let pop: Population;
let slowBudget: number;

const query = async <T = Record<string, unknown>>(sql: string, params: unknown[] = []) =>
  (await db.query(sql, params))[0] as T[];
const jobOfRun = async (runId: number) =>
  (
    await query<{ id: number; status: string; lock_token: string | null; attempts: number }>(
      "SELECT j.id, j.status, j.lock_token, j.attempts FROM jobs j JOIN runs r ON r.job_id = j.id WHERE r.id = ?",
      [runId],
    )
  )[0];
const runResultStored = async (runId: number) =>
  (await query<{ n: number }>("SELECT COUNT(*) AS n FROM runs WHERE id = ? AND result IS NOT NULL", [runId]))[0].n ===
  1;

/** Starts a run through `client` and waits until a server is computing it. */
async function runningRun(client: Client, budgetId = slowBudget, channelId = pop.channelIds.at(-1)!) {
  const res = await client.send("POST", "/api/v1/runs", { channelId, budgetId });
  expect(res.status, await res.clone().text()).toBe(202);
  const { id } = await res.json();
  await eventually(
    async () => ((await jobOfRun(id)).status === "running" ? true : undefined),
    30_000,
    `run ${id} to start`,
  );
  return id as number;
}

beforeAll(async () => {
  db = mysql.createPool({ uri: process.env.DATABASE_URL!, connectionLimit: 3 });
  [designer, reviewer] = await Promise.all([signIn("designer"), signIn("reviewer")]);
  pop = await population(designer, [10, 30]);
  // A budget whose search takes a few seconds (fine FIR steps, jitter): long enough to act on mid-run.
  const b = await designer.send(
    "POST",
    "/api/v1/budgets",
    budgetBody(unique("Slow"), { tx: { pre: 1, post: 2, step: 0.025 }, dfe: { taps: 4, limits_V: 0.1 } }),
  );
  slowBudget = (await b.json()).id;
});
afterAll(async () => {
  await db?.end();
});

describe("fencing", () => {
  it("an attempt whose lease was taken over never stores its result; the holder of the lease finishes the job", async () => {
    const stale = await runningRun(designer);
    // Another server takes the job over (as when this one stalled past its lease).
    await query(
      "UPDATE jobs SET lock_token = 'taken-over', locked_by = 'another-server', locked_until = NOW(3) + INTERVAL 1 HOUR WHERE id = ?",
      [(await jobOfRun(stale)).id],
    );
    // A twin started now finishes after the stale attempt has finished computing (same inputs, two workers).
    const twin = await runningRun(designer);
    expect((await finished(designer, twin)).status).toBe("done");
    expect(await runResultStored(stale)).toBe(false);
    expect(await jobOfRun(stale)).toMatchObject({ status: "running", lock_token: "taken-over" });
    // The lease lapses: a dispatcher claims the job again and finishes it.
    await query("UPDATE jobs SET locked_until = NOW(3) - INTERVAL 1 SECOND WHERE id = ?", [(await jobOfRun(stale)).id]);
    expect((await finished(designer, stale)).status).toBe("done");
    expect(await runResultStored(stale)).toBe(true);
  }, 180_000);

  it("a stale job for a signed-off version does not move it back out of approval", async () => {
    const res = await designer.send("POST", "/api/v1/tap-tables", {
      name: unique("Fenced table"),
      budgetId: pop.budgetId,
      architecture: {
        key: "tx-ctle",
        label: "TX FIR + CTLE",
        tx: { pre: 0, post: 1 },
        ctle: true,
        dfeTaps: 0,
        ffe: null,
      },
      grouping: { mode: "manual", classes: [{ name: "All", channelIds: pop.channelIds }] },
    });
    const { id } = await res.json();
    expect((await versionComputed(designer, id, 1)).job.status).toBe("done");
    const reviewerId = (await (await reviewer.get("/api/v1/me")).json()).id;
    const so = await (
      await designer.send("POST", `/api/v1/tap-tables/${id}/versions/1/sign-off`, { reviewerId })
    ).json();
    expect(
      (await reviewer.send("POST", `/api/v1/sign-offs/${so.id}/decision`, { decision: "approve", comment: "ok" }))
        .status,
    ).toBe(200);
    const [version] = await query<{ id: number; state: string; result: string }>(
      "SELECT id, state, result FROM tap_table_versions WHERE table_id = ? AND version = 1",
      [id],
    );
    expect(version.state).toBe("approved");
    // The version's job runs once more, as a stale retry would.
    await query(
      "UPDATE jobs SET status = 'queued', attempts = 0, finished_at = NULL WHERE kind = 'table-version' AND target_id = ?",
      [version.id],
    );
    await fetch(`${baseUrl}/api/v1/health`); // any request wakes the dispatcher
    await eventually(async () => {
      const [j] = await query<{ status: string }>(
        "SELECT status FROM jobs WHERE kind = 'table-version' AND target_id = ?",
        [version.id],
      );
      return j.status === "done" || j.status === "failed" ? j : undefined;
    }, 120_000);
    const [after] = await query<{ state: string; result: string }>(
      "SELECT state, result FROM tap_table_versions WHERE id = ?",
      [version.id],
    );
    expect(after.state).toBe("approved");
    expect(after.result).toEqual(version.result);
  }, 180_000);
});

describe("faults", () => {
  it("kill -9 of the web server mid-run: the job is taken over after its lease and finishes once", async () => {
    const server = await startServer(await freePort(), { TAPWRIGHT_JOB_LOCK_S: "2" });
    const c = await signIn("designer", undefined, server.base);
    const id = await runningRun(c);
    server.kill();
    const end = await finished(designer, id, 90_000);
    expect(end.status).toBe("done");
    expect((await jobOfRun(id)).attempts).toBe(2);
    expect(await runResultStored(id)).toBe(true);
  }, 180_000);

  it("kill -9 of the web server mid-upload: nothing of the upload is stored; what was committed stays", async () => {
    const server = await startServer(await freePort());
    const c = await signIn("designer", undefined, server.base);
    const before = await query<{ n: number }>("SELECT COUNT(*) AS n FROM channels");
    const text = files.s4p(20);
    const boundary = "----fault";
    const head = `--${boundary}\r\nContent-Disposition: form-data; name="name"\r\n\r\n${unique("Killed upload")}\r\n--${boundary}\r\nContent-Disposition: form-data; name="bitRate_bps"\r\n\r\n28e9\r\n--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="killed.s4p"\r\n\r\n`;
    let sent = 0;
    const body = new ReadableStream<Uint8Array>({
      async pull(ctrl) {
        if (sent === 0) ctrl.enqueue(new TextEncoder().encode(head));
        // Half the file, then the server dies while the rest is on its way.
        const chunk = text.slice(sent, sent + 4096);
        sent += 4096;
        if (sent > text.length / 2) {
          server.kill();
          await new Promise((r) => setTimeout(r, 200));
          ctrl.error(new Error("server gone"));
          return;
        }
        ctrl.enqueue(new TextEncoder().encode(chunk));
      },
    });
    await expect(
      c.fetch("/api/v1/channels", {
        method: "POST",
        body,
        headers: { "content-type": `multipart/form-data; boundary=${boundary}` },
        duplex: "half",
      } as RequestInit),
    ).rejects.toThrow();
    const after = await query<{ n: number }>("SELECT COUNT(*) AS n FROM channels");
    expect(after[0].n).toBe(before[0].n);
    expect(
      (
        await query<{ n: number }>(
          "SELECT COUNT(*) AS n FROM channel_sources s LEFT JOIN channels ch ON ch.id = s.channel_id WHERE ch.id IS NULL",
        )
      )[0].n,
    ).toBe(0);
    expect((await designer.get(`/api/v1/channels/${pop.channelIds[0]}`)).status).toBe(200);
  });

  it("kill -9 of MariaDB mid-run: after its restart the committed rows are all there and the run finishes", async () => {
    const dbDir = process.env.TAPWRIGHT_DB_DIR!;
    const root = join(import.meta.dirname, "..", "..");
    const url = new URL(process.env.DATABASE_URL!);
    const admin = await mysql.createConnection({
      socketPath: join(dbDir, "mysql.sock"),
      user: "root",
      password: readFileSync(join(dirname(dbDir), "db-root-password"), "utf8").trim(),
    });
    // Test runs trade durability for speed; a crash test needs every commit on disk.
    await admin.query("SET GLOBAL innodb_flush_log_at_trx_commit = 1");
    await admin.end();
    const tables = [
      "channels",
      "channel_sources",
      "budgets",
      "runs",
      "jobs",
      "tap_tables",
      "tap_table_versions",
      "users",
    ];
    const count = async () =>
      Object.fromEntries(
        await Promise.all(
          tables.map(async (t) => [t, (await query<{ n: number }>(`SELECT COUNT(*) AS n FROM \`${t}\``))[0].n]),
        ),
      );
    const id = await runningRun(designer);
    const committed = await count();
    const doneRuns = await query<{ id: number }>(
      "SELECT r.id FROM runs r JOIN jobs j ON j.id = r.job_id WHERE j.status = 'done' AND r.result IS NOT NULL",
    );

    const mariadbPid = Number(readFileSync(join(dbDir, "mariadbd.pid"), "utf8").trim());
    process.kill(mariadbPid, "SIGKILL");
    // Start again only once the killed process is gone, or the start command would reuse it.
    await eventually(
      async () => {
        try {
          process.kill(mariadbPid, 0);
          return undefined;
        } catch {
          return true;
        }
      },
      20_000,
      "the killed MariaDB to end",
    );
    execFileSync(process.execPath, [join(root, "scripts", "db.mjs"), "start"], {
      env: {
        ...process.env,
        TAPWRIGHT_DATA_DIR: dirname(dbDir),
        DB_PORT: url.port,
        TAPWRIGHT_MODE: "test",
        DB_NAME: url.pathname.slice(1),
      },
      stdio: "ignore",
    });
    await eventually(
      async () => ((await (await fetch(`${baseUrl}/api/v1/health`)).json()).db ? true : undefined),
      30_000,
      "the database to answer",
    );
    expect(await count()).toEqual(committed);
    const stillDone = await query<{ id: number }>(
      "SELECT r.id FROM runs r JOIN jobs j ON j.id = r.job_id WHERE j.status = 'done' AND r.result IS NOT NULL AND r.id IN (?)",
      [doneRuns.map((r) => r.id)],
    );
    expect(stillDone.length).toBe(doneRuns.length);
    expect((await finished(designer, id, 120_000)).status).toBe("done");
  }, 180_000);
});
