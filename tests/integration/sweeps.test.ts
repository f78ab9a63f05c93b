// Corner sweeps through the API on the embedded queue: the role matrix, validation that leaves
// nothing behind, a sweep from queued to done with one result per pair, figures checked against
// independent tuning runs (the nominal corner is the channel's own run; a loss corner of a synthetic
// line is the run of a line made with that loss), the binding corner, CSV, and sweeping a program.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { anonymous, eventually, signIn, type Client } from "../support/http";
import { closeDb, finished, unique } from "../fixtures/workspace";
import { population, type Population } from "./handoff.fixture";
import { budgetBody } from "../support/budget";
import mysql from "mysql2/promise";

let designer: Client;
let pop: Population;
let db: mysql.Pool;

const corners = [
  { name: "nominal" },
  { name: "loss +20 %", lossScale: 1.2 },
  { name: "slow silicon", txSwingScale: 0.9, noiseScale: 1.2, jitterScale: 1.3, sensitivityScale: 1.2 },
];

interface Pair {
  channelId: number;
  corner: string;
  cornerIndex: number;
  limiterHeadroom_V: number | null;
  linearReachExhausted: boolean | null;
  error: string | null;
}

async function sweepDone(client: Client, id: number, timeout_ms = 180_000) {
  return eventually(
    async () => {
      const s = await (await client.get(`/api/v1/sweeps/${id}`)).json();
      return s.status === "done" || s.status === "failed" ? s : undefined;
    },
    timeout_ms,
    `sweep ${id} to finish`,
  );
}

const count = async (sql: string, args: unknown[] = []) =>
  Number(((await db.query(sql, args))[0] as { n: number }[])[0].n);

beforeAll(async () => {
  designer = await signIn("designer");
  pop = await population(designer, [10, 20, 28]);
  db = mysql.createPool({ uri: process.env.DATABASE_URL!, connectionLimit: 2 });
});
afterAll(async () => {
  await db.end();
  await closeDb();
});

describe("corner sweeps", () => {
  it("everyone reads; designers and admins start them; anonymous callers must sign in", async () => {
    expect((await anonymous().get("/api/v1/sweeps")).status).toBe(401);
    for (const role of ["firmware", "reviewer"] as const) {
      const c = await signIn(role);
      expect((await c.get("/api/v1/sweeps")).status).toBe(200);
      expect(
        (
          await c.send("POST", "/api/v1/sweeps", {
            name: "x",
            channelIds: pop.channelIds,
            budgetId: pop.budgetId,
            corners,
          })
        ).status,
      ).toBe(403);
    }
  });

  it("refuses what it cannot sweep, naming the field, and writes nothing", async () => {
    const before = await count("SELECT COUNT(*) AS n FROM sweeps");
    const jobsBefore = await count("SELECT COUNT(*) AS n FROM jobs");
    const send = (body: Record<string, unknown>) =>
      designer.send("POST", "/api/v1/sweeps", {
        name: unique("Refused"),
        channelIds: pop.channelIds,
        budgetId: pop.budgetId,
        corners,
        ...body,
      });
    const noCorners = await send({ corners: [] });
    expect(noCorners.status).toBe(400);
    expect((await noCorners.json()).error.path).toBe("corners");
    const twice = await send({ corners: [{ name: "hot" }, { name: "HOT", lossScale: 1.1 }] });
    expect(twice.status).toBe(400);
    expect((await twice.json()).error.message).toMatch(/same name/);
    const zero = await send({ corners: [{ name: "no loss", lossScale: 0 }] });
    expect(zero.status).toBe(400);
    expect((await zero.json()).error.path).toBe("corners.0.lossScale");
    // The budget's jitter is 0.05 UI DJ: ×4 is fine, but its RJ 0.01 × 4 is too; swing 0.8 V × 4 = 3.2 V is fine.
    const wild = await send({ corners: [{ name: "nominal" }, { name: "wild", jitterScale: 4, txSwingScale: 4 }] });
    expect(wild.status).toBe(202);
    await sweepDone(designer, (await wild.json()).id);
    const both = await send({ programId: 1 });
    expect(both.status).toBe(400);
    expect(
      (
        await designer.send("POST", "/api/v1/sweeps", {
          name: "x",
          channelIds: [999999],
          budgetId: pop.budgetId,
          corners,
        })
      ).status,
    ).toBe(404);
    expect(
      (
        await designer.send("POST", "/api/v1/sweeps", {
          name: "x",
          channelIds: pop.channelIds,
          budgetId: 999999,
          corners,
        })
      ).status,
    ).toBe(404);
    // Only the accepted "wild" sweep was written: one sweep, its parent and its batches.
    expect(await count("SELECT COUNT(*) AS n FROM sweeps")).toBe(before + 1);
    expect(await count("SELECT COUNT(*) AS n FROM jobs")).toBe(jobsBefore + 1 + pop.channelIds.length);
  });

  it("a corner that takes the budget out of range is refused with 422 naming the corner", async () => {
    const narrow = await designer.send(
      "POST",
      "/api/v1/budgets",
      budgetBody(unique("Narrow"), { jitter: { rjRms_UI: 0.2, djPp_UI: 0.05 } }),
    );
    const budgetId = (await narrow.json()).id;
    const r = await designer.send("POST", "/api/v1/sweeps", {
      name: unique("Too shaky"),
      channelIds: pop.channelIds,
      budgetId,
      corners: [{ name: "nominal" }, { name: "shaky", jitterScale: 3 }],
    });
    expect(r.status).toBe(422);
    const body = await r.json();
    expect(body.error.path).toBe("corners.1");
    expect(body.error.message).toMatch(/corner "shaky": budget\.jitter\.rjRms_UI/);
  });

  it("computes every pair once; the figures agree with independent tuning runs; the binding corner is the worst; CSV matches", async () => {
    const name = unique("Backplane corners");
    const res = await designer.send("POST", "/api/v1/sweeps", {
      name,
      channelIds: pop.channelIds,
      budgetId: pop.budgetId,
      corners,
    });
    expect(res.status).toBe(202);
    const { id, status } = await res.json();
    expect(status).toBe("queued");
    const progress = await (await designer.get(`/api/v1/sweeps/${id}?fields=status`)).json();
    expect(progress.total).toBe(9);
    expect(progress.done).toBeGreaterThanOrEqual(0);

    const s = await sweepDone(designer, id);
    expect(s.status).toBe("done");
    expect(s.progress).toBe(1);
    expect(s.done).toBe(9);
    expect(s.results).toHaveLength(9);
    expect(await count("SELECT COUNT(*) AS n FROM sweep_results WHERE sweep_id = ?", [id])).toBe(9);
    const pairs = s.results as Pair[];
    const at = (channelId: number, k: number) => pairs.find((p) => p.channelId === channelId && p.cornerIndex === k)!;

    // The nominal corner is exactly the channel's own tuning run under the budget.
    const ch20 = pop.byLoss.get(20)!;
    const run = await designer.send("POST", "/api/v1/runs", { channelId: ch20, budgetId: pop.budgetId });
    const runDone = await finished(designer, (await run.json()).id, 120_000);
    const runView = await (await designer.get(`/api/v1/runs/${runDone.id}`)).json();
    expect(at(ch20, 0).limiterHeadroom_V).toBe(runView.result.metrics.limiterHeadroom_V);

    // Loss × 1.2 on a 20 dB synthetic line is the run of a 24 dB line.
    const line24 = await designer.send("POST", "/api/v1/channels", {
      name: unique("Line 24 dB"),
      bitRate_bps: 28e9,
      lossModel: { lossAtNyquist_dB: 24 },
    });
    const run24 = await designer.send("POST", "/api/v1/runs", {
      channelId: (await line24.json()).id,
      budgetId: pop.budgetId,
    });
    const view24 = await (
      await designer.get(`/api/v1/runs/${(await finished(designer, (await run24.json()).id, 120_000)).id}`)
    ).json();
    expect(at(ch20, 1).limiterHeadroom_V).toBe(view24.result.metrics.limiterHeadroom_V);

    // The binding corner of each channel is its lowest headroom.
    expect(s.worst).toHaveLength(3);
    for (const w of s.worst as { channelId: number; corner: string; limiterHeadroom_V: number }[]) {
      const mine = pairs.filter((p) => p.channelId === w.channelId).map((p) => p.limiterHeadroom_V as number);
      expect(w.limiterHeadroom_V).toBe(Math.min(...mine));
      expect(pairs.find((p) => p.channelId === w.channelId && p.corner === w.corner)!.limiterHeadroom_V).toBe(
        w.limiterHeadroom_V,
      );
    }
    // More loss, less headroom (the 28 dB line's slow corner and loss corner sit below its nominal).
    const ch28 = pop.byLoss.get(28)!;
    expect(at(ch28, 1).limiterHeadroom_V!).toBeLessThan(at(ch28, 0).limiterHeadroom_V!);
    expect(at(ch28, 2).limiterHeadroom_V!).toBeLessThan(at(ch28, 0).limiterHeadroom_V!);

    const csv = await designer.get(`/api/v1/sweeps/${id}/export`);
    expect(csv.status).toBe(200);
    expect(csv.headers.get("content-type")).toMatch(/^text\/csv/);
    const lines = (await csv.text()).trimEnd().split("\r\n");
    expect(lines).toHaveLength(10);
    expect(lines[0]).toMatch(/^channel_id,channel,loss_at_nyquist_dB,corner,loss_scale/);
    const row = lines.find((l) => l.startsWith(`${ch20},`) && l.includes(",loss +20 %,"))!;
    expect(Number(row.split(",")[9])).toBeCloseTo(at(ch20, 1).limiterHeadroom_V! * 1e3, 3);

    const list = await (await designer.get("/api/v1/sweeps")).json();
    expect(list.items.find((x: { id: number }) => x.id === id)).toMatchObject({
      status: "done",
      done: 9,
      total: 9,
      channelCount: 3,
      cornerCount: 3,
    });
    const audit = await count("SELECT COUNT(*) AS n FROM audit_events WHERE action = 'sweep.start' AND target_id = ?", [
      String(id),
    ]);
    expect(audit).toBe(1);
  });

  it("sweeps all channels of a program", async () => {
    const r = await designer.get(`/api/v1/channels/${pop.channelIds[0]}`);
    const programId = (await r.json()).programId as number;
    const res = await designer.send("POST", "/api/v1/sweeps", {
      name: unique("Program"),
      programId,
      budgetId: pop.budgetId,
      corners: [{ name: "nominal" }],
    });
    if (res.status === 422) {
      // The program also holds channels at other bit rates (the demo's PAM4 lane): one rate per sweep.
      expect((await res.json()).error.path).toBe("programId");
      return;
    }
    expect(res.status).toBe(202);
    const s = await sweepDone(designer, (await res.json()).id);
    expect(s.channels.length).toBeGreaterThanOrEqual(3);
  });
});
