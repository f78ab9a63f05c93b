// Tuning runs against MariaDB and the worker pool: queued → running → done with the result the
// page draws; a run the engine refuses ends failed with its reason and keeps its inputs; two runs at
// once both finish while the health route keeps answering; "Run again" reproduces a run; deleting a
// channel asks first and its runs keep their copy; the role matrix on every route.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { anonymous, baseUrl, signIn, type Client, type DemoRole } from "../support/http";
import { closeDb, finished, rowCounts, unique } from "../fixtures/workspace";
import { budgetBody, type BudgetChanges } from "../support/budget";

afterAll(closeDb);

let designer: Client;
let shortLane: number; // the demo's 6 dB lane
let longLane: number; // the demo's 28 dB lane
let nrzBudget: number;
let firstRun: { id: number; result: Record<string, unknown> };

/** The test budget without a bit rate or jitter, one transmit pre-cursor tap and a finer CTLE grid. */
const nrzBudgetBody = (name: string, changes: BudgetChanges = {}) =>
  budgetBody(name, {
    bitRate_bps: undefined,
    jitter: undefined,
    tx: { pre: 1 },
    ctle: { gDc_dB: [-8, 0, 2] },
    ...changes,
  });

async function channelNamed(prefix: string): Promise<number> {
  const r = await (await designer.get(`/api/v1/channels?q=${encodeURIComponent(prefix)}`)).json();
  expect(r.items.length, prefix).toBeGreaterThan(0);
  return r.items[0].id;
}

beforeAll(async () => {
  designer = await signIn("designer");
  shortLane = await channelNamed("Slot 2 lane 0");
  longLane = await channelNamed("Slot 11 lane 2");
  nrzBudget = (await (await designer.send("POST", "/api/v1/budgets", nrzBudgetBody(unique("Runs test NRZ")))).json())
    .id;
});

describe("a tuning run", () => {
  it("goes from queued to done, with the eyes, pulses, bathtub, trajectories, metrics, verdict and engine version", async () => {
    const start = await designer.send("POST", "/api/v1/runs", { channelId: shortLane, budgetId: nrzBudget });
    expect(start.status).toBe(202);
    const queued = await start.json();
    expect(queued).toEqual({ id: expect.any(Number), status: "queued" });
    const end = await finished(designer, queued.id);
    expect(end).toMatchObject({ status: "done", progress: 1 });

    const run = await (await designer.get(`/api/v1/runs/${queued.id}`)).json();
    expect(run.engineVersion).toMatch(/^tapwright-engine /);
    expect(run.result.engineVersion).toBe(run.engineVersion);
    for (const eye of [run.result.eyes.before, run.result.eyes.after]) {
      expect(eye.image.counts.length).toBe(eye.image.width * eye.image.height);
      expect(eye.image.counts.some((c: number) => c > 0)).toBe(true);
      expect(eye.contours.length).toBeGreaterThan(0);
    }
    expect(run.result.pulses.before_V.length).toBe(run.result.pulses.time_UI.length);
    expect(run.result.bathtub.phase_UI.length).toBeGreaterThan(10);
    expect(run.result.adaptation.dfe.taps[0]).toHaveLength(2);
    expect(run.result.adaptation.txTraining.taps.length).toBeGreaterThan(0);
    expect(run.result.metrics).toMatchObject({
      eyeHeight_V: expect.any(Number),
      limiterHeadroom_V: expect.any(Number),
      residualIsiRms_V: expect.any(Number),
      noiseGain_dB: expect.any(Number),
    });
    expect(run.result.verdict).toMatchObject({ linearReachExhausted: false });
    expect(run.summary).toEqual({
      limiterHeadroom_V: run.result.metrics.limiterHeadroom_V,
      eyeHeight_V: run.result.metrics.eyeHeight_V,
      linearReachExhausted: false,
      closes: true,
    });
    expect(run.timings.compute_ms).toBeGreaterThan(0);
    expect(new Date(run.timings.finishedAt).getTime()).toBeGreaterThanOrEqual(new Date(run.timings.queuedAt).getTime());

    // It keeps copies of its inputs: the channel's pulse and the budget as they were.
    const channel = await (await designer.get(`/api/v1/channels/${shortLane}`)).json();
    expect(run.inputs.channel).toMatchObject({ id: shortLane, name: channel.name, pulse: channel.pulse });
    expect(run.inputs.budget).toMatchObject({ id: nrzBudget, params: { tx: { pre: 1, post: 1, step: 0.05 } } });
    firstRun = run;

    const list = await (await designer.get(`/api/v1/runs?channelId=${shortLane}`)).json();
    expect(list.items.find((r: { id: number }) => r.id === queued.id)).toMatchObject({
      status: "done",
      channel: { id: shortLane, name: channel.name },
    });
  });

  it("run again reproduces it from its own copy of the inputs", async () => {
    const again = await designer.send("POST", `/api/v1/runs/${firstRun.id}/rerun`);
    expect(again.status).toBe(202);
    const { id } = await again.json();
    expect((await finished(designer, id)).status).toBe("done");
    const second = await (await designer.get(`/api/v1/runs/${id}`)).json();
    expect(second.rerunOf).toBe(firstRun.id);
    expect(second.result).toEqual(firstRun.result);
  });

  it("whose budget's bit rate does not match the channel's is refused up front (422), in rounded units, leaving nothing behind", async () => {
    // The budget states 10 Gb/s; the channel was derived for 28 Gb/s.
    const mismatched = (
      await (
        await designer.send("POST", "/api/v1/budgets", nrzBudgetBody(unique("Wrong rate"), { bitRate_bps: 10e9 }))
      ).json()
    ).id;
    const before = await rowCounts();
    const res = await designer.send("POST", "/api/v1/runs", { channelId: shortLane, budgetId: mismatched });
    expect(res.status).toBe(422);
    const { error } = await res.json();
    expect(error.path).toBe("budgetId");
    expect(error.message).toMatch(
      /bitRate_bps: 10\.0 Gb\/s does not match the channel's 28\.0 Gb\/s \(NRZ, UI 35\.7 ps\)/,
    );
    expect(error.message).not.toMatch(/\d{7,}/);
    const after = await rowCounts();
    expect([after.runs, after.jobs, after.audit_events]).toEqual([before.runs, before.jobs, before.audit_events]);
  });

  it("that is cancelled ends failed, says why on its page, and keeps its inputs", async () => {
    // A search of minutes (1 pre, 3 post taps at 0.02 over 13 CTLE settings): still computing when cancelled.
    const slow = await (
      await designer.send(
        "POST",
        "/api/v1/budgets",
        nrzBudgetBody(unique("Runs test slow"), {
          tx: { pre: 1, post: 3, step: 0.02 },
          ctle: { gDc_dB: [-12, 0, 1], fz_Hz: 7e9, fp1_Hz: 7e9, fp2_Hz: 28e9 },
        }),
      )
    ).json();
    const { id } = await (
      await designer.send("POST", "/api/v1/runs", { channelId: longLane, budgetId: slow.id })
    ).json();
    const cancelled = await designer.send("POST", `/api/v1/runs/${id}/cancel`);
    expect(cancelled.status, await cancelled.clone().text()).toBe(200);
    const end = await finished(designer, id);
    expect(end.status).toBe("failed");
    expect(end.error?.message).toMatch(/^Cancelled by Tomas Ekwueme\.$/);
    const run = await (await designer.get(`/api/v1/runs/${id}`)).json();
    expect(run.result).toBeNull();
    expect(run.error.message).toBe(end.error?.message);
    expect(run.inputs.channel.pulse.values_V.length).toBeGreaterThan(0);
    const page = await designer.get(`/runs/${id}`);
    expect(await page.text()).toContain("Cancelled by Tomas Ekwueme");
  });

  it("is refused up front when the channel or budget does not exist, leaving nothing behind", async () => {
    const before = await rowCounts();
    const noChannel = await designer.send("POST", "/api/v1/runs", { channelId: 999999, budgetId: nrzBudget });
    expect(noChannel.status).toBe(422);
    expect((await noChannel.json()).error).toMatchObject({ path: "channelId" });
    const noBudget = await designer.send("POST", "/api/v1/runs", { channelId: shortLane, budgetId: 999999 });
    expect(noBudget.status).toBe(422);
    const malformed = await designer.send("POST", "/api/v1/runs", { channelId: "seven" });
    expect(malformed.status).toBe(400);
    expect(await rowCounts()).toEqual(before);
    expect((await designer.get("/api/v1/runs/999999")).status).toBe(404);
  });
});

describe("two runs at once", () => {
  it("both finish, and the health route answers while they compute", async () => {
    const ids = await Promise.all(
      [longLane, shortLane].map(
        async (channelId) =>
          (await (await designer.send("POST", "/api/v1/runs", { channelId, budgetId: nrzBudget })).json()).id as number,
      ),
    );
    const health: number[] = [];
    let sawRunning = false;
    const done = Promise.all(ids.map((id) => finished(designer, id, 120_000)));
    let settled = false;
    void done.finally(() => (settled = true));
    while (!settled) {
      const h = await fetch(`${baseUrl}/api/v1/health`);
      health.push(h.status);
      const s = await (await designer.get(`/api/v1/runs/${ids[0]}?fields=status`)).json();
      if (s.status === "running") sawRunning = true;
      await new Promise((r) => setTimeout(r, 50));
    }
    const ends = await done;
    expect(ends.map((e) => e.status)).toEqual(["done", "done"]);
    expect(sawRunning).toBe(true);
    expect(health.length).toBeGreaterThan(3);
    expect(health.every((s) => s === 200)).toBe(true);
  });
});

describe("a finished run's detail", () => {
  it("is serialized and compressed once: the same bytes each time with an ETag, 304 when the client has them, brotli and gzip decoding to the JSON", async () => {
    const { id } = await (
      await designer.send("POST", "/api/v1/runs", { channelId: shortLane, budgetId: nrzBudget })
    ).json();
    await finished(designer, id);
    const plain = await designer.fetch(`/api/v1/runs/${id}`, { headers: { "accept-encoding": "identity" } });
    expect(plain.status).toBe(200);
    const etag = plain.headers.get("etag");
    expect(etag).toMatch(/^"[\w-]+"$/);
    const body = await plain.text();
    const view = JSON.parse(body);
    expect(view).toMatchObject({ id, status: "done" });
    expect(view.result).not.toBeNull();
    // Node's fetch decodes for us; ask through node:http to see the encoded bytes.
    const { request } = await import("node:http");
    const { brotliDecompressSync, gunzipSync } = await import("node:zlib");
    const raw = (encoding: string, extra: Record<string, string> = {}) =>
      new Promise<{ status: number; headers: Record<string, unknown>; bytes: Buffer }>((resolve, reject) => {
        const req = request(
          `${baseUrl}/api/v1/runs/${id}`,
          { headers: { cookie: designer.cookie, "accept-encoding": encoding, ...extra } },
          (res) => {
            const chunks: Buffer[] = [];
            res.on("data", (c: Buffer) => chunks.push(c));
            res.on("end", () =>
              resolve({ status: res.statusCode ?? 0, headers: res.headers, bytes: Buffer.concat(chunks) }),
            );
          },
        );
        req.on("error", reject);
        req.end();
      });
    const br = await raw("br, gzip");
    expect(br.headers["content-encoding"]).toBe("br");
    expect(br.headers.etag).toBe(etag);
    expect(brotliDecompressSync(br.bytes).toString()).toBe(body);
    expect(br.bytes.length).toBeLessThan(body.length / 2);
    const gz = await raw("gzip");
    expect(gz.headers["content-encoding"]).toBe("gzip");
    expect(gunzipSync(gz.bytes).toString()).toBe(body);
    const again = await raw("gzip", { "if-none-match": etag! });
    expect(again.status).toBe(304);
    expect(again.bytes.length).toBe(0);
  });
});

describe("deleting a channel that runs used", () => {
  it("asks first (409), then deletes; the runs keep their copy and can run again", async () => {
    const made = await (
      await designer.send("POST", "/api/v1/channels", {
        name: unique("Doomed lane"),
        bitRate_bps: 28e9,
        lossModel: { lossAtNyquist_dB: 8 },
      })
    ).json();
    const { id: runId } = await (
      await designer.send("POST", "/api/v1/runs", { channelId: made.id, budgetId: nrzBudget })
    ).json();
    await finished(designer, runId);
    // Read once before the delete: a detail served from stored bytes must not keep the old link.
    expect((await (await designer.get(`/api/v1/runs/${runId}`)).json()).channel).toEqual({
      id: made.id,
      name: made.name,
    });
    const refused = await designer.send("DELETE", `/api/v1/channels/${made.id}`);
    expect(refused.status).toBe(409);
    expect((await refused.json()).error.message).toMatch(/used by 1 tuning run.*confirm=true/);
    expect((await designer.get(`/api/v1/channels/${made.id}`)).status).toBe(200);
    const deleted = await designer.send("DELETE", `/api/v1/channels/${made.id}?confirm=true`);
    expect(await deleted.json()).toEqual({ id: made.id, deleted: true, runsKept: 1 });

    const run = await (await designer.get(`/api/v1/runs/${runId}`)).json();
    expect(run.channel).toEqual({ id: null, name: made.name });
    expect(run.status).toBe("done");
    expect(run.inputs.channel.pulse.values_V.length).toBeGreaterThan(0);
    const again = await (await designer.send("POST", `/api/v1/runs/${runId}/rerun`)).json();
    expect((await finished(designer, again.id)).status).toBe("done");
    const page = await designer.get(`/runs/${runId}`);
    expect(await page.text()).toContain("channel deleted; this run keeps its copy");
  });
});

describe("roles on the run routes", () => {
  it("everyone reads runs (also with an API token); only designers and admins start or re-run them", async () => {
    const ROLES: DemoRole[] = ["admin", "designer", "firmware", "reviewer"];
    for (const role of ROLES) {
      const c = await signIn(role);
      const writes = role === "admin" || role === "designer";
      expect((await c.get("/api/v1/runs")).status, role).toBe(200);
      expect((await c.get(`/api/v1/runs/${firstRun.id}`)).status, role).toBe(200);
      expect((await c.get(`/api/v1/runs/${firstRun.id}?fields=status`)).status, role).toBe(200);
      expect((await c.get(`/runs/${firstRun.id}`)).status, `${role} page`).toBe(200);
      const start = await c.send("POST", "/api/v1/runs", { channelId: shortLane, budgetId: nrzBudget });
      expect(start.status, `${role} POST`).toBe(writes ? 202 : 403);
      const again = await c.send("POST", `/api/v1/runs/${firstRun.id}/rerun`);
      expect(again.status, `${role} rerun`).toBe(writes ? 202 : 403);
      if (writes)
        await Promise.all(
          [(await start.json()).id, (await again.json()).id].map((id: number) => finished(designer, id)),
        );
    }
    for (const [method, path] of [
      ["GET", "/api/v1/runs"],
      ["POST", "/api/v1/runs"],
      ["GET", `/api/v1/runs/${firstRun.id}`],
      ["POST", `/api/v1/runs/${firstRun.id}/rerun`],
    ]) {
      expect((await anonymous().send(method, path)).status, `anonymous ${method} ${path}`).toBe(401);
    }
    const reviewer = await signIn("reviewer");
    const { secret } = await (await reviewer.send("POST", "/api/v1/tokens", { name: unique("run reader") })).json();
    const read = await fetch(`${baseUrl}/api/v1/runs/${firstRun.id}`, {
      headers: { authorization: `Bearer ${secret}` },
    });
    expect(read.status).toBe(200);
    const write = await fetch(`${baseUrl}/api/v1/runs`, {
      method: "POST",
      headers: { authorization: `Bearer ${secret}`, "content-type": "application/json" },
      body: JSON.stringify({ channelId: shortLane, budgetId: nrzBudget }),
    });
    expect(write.status).toBe(401);
  });
});
