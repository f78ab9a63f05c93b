// Architecture studies through the API: the role matrix, validation, a study from queued to done
// with per-candidate worst-case and median headroom and complexity, the decision record (kept with
// the study, copied into tap tables built on it, shown to reviewers), and the audit trail.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { anonymous, signIn, type Client } from "../support/http";
import { closeDb } from "../fixtures/workspace";
import { auditEvents, population, studyFinished, unique, versionComputed, type Population } from "./handoff.fixture";

let designer: Client;
let admin: Client;
let pop: Population;

beforeAll(async () => {
  [designer, admin] = await Promise.all([signIn("designer"), signIn("admin")]);
  pop = await population(designer, [8, 16, 24, 32]);
});
afterAll(closeDb);

interface Candidate {
  key: string;
  complexity: number;
  worstHeadroom_V: number;
  medianHeadroom_V: number;
  worstChannel: { id: number; name: string };
  channels: { id: number; headroom_V: number }[];
}

describe("architecture studies", () => {
  it("everyone reads; designers and admins start them; anonymous callers must sign in", async () => {
    expect((await anonymous().get("/api/v1/studies")).status).toBe(401);
    for (const role of ["firmware", "reviewer"] as const) {
      const c = await signIn(role);
      expect((await c.get("/api/v1/studies")).status).toBe(200);
      expect(
        (await c.send("POST", "/api/v1/studies", { channelIds: pop.channelIds, budgetId: pop.budgetId })).status,
      ).toBe(403);
      expect(
        (await c.send("PUT", "/api/v1/studies/1/decision", { candidateKey: "ctle", rationale: "x".repeat(30) })).status,
      ).toBe(403);
    }
  });

  it("refuses what it cannot study, naming the field", async () => {
    const empty = await designer.send("POST", "/api/v1/studies", { channelIds: [], budgetId: pop.budgetId });
    expect(empty.status).toBe(400);
    expect((await empty.json()).error.path).toBe("channelIds");
    expect(
      (await designer.send("POST", "/api/v1/studies", { channelIds: pop.channelIds, budgetId: 999999 })).status,
    ).toBe(404);
    const twice = await designer.send("POST", "/api/v1/studies", {
      channelIds: pop.channelIds,
      budgetId: pop.budgetId,
      candidates: [
        { key: "a", label: "A", tx: null, ctle: true, dfeTaps: 0, ffe: null },
        { key: "a", label: "A again", tx: null, ctle: true, dfeTaps: 1, ffe: null },
      ],
    });
    expect(twice.status).toBe(400);
    expect((await twice.json()).error.path).toBe("candidates");
  });

  it("a study compares the usual candidates; the decision is recorded, audited and carried into a tap table", async () => {
    const name = unique("Backplane study");
    const res = await designer.send("POST", "/api/v1/studies", {
      name,
      channelIds: pop.channelIds,
      budgetId: pop.budgetId,
    });
    expect(res.status).toBe(202);
    const { id, status } = await res.json();
    expect(status).toBe("queued");
    const s = await studyFinished(designer, id);
    expect(s.status, s.error?.message).toBe("done");
    expect(s.progress).toBe(1);
    const cs = s.result.candidates as Candidate[];
    expect(cs.map((c) => c.key)).toEqual(["ctle", "tx-ctle", "tx-ctle-dfe1", "tx-ctle-dfe2", "ctle-ffe"]);
    for (const c of cs) {
      expect(c.channels).toHaveLength(4);
      const hs = c.channels.map((ch) => ch.headroom_V).sort((a, b) => a - b);
      expect(c.worstHeadroom_V).toBeCloseTo(hs[0], 12);
      expect(c.medianHeadroom_V).toBeCloseTo((hs[1] + hs[2]) / 2, 12);
      expect(c.worstHeadroom_V).toBeLessThanOrEqual(c.medianHeadroom_V);
      expect(c.worstChannel.id).toBe(c.channels.find((ch) => ch.headroom_V === hs[0])!.id);
    }
    const by = Object.fromEntries(cs.map((c) => [c.key, c]));
    expect(by["ctle"].complexity).toBeLessThan(by["tx-ctle"].complexity);
    expect(by["tx-ctle-dfe2"].complexity).toBe(by["tx-ctle-dfe1"].complexity + 1);
    expect(by["ctle-ffe"].complexity).toBe(5);
    // The longest channel is the worst one for a linear-only candidate.
    expect(by["tx-ctle"].worstChannel.id).toBe(pop.byLoss.get(32));

    const unknown = await designer.send("PUT", `/api/v1/studies/${id}/decision`, {
      candidateKey: "nope",
      rationale: "A long enough rationale for the test.",
    });
    expect(unknown.status).toBe(422);
    const short = await designer.send("PUT", `/api/v1/studies/${id}/decision`, {
      candidateKey: "tx-ctle-dfe2",
      rationale: "cheap",
    });
    expect(short.status).toBe(400);
    expect((await short.json()).error.path).toBe("rationale");
    const rationale = "Two DFE taps keep the 32 dB lane above the required headroom; a third buys under a millivolt.";
    const decided = await designer.send("PUT", `/api/v1/studies/${id}/decision`, {
      candidateKey: "tx-ctle-dfe2",
      rationale,
    });
    expect(decided.status).toBe(200);
    const view = await decided.json();
    expect(view.decision).toMatchObject({
      candidateKey: "tx-ctle-dfe2",
      candidateLabel: "TX FIR + CTLE + DFE 2",
      rationale,
      decidedBy: "Tomas Ekwueme",
    });

    const list = await (await designer.get("/api/v1/studies")).json();
    expect(list.items.find((x: { id: number }) => x.id === id)).toMatchObject({
      name,
      status: "done",
      decision: { candidateKey: "tx-ctle-dfe2" },
    });

    const t = await designer.send("POST", "/api/v1/tap-tables", {
      name: unique("From the study"),
      budgetId: pop.budgetId,
      studyId: id,
      grouping: { mode: "loss-bins", edges_dB: [20], channelIds: pop.channelIds },
    });
    expect(t.status).toBe(202);
    const tableId = (await t.json()).id;
    const v1 = await versionComputed(designer, tableId, 1);
    expect(v1.inputs.architecture.key).toBe("tx-ctle-dfe2");
    expect(v1.inputs.study).toMatchObject({
      id,
      decision: { candidateKey: "tx-ctle-dfe2", rationale, decidedBy: "Tomas Ekwueme" },
    });
    expect(v1.inputs.registerMap.map((f: { name: string }) => f.name)).toEqual([
      "tx_main",
      "tx_post1",
      "ctle_gdc",
      "dfe_tap1",
      "dfe_tap2",
    ]);

    const events = await auditEvents(admin, "study.");
    expect(events.filter((e) => e.targetId === String(id)).map((e) => e.action)).toEqual(
      expect.arrayContaining(["study.start", "study.decide"]),
    );
  });

  it("a table cannot follow a study that has no decision yet (422)", async () => {
    const { id } = await (
      await designer.send("POST", "/api/v1/studies", {
        channelIds: pop.channelIds.slice(0, 2),
        budgetId: pop.budgetId,
        candidates: [{ key: "ctle", label: "CTLE only", tx: null, ctle: true, dfeTaps: 0, ffe: null }],
      })
    ).json();
    const res = await designer.send("POST", "/api/v1/tap-tables", {
      name: unique("Too early"),
      budgetId: pop.budgetId,
      studyId: id,
      grouping: { mode: "loss-bins", edges_dB: [], channelIds: pop.channelIds },
    });
    expect(res.status).toBe(422);
    expect((await res.json()).error.path).toBe("studyId");
  });
});
