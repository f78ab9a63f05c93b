// Budgets through the API against MariaDB: the engine's Budget schema on every write (defaults
// filled, messages naming the field), unique names, replace and delete, the role matrix.
import { afterAll, describe, expect, it } from "vitest";
import { anonymous, signIn, type DemoRole } from "../support/http";
import { closeDb, rowCounts, unique } from "../fixtures/workspace";

afterAll(closeDb);

const base = () => ({
  name: unique("Budget"),
  modulation: "nrz",
  bitRate_bps: 28e9,
  txSwing_Vppd: 0.8,
  noiseRms_V: 0.0015,
  limiterSensitivity_V: 0.015,
  ctle: { gDc_dB: [-12, 0, 1], fz_Hz: 7e9, fp1_Hz: 7e9, fp2_Hz: 28e9 },
  dfe: { taps: 3, limits_V: 0.1 },
});

describe("budgets", () => {
  it("creates a budget with the schema's defaults filled in, reads it back, lists it", async () => {
    const designer = await signIn("designer");
    const body = base();
    const res = await designer.send("POST", "/api/v1/budgets", body);
    expect(res.status).toBe(201);
    const b = await res.json();
    expect(b).toMatchObject({
      ...body,
      targetBer: 1e-12,
      inputNoiseRms_V: 0,
      requiredHeadroom_V: 0,
      tx: { pre: 1, post: 1 },
      clocking: { scheme: "recovered", policy: "centre" },
      createdBy: "Tomas Ekwueme",
    });
    expect(await (await designer.get(`/api/v1/budgets/${b.id}`)).json()).toMatchObject({
      id: b.id,
      name: body.name,
      runCount: 0,
    });
    const list = await (await designer.get("/api/v1/budgets")).json();
    expect(list.items.some((x: { id: number }) => x.id === b.id)).toBe(true);
    expect(list).toHaveProperty("nextCursor");
  });

  it("refuses what the engine would refuse, naming the field, and stores nothing", async () => {
    const designer = await signIn("designer");
    const before = await rowCounts();
    const cases: [Record<string, unknown>, string, RegExp][] = [
      [{ ...base(), txSwing_Vppd: -1 }, "txSwing_Vppd", /./],
      [{ ...base(), ctle: { gDc_dB: [0, -12, 1], fz_Hz: 7e9, fp1_Hz: 7e9, fp2_Hz: 28e9 } }, "ctle.gDc_dB", /min/],
      [{ ...base(), dfe: { taps: 2, limits_V: [0.1, 0.1, 0.1] } }, "dfe.limits_V", /one limit per DFE tap/],
      [{ ...base(), targetBer: 0.5 }, "targetBer", /at most 1e-2/],
      [{ ...base(), name: "  " }, "name", /name/],
      [{ ...base(), modulation: "qam16" }, "modulation", /nrz/],
    ];
    for (const [body, path, says] of cases) {
      const res = await designer.send("POST", "/api/v1/budgets", body);
      expect(res.status, path).toBe(400);
      const { error } = await res.json();
      expect(error.path).toBe(path);
      expect(error.message).toMatch(says);
    }
    const notJson = await designer.fetch("/api/v1/budgets", {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: "{oops",
    });
    expect(notJson.status).toBe(400);
    expect(await rowCounts()).toEqual(before);
  });

  it("names are unique (409); PUT replaces; DELETE removes", async () => {
    const designer = await signIn("designer");
    const a = await (await designer.send("POST", "/api/v1/budgets", base())).json();
    const b = base();
    const bRes = await (await designer.send("POST", "/api/v1/budgets", b)).json();
    const clash = await designer.send("POST", "/api/v1/budgets", { ...base(), name: a.name });
    expect(clash.status).toBe(409);
    expect((await clash.json()).error.message).toContain(a.name);
    const putClash = await designer.send("PUT", `/api/v1/budgets/${bRes.id}`, { ...b, name: a.name });
    expect(putClash.status).toBe(409);

    const put = await designer.send("PUT", `/api/v1/budgets/${a.id}`, {
      ...base(),
      name: a.name,
      modulation: "pam4",
      description: "now PAM4",
    });
    expect(put.status).toBe(200);
    expect(await put.json()).toMatchObject({ id: a.id, modulation: "pam4", description: "now PAM4" });
    expect((await designer.send("PUT", "/api/v1/budgets/999999", base())).status).toBe(404);

    expect((await designer.send("DELETE", `/api/v1/budgets/${a.id}`)).status).toBe(200);
    expect((await designer.get(`/api/v1/budgets/${a.id}`)).status).toBe(404);
    expect((await designer.get("/api/v1/budgets/abc")).status).toBe(400);
  });

  it("everyone reads; only designers and admins write; nobody anonymous", async () => {
    const ROLES: DemoRole[] = ["admin", "designer", "firmware", "reviewer"];
    const designer = await signIn("designer");
    const made = await (await designer.send("POST", "/api/v1/budgets", base())).json();
    for (const role of ROLES) {
      const c = await signIn(role);
      const writes = role === "admin" || role === "designer";
      expect((await c.get("/api/v1/budgets")).status, role).toBe(200);
      expect((await c.get(`/api/v1/budgets/${made.id}`)).status, role).toBe(200);
      const post = await c.send("POST", "/api/v1/budgets", base());
      expect(post.status, `${role} POST`).toBe(writes ? 201 : 403);
      const put = await c.send("PUT", `/api/v1/budgets/${made.id}`, { ...base(), name: made.name });
      expect(put.status, `${role} PUT`).toBe(writes ? 200 : 403);
      const target = writes ? (await post.json()).id : made.id;
      expect((await c.send("DELETE", `/api/v1/budgets/${target}`)).status, `${role} DELETE`).toBe(writes ? 200 : 403);
    }
    for (const [method, path] of [
      ["GET", "/api/v1/budgets"],
      ["POST", "/api/v1/budgets"],
      ["GET", `/api/v1/budgets/${made.id}`],
      ["PUT", `/api/v1/budgets/${made.id}`],
      ["DELETE", `/api/v1/budgets/${made.id}`],
    ]) {
      expect(
        (await anonymous().send(method, path, method === "GET" ? undefined : base())).status,
        `anonymous ${method} ${path}`,
      ).toBe(401);
    }
  });
});
