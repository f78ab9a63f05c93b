// Tap table versions that take a sweep's corners: each class default maximizes the worst headroom
// over its channels and corners, every channel is shown at its worst corner (the table page, the
// sign-off page, the JSON export), its own optimum at each corner equals the sweep's pair (another
// job, another code path), and a later version can drop the corners again.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eventually, signIn, type Client } from "../support/http";
import { closeDb, unique } from "../fixtures/workspace";
import { population, versionComputed, type Population } from "./handoff.fixture";
import { budget } from "../support/budget";

let designer: Client;
let pop: Population;
let sweepId: number;
let sweep: {
  corners: { name: string }[];
  results: { channelId: number; cornerIndex: number; limiterHeadroom_V: number }[];
};

const corners = [
  { name: "nominal" },
  { name: "loss +15 %", lossScale: 1.15 },
  { name: "slow", txSwingScale: 0.9, noiseScale: 1.2, sensitivityScale: 1.2 },
];
// The budget's own architecture, so the table's own optima are the sweep's pairs.
const architecture = {
  key: "tx0-1-ctle-dfe2",
  label: "TX FIR 0/1 · CTLE · DFE 2",
  tx: { pre: 0, post: 1 },
  ctle: true,
  dfeTaps: 2,
  ffe: null,
};

interface Channel {
  id: number;
  name: string;
  defaultHeadroom_V: number;
  ownHeadroom_V: number;
  worstCorner?: string;
  corners?: { name: string; defaultHeadroom_V: number; ownHeadroom_V: number }[];
}

beforeAll(async () => {
  designer = await signIn("designer");
  pop = await population(designer, [10, 20, 28]);
  const r = await designer.send("POST", "/api/v1/sweeps", {
    name: unique("Corners for a table"),
    channelIds: pop.channelIds,
    budgetId: pop.budgetId,
    corners,
  });
  sweepId = (await r.json()).id;
  sweep = await eventually(
    async () => {
      const s = await (await designer.get(`/api/v1/sweeps/${sweepId}`)).json();
      return s.status === "done" ? s : undefined;
    },
    180_000,
    "the sweep",
  );
}, 240_000);
afterAll(closeDb);

describe("tap tables at a sweep's corners", () => {
  it("holds each class default at every corner; shows each channel's worst corner; own optima equal the sweep's pairs", async () => {
    const res = await designer.send("POST", "/api/v1/tap-tables", {
      name: unique("Cornered table"),
      budgetId: pop.budgetId,
      architecture,
      grouping: { mode: "loss-bins", channelIds: pop.channelIds, edges_dB: [15] },
      sweepId,
    });
    expect(res.status).toBe(202);
    const { id } = await res.json();
    const v1 = await versionComputed(designer, id, 1, 240_000);
    expect(v1.job.status, v1.job.error?.message).toBe("done");
    expect(v1.inputs.sweep).toMatchObject({ id: sweepId });
    expect(v1.inputs.corners.map((c: { name: string }) => c.name)).toEqual(corners.map((c) => c.name));
    for (const cls of v1.result.classes as { worstHeadroom_V: number; channels: Channel[] }[]) {
      expect(cls.worstHeadroom_V).toBe(Math.min(...cls.channels.map((c) => c.defaultHeadroom_V)));
      for (const ch of cls.channels) {
        expect(ch.corners).toHaveLength(3);
        const worst = ch.corners!.reduce((a, b) => (b.defaultHeadroom_V < a.defaultHeadroom_V ? b : a));
        expect(ch.worstCorner).toBe(worst.name);
        expect(ch.defaultHeadroom_V).toBe(worst.defaultHeadroom_V);
        ch.corners!.forEach((c, k) => {
          expect(c.ownHeadroom_V).toBeGreaterThanOrEqual(c.defaultHeadroom_V - 1e-12);
          const pair = sweep.results.find((p) => p.channelId === ch.id && p.cornerIndex === k)!;
          expect(c.ownHeadroom_V, `${ch.name} at ${c.name}`).toBeCloseTo(pair.limiterHeadroom_V, 12);
        });
      }
    }
    const page = await (await designer.get(`/tables/${id}?v=1`)).text();
    expect(page).toContain("Worst corner");
    expect(page).toContain('data-testid="worst-corner"');
    const json = await (await designer.get(`/api/v1/tap-tables/${id}/versions/1/export?format=json`)).json();
    expect(json.corners.map((c: { name: string }) => c.name)).toEqual(corners.map((c) => c.name));
    expect(json.classes[0].channels[0].worstCorner).toBeDefined();
    // The fan-out left one job per channel and per class under the version's job, all done.
    const worstEye = v1.result.worstEye as { corner?: string; headroom_V: number };
    expect(corners.map((c) => c.name)).toContain(worstEye.corner);

    // A new version without corners is computed at nominal only.
    const v2res = await designer.send("POST", `/api/v1/tap-tables/${id}/versions`, {
      sweepId: null,
      note: "nominal only",
    });
    expect(v2res.status).toBe(202);
    const v2 = await versionComputed(designer, id, 2, 240_000);
    expect(v2.inputs.corners).toBeNull();
    expect(v2.result.classes[0].channels[0].worstCorner).toBeUndefined();
    // At nominal alone the defaults leave at least as much on the worst channel as over every corner.
    const worst = (v: { result: { classes: { worstHeadroom_V: number }[] } }) =>
      Math.min(...v.result.classes.map((c) => c.worstHeadroom_V));
    expect(worst(v2)).toBeGreaterThanOrEqual(worst(v1));
  });

  it("refuses a sweep that does not exist, and corners that take this budget out of range", async () => {
    const base = {
      name: unique("Refused"),
      budgetId: pop.budgetId,
      architecture,
      grouping: { mode: "loss-bins", channelIds: pop.channelIds, edges_dB: [15] },
    };
    expect((await designer.send("POST", "/api/v1/tap-tables", { ...base, sweepId: 999999 })).status).toBe(404);
    const shaky = await designer.send("POST", "/api/v1/budgets", {
      ...budget(),
      name: unique("Shaky"),
      jitter: { rjRms_UI: 0.2, djPp_UI: 0.05 },
    });
    const wild = await designer.send("POST", "/api/v1/sweeps", {
      name: unique("Wild"),
      channelIds: pop.channelIds,
      budgetId: pop.budgetId,
      corners: [{ name: "nominal" }, { name: "jittery", jitterScale: 3 }],
    });
    const wildId = (await wild.json()).id;
    const r = await designer.send("POST", "/api/v1/tap-tables", {
      ...base,
      name: unique("Too shaky"),
      budgetId: (await shaky.json()).id,
      sweepId: wildId,
    });
    expect(r.status).toBe(422);
    expect((await r.json()).error.path).toBe("sweepId");
  });
});
