// Tap tables through the API against MariaDB: the role matrix, validation with messages that name
// the field, nothing half-written after a refusal, versions computed as jobs, codes on the register
// map's grid within its ranges, the minimax property, and a new version's diff.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { channelFor, evaluateSetting, resolveBudget, searchSpace } from "@lib/optimize";
import { pulseFromJson } from "@lib/pulse";
import { codeRange, decodeField, encodeField, type RegisterField } from "@lib/tapTables";
import { budgetForArchitecture } from "@/features/tapTables/architectureBudget";
import { anonymous, signIn, type Client } from "../support/http";
import { closeDb, rowCounts } from "../fixtures/workspace";
import { auditEvents, population, unique, versionComputed, type Population } from "./handoff.fixture";
import { budgetBody } from "../support/budget";

let designer: Client;
let admin: Client;
let pop: Population;

beforeAll(async () => {
  designer = await signIn("designer");
  admin = await signIn("admin");
  pop = await population(designer, [6, 10, 14, 18, 22, 26]);
});
afterAll(closeDb);

const manualArchitecture = {
  key: "tx-ctle-dfe2",
  label: "TX FIR + CTLE + DFE 2",
  tx: { pre: 0, post: 1 },
  ctle: true,
  dfeTaps: 2,
  ffe: null,
};

function tableRequest(extra: Record<string, unknown> = {}) {
  return {
    name: unique("Table"),
    budgetId: pop.budgetId,
    architecture: manualArchitecture,
    grouping: { mode: "loss-bins", edges_dB: [15], channelIds: pop.channelIds },
    ...extra,
  };
}

describe("tap tables: who may do what", () => {
  it("everyone reads; only designers and admins build; anonymous callers must sign in", async () => {
    expect((await anonymous().get("/api/v1/tap-tables")).status).toBe(401);
    for (const role of ["admin", "designer", "firmware", "reviewer"] as const) {
      expect((await (await signIn(role)).get("/api/v1/tap-tables")).status, role).toBe(200);
    }
    for (const role of ["firmware", "reviewer"] as const) {
      const c = await signIn(role);
      const res = await c.send("POST", "/api/v1/tap-tables", tableRequest());
      expect(res.status, role).toBe(403);
      expect((await res.json()).error.message).toMatch(/may not/);
      expect((await c.send("POST", "/api/v1/tap-tables/1/versions", {})).status, role).toBe(403);
      expect((await c.send("PUT", "/api/v1/tap-tables/1/versions/1", { note: "x" })).status, role).toBe(403);
    }
  });
});

describe("tap tables: refusals change nothing", () => {
  const cases: [string, () => Record<string, unknown>, number, string | RegExp][] = [
    ["a missing name", () => tableRequest({ name: "" }), 400, "name"],
    [
      "descending bin edges",
      () => tableRequest({ grouping: { mode: "loss-bins", edges_dB: [20, 10], channelIds: pop.channelIds } }),
      400,
      "grouping.edges_dB",
    ],
    [
      "a channel in two classes",
      () =>
        tableRequest({
          grouping: {
            mode: "manual",
            classes: [
              { name: "A", channelIds: [pop.channelIds[0]] },
              { name: "B", channelIds: [pop.channelIds[0]] },
            ],
          },
        }),
      400,
      "grouping.classes",
    ],
    ["neither architecture nor study", () => tableRequest({ architecture: undefined }), 400, "architecture"],
    ["an unknown budget", () => tableRequest({ budgetId: 999999 }), 404, /Budget 999999/],
    [
      "an unknown channel",
      () => tableRequest({ grouping: { mode: "loss-bins", edges_dB: [], channelIds: [999999] } }),
      404,
      /Channel 999999/,
    ],
    [
      "a register map without the CTLE field",
      () =>
        tableRequest({
          registerMap: [
            {
              name: "tx_main",
              parameter: "tx[0]",
              bits: 6,
              signed: false,
              lsb: 0.05,
              unit: "fraction",
              min: 0.5,
              max: 1,
            },
          ],
        }),
      422,
      "registerMap",
    ],
  ];
  for (const [what, body, status, path] of cases) {
    it(`${what} → ${status}`, async () => {
      const before = await rowCounts();
      const res = await designer.send("POST", "/api/v1/tap-tables", body());
      expect(res.status).toBe(status);
      const { error } = await res.json();
      expect(error.message.length).toBeGreaterThan(10);
      if (typeof path === "string") expect(error.path ?? "").toContain(path);
      else expect(error.message).toMatch(path);
      const after = await rowCounts();
      expect(after.jobs).toBe(before.jobs);
      expect(after.audit_events).toBe(before.audit_events);
    });
  }

  it("a budget whose bit rate does not fit the channels is refused before anything is queued (422)", async () => {
    const b = await designer.send("POST", "/api/v1/budgets", budgetBody(unique("Ten gig"), { bitRate_bps: 10.3125e9 }));
    expect(b.status).toBe(201);
    const budgetId = (await b.json()).id;
    const before = await rowCounts();
    const res = await designer.send("POST", "/api/v1/tap-tables", tableRequest({ budgetId }));
    expect(res.status).toBe(422);
    expect((await res.json()).error).toMatchObject({ path: "budgetId", message: expect.stringMatching(/bitRate_bps/) });
    const study = await designer.send("POST", "/api/v1/studies", { channelIds: pop.channelIds, budgetId });
    expect(study.status).toBe(422);
    expect((await rowCounts()).jobs).toBe(before.jobs);
  });

  it("a table name is taken only once (409)", async () => {
    const name = unique("Taken");
    const first = await designer.send("POST", "/api/v1/tap-tables", tableRequest({ name }));
    expect(first.status).toBe(202);
    const again = await designer.send("POST", "/api/v1/tap-tables", tableRequest({ name }));
    expect(again.status).toBe(409);
  });
});

describe("tap tables: computing versions", () => {
  it("v1 computes per class a default whose codes sit on the register map's grid and inside its ranges", async () => {
    const res = await designer.send("POST", "/api/v1/tap-tables", tableRequest());
    expect(res.status).toBe(202);
    const { id, version, status } = await res.json();
    expect({ version, status }).toEqual({ version: 1, status: "queued" });
    const v1 = await versionComputed(designer, id, 1);
    expect(v1.job.status, v1.job.error?.message).toBe("done");
    expect(v1.state).toBe("ready");
    expect(v1.result.classes.map((c: { name: string }) => c.name)).toEqual(["Loss < 15 dB", "Loss ≥ 15 dB"]);
    for (const c of v1.result.classes) {
      expect(c.channels).toHaveLength(3);
      expect(c.worstHeadroom_V).toBeCloseTo(
        Math.min(...c.channels.map((ch: { defaultHeadroom_V: number }) => ch.defaultHeadroom_V)),
        12,
      );
      for (const f of v1.inputs.registerMap) {
        const code = c.codes[f.name];
        const value = c.values[f.name];
        expect(Number.isInteger(code), `${c.name} ${f.name}`).toBe(true);
        expect(value).toBeCloseTo(code * f.lsb, 12);
        expect(value).toBeGreaterThanOrEqual(f.min - 1e-12);
        expect(value).toBeLessThanOrEqual(f.max + 1e-12);
        const lo = f.signed ? -(2 ** (f.bits - 1)) : 0;
        const hi = f.signed ? 2 ** (f.bits - 1) - 1 : 2 ** f.bits - 1;
        expect(code).toBeGreaterThanOrEqual(lo);
        expect(code).toBeLessThanOrEqual(hi);
      }
      for (const ch of c.channels) expect(ch.ownHeadroom_V).toBeGreaterThanOrEqual(ch.defaultHeadroom_V - 1e-9);
    }
    // The eyes of the worst channel come from the engine's tuning run of its class default: same headroom.
    const all = v1.result.classes.flatMap((c: { channels: { id: number; defaultHeadroom_V: number }[] }) => c.channels);
    const worst = all.reduce((a: { defaultHeadroom_V: number }, b: { defaultHeadroom_V: number }) =>
      b.defaultHeadroom_V < a.defaultHeadroom_V ? b : a,
    );
    expect(v1.result.worstEye.channelId).toBe(worst.id);
    expect(v1.result.worstEye.headroom_V).toBeCloseTo(worst.defaultHeadroom_V, 6);
    for (const eye of [v1.result.worstEye.before, v1.result.worstEye.after]) {
      expect(eye.image.counts).toHaveLength(eye.image.width * eye.image.height);
      expect(eye.contours.length).toBeGreaterThan(0);
    }
    const events = await auditEvents(admin, "table.");
    expect(events.some((e) => e.action === "table.create" && e.targetId === String(id))).toBe(true);
    expect(
      events.some((e) => e.action === "table.version" && e.targetId === String(id) && e.detail?.version === 1),
    ).toBe(true);
  });

  it("quantization round trips: codes → values → codes for every code of every field, and the stored defaults agree", async () => {
    const { id } = await (await designer.send("POST", "/api/v1/tap-tables", tableRequest())).json();
    const v1 = await versionComputed(designer, id, 1);
    const map = v1.inputs.registerMap as RegisterField[];
    for (const f of map) {
      const { lo, hi } = codeRange(f);
      expect(lo * f.lsb).toBeGreaterThanOrEqual(f.min - 1e-12);
      expect(hi * f.lsb).toBeLessThanOrEqual(f.max + 1e-12);
      for (let code = lo; code <= hi; code++)
        expect(encodeField(f, decodeField(f, code)), `${f.name} ${code}`).toBe(code);
      for (const c of v1.result.classes) {
        expect(encodeField(f, c.values[f.name])).toBe(c.codes[f.name]);
        expect(decodeField(f, c.codes[f.name])).toBeCloseTo(c.values[f.name], 15);
      }
    }
  });

  it("the minimax default is never worse for the worst channel than any single channel's own optimum applied to the class", async () => {
    const { id } = await (await designer.send("POST", "/api/v1/tap-tables", tableRequest())).json();
    const v1 = await versionComputed(designer, id, 1);
    const params = v1.inputs.budget.params;
    const budget = budgetForArchitecture(resolveBudget(params), v1.inputs.architecture);
    const dfe = v1.inputs.architecture.dfeTaps;
    for (const cls of v1.result.classes) {
      const members = await Promise.all(
        cls.channels.map(async (ch: { id: number }) => {
          const pulse = pulseFromJson((await (await designer.get(`/api/v1/channels/${ch.id}`)).json()).pulse);
          return { pulse, space: searchSpace(pulse, budget) };
        }),
      );
      for (const ch of cls.channels as {
        name: string;
        own: { tx: number[]; ctle: { gDc_dB: number; gDc2_dB: number } };
      }[]) {
        const worstWithOwn = Math.min(
          ...members.map(
            (m) =>
              evaluateSetting(channelFor(m.pulse, m.space, ch.own.ctle), m.space, ch.own.tx, dfe).limiterHeadroom_V,
          ),
        );
        expect(cls.worstHeadroom_V, `${cls.name}: ${ch.name}'s optimum on the whole class`).toBeGreaterThanOrEqual(
          worstWithOwn - 1e-9,
        );
      }
    }
  });

  it("an architecture with a receive FFE: the map holds its taps, the version computes, and it exports with them", async () => {
    const withFfe = {
      key: "ctle-ffe1-2-dfe1",
      label: "CTLE + RX FFE + DFE 1",
      tx: null,
      ctle: true,
      dfeTaps: 1,
      ffe: { pre: 1, post: 2 },
    };
    const res = await designer.send("POST", "/api/v1/tap-tables", tableRequest({ architecture: withFfe }));
    expect(res.status, await res.clone().text()).toBe(202);
    const { id } = await res.json();
    const v1 = await versionComputed(designer, id, 1);
    expect(v1.job.status, v1.job.error?.message).toBe("done");
    const map = v1.inputs.registerMap as RegisterField[];
    expect(map.filter((f) => f.parameter.startsWith("ffe[")).map((f) => [f.name, f.parameter])).toEqual([
      ["ffe_pre1", "ffe[-1]"],
      ["ffe_main", "ffe[0]"],
      ["ffe_post1", "ffe[1]"],
      ["ffe_post2", "ffe[2]"],
    ]);
    for (const c of v1.result.classes) {
      // The FFE's starting main tap sits near 1 (the design keeps the main cursor), on the map's grid.
      expect(c.values.ffe_main).toBeGreaterThan(0.5);
      expect(c.values.ffe_main).toBeCloseTo(c.codes.ffe_main * map.find((f) => f.name === "ffe_main")!.lsb, 12);
    }
    const csv = await designer.get(`/api/v1/tap-tables/${id}/versions/1/export?format=csv`);
    expect(csv.status).toBe(200);
    const header = (await csv.text()).split("\n")[0];
    for (const name of ["ffe_pre1", "ffe_main", "ffe_post2", "dfe_tap1"]) expect(header).toContain(name);
    const c = await designer.get(`/api/v1/tap-tables/${id}/versions/1/export?format=c`);
    expect(c.status).toBe(200);
    expect((await c.text()).toUpperCase()).toContain("FFE_MAIN");
  });

  it("a channel with aggressors: its crosstalk is in its headroom with the class default, and the page and report say how much", async () => {
    const found = await (await designer.get(`/api/v1/channels?q=${encodeURIComponent("Slot 9 lane 2")}`)).json();
    const bundleLane = found.items[0].id as number;
    const other = pop.byLoss.get(22)!;
    const res = await designer.send(
      "POST",
      "/api/v1/tap-tables",
      tableRequest({
        grouping: { mode: "manual", classes: [{ name: "Long lanes", channelIds: [bundleLane, other] }] },
      }),
    );
    expect(res.status, await res.clone().text()).toBe(202);
    const { id } = await res.json();
    const v1 = await versionComputed(designer, id, 1);
    expect(v1.job.status, v1.job.error?.message).toBe("done");
    const cls = v1.result.classes[0];
    const lane = cls.channels.find((c: { id: number }) => c.id === bundleLane);
    expect(lane.crosstalkRms_V).toBeGreaterThan(1e-4);
    expect(cls.channels.find((c: { id: number }) => c.id === other).crosstalkRms_V).toBeUndefined();
    // Independently: the class default's setting on that channel, with and without its aggressors.
    const detail = await (await designer.get(`/api/v1/channels/${bundleLane}`)).json();
    const pulse = pulseFromJson(detail.pulse);
    const budget = budgetForArchitecture(resolveBudget(v1.inputs.budget.params), v1.inputs.architecture);
    const space = searchSpace(pulse, budget);
    const aggressors = detail.aggressors.map((a: { name: string; kind: "next" | "fext"; pulse: never }) => ({
      name: a.name,
      kind: a.kind,
      pulse: pulseFromJson(a.pulse),
    }));
    const ctle = { gDc_dB: cls.values.ctle_gdc, gDc2_dB: 0 };
    const tx = [cls.values.tx_main, cls.values.tx_post1];
    const withXt = evaluateSetting(channelFor(pulse, space, ctle, aggressors), space, tx, 2).limiterHeadroom_V;
    const alone = evaluateSetting(channelFor(pulse, space, ctle), space, tx, 2).limiterHeadroom_V;
    expect(Math.abs(withXt - lane.defaultHeadroom_V)).toBeLessThan(2e-4);
    expect(alone).toBeGreaterThan(withXt + 1e-3);
    for (const path of [`/tables/${id}`, `/reports/tables/${id}/1`]) {
      const html = await (await designer.get(path)).text();
      expect(html, path).toContain("Crosstalk (default)");
      expect(html, path).toMatch(/\d+\.\d\d mV rms/);
    }
  });

  it("a new version with other bin edges shows the diff against the previous one", async () => {
    const { id } = await (await designer.send("POST", "/api/v1/tap-tables", tableRequest())).json();
    await versionComputed(designer, id, 1);
    const res = await designer.send("POST", `/api/v1/tap-tables/${id}/versions`, {
      edges_dB: [12, 20],
      note: "three classes",
    });
    expect(res.status).toBe(202);
    expect((await res.json()).version).toBe(2);
    const v2 = await versionComputed(designer, id, 2);
    expect(v2.job.status, v2.job.error?.message).toBe("done");
    expect(v2.note).toBe("three classes");
    expect(v2.result.classes.map((c: { name: string }) => c.name)).toEqual([
      "Loss < 12 dB",
      "Loss 12–20 dB",
      "Loss ≥ 20 dB",
    ]);
    expect(v2.diff.fromVersion).toBe(1);
    const statuses = Object.fromEntries(
      v2.diff.classes.map((c: { name: string; status: string }) => [c.name, c.status]),
    );
    expect(statuses).toMatchObject({
      "Loss < 12 dB": "added",
      "Loss 12–20 dB": "added",
      "Loss ≥ 20 dB": "added",
      "Loss < 15 dB": "removed",
      "Loss ≥ 15 dB": "removed",
    });
    expect(v2.diff.channels).toHaveLength(6);
    const moved = v2.diff.channels.find((c: { id: number }) => c.id === pop.byLoss.get(14));
    expect(moved).toMatchObject({ fromClass: "Loss < 15 dB", toClass: "Loss 12–20 dB" });
    // Per channel, the codes it gets change exactly where its old and new class defaults differ.
    const codesOf = (v: { result: { classes: { name: string; codes: Record<string, number> }[] } }, name: string) =>
      v.result.classes.find((c) => c.name === name)!.codes;
    const v1 = await (await designer.get(`/api/v1/tap-tables/${id}/versions/1`)).json();
    const changed = Object.keys(codesOf(v2, "Loss 12–20 dB")).filter(
      (f) => codesOf(v2, "Loss 12–20 dB")[f] !== codesOf(v1, "Loss < 15 dB")[f],
    );
    expect(moved.codes.map((c: { field: string }) => c.field).sort()).toEqual(changed.sort());

    // Same channels under a new name: matched, so its code changes show.
    const v3res = await designer.send("POST", `/api/v1/tap-tables/${id}/versions`, {
      grouping: {
        mode: "manual",
        classes: [
          { name: "Short", channelIds: [pop.byLoss.get(6), pop.byLoss.get(10)] },
          { name: "Long", channelIds: [14, 18, 22, 26].map((l) => pop.byLoss.get(l)) },
        ],
      },
    });
    expect(v3res.status).toBe(202);
    const v3 = await versionComputed(designer, id, 3);
    const short = v3.diff.classes.find((c: { name: string }) => c.name === "Short");
    expect(short).toMatchObject({ renamedFrom: "Loss < 12 dB", status: "same", codes: [] });
    const table = await (await designer.get(`/api/v1/tap-tables/${id}`)).json();
    expect(table.versions.map((v: { version: number }) => v.version)).toEqual([3, 2, 1]);
  });

  it("an edited register map recomputes the version; the edit is audited", async () => {
    const { id } = await (await designer.send("POST", "/api/v1/tap-tables", tableRequest())).json();
    const v1 = await versionComputed(designer, id, 1);
    const map = v1.inputs.registerMap.map((f: { name: string }) =>
      f.name === "ctle_gdc" ? { ...f, name: "rx_ctle_boost" } : f,
    );
    const res = await designer.send("PUT", `/api/v1/tap-tables/${id}/versions/1`, {
      registerMap: map,
      note: "silicon names",
    });
    expect(res.status).toBe(200);
    const again = await versionComputed(designer, id, 1);
    expect(again.state).toBe("ready");
    expect(again.note).toBe("silicon names");
    expect(Object.keys(again.result.classes[0].codes)).toContain("rx_ctle_boost");
    const events = await auditEvents(admin, "table.version-edit");
    expect(
      events.some((e) => e.targetId === String(id) && (e.detail?.registerMap as string[])?.includes("rx_ctle_boost")),
    ).toBe(true);
  });
});
