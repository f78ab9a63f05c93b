// Sign-off through the API: a designer asks a reviewer; the e-mails reach the fake SMTP server with
// the right recipients; comments thread; only the assigned reviewer (or an admin) decides; sending
// back needs a reason; approval freezes the version (409 on edits); every action is audited.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { anonymous, signIn, type Client } from "../support/http";
import { closeDb } from "../fixtures/workspace";
import { auditEvents, mailArrives, population, unique, versionComputed, type Population } from "./handoff.fixture";

let designer: Client;
let reviewer: Client;
let admin: Client;
let firmware: Client;
let pop: Population;
let reviewerId: string;
let adminId: string;

beforeAll(async () => {
  [designer, reviewer, admin, firmware] = await Promise.all([
    signIn("designer"),
    signIn("reviewer"),
    signIn("admin"),
    signIn("firmware"),
  ]);
  pop = await population(designer, [8, 16, 24]);
  reviewerId = (await (await reviewer.get("/api/v1/me")).json()).id;
  adminId = (await (await admin.get("/api/v1/me")).json()).id;
});
afterAll(closeDb);

/** A computed v1 of a fresh table. */
async function readyTable() {
  const res = await designer.send("POST", "/api/v1/tap-tables", {
    name: unique("Sign-off table"),
    budgetId: pop.budgetId,
    architecture: {
      key: "tx-ctle",
      label: "TX FIR + CTLE",
      tx: { pre: 0, post: 1 },
      ctle: true,
      dfeTaps: 0,
      ffe: null,
    },
    grouping: { mode: "manual", classes: [{ name: "Backplane", channelIds: pop.channelIds }] },
  });
  expect(res.status).toBe(202);
  const { id } = await res.json();
  const v = await versionComputed(designer, id, 1);
  expect(v.job.status, v.job.error?.message).toBe("done");
  return { id, name: v.table.name as string };
}

describe("sign-off: who may do what", () => {
  it("everyone reads sign-offs and reviewers; anonymous callers must sign in", async () => {
    for (const path of ["/api/v1/sign-offs", "/api/v1/sign-offs/reviewers", "/api/v1/sign-offs?state=pending&mine=1"]) {
      expect((await anonymous().get(path)).status, path).toBe(401);
      for (const c of [designer, reviewer, admin, firmware]) expect((await c.get(path)).status, path).toBe(200);
    }
    expect((await anonymous().send("POST", "/api/v1/sign-offs/1/comments", { body: "x" })).status).toBe(401);
    expect((await anonymous().send("POST", "/api/v1/sign-offs/1/decision", { decision: "approve" })).status).toBe(401);
    expect((await reviewer.get("/api/v1/sign-offs/999999")).status).toBe(404);
  });
});

describe("sign-off", () => {
  it("request → e-mail to the reviewer; comments thread; approval → e-mail to the designer, version frozen; all audited", async () => {
    const t = await readyTable();
    const reviewers = await (await designer.get("/api/v1/sign-offs/reviewers")).json();
    expect(reviewers.items.map((r: { email: string }) => r.email)).toEqual(
      expect.arrayContaining(["reviewer@tapwright.test", "admin@tapwright.test"]),
    );

    const req = await designer.send("POST", `/api/v1/tap-tables/${t.id}/versions/1/sign-off`, {
      reviewerId,
      message: "Worst lane is the 24 dB one.",
    });
    expect(req.status).toBe(201);
    const { id, state } = await req.json();
    expect(state).toBe("pending");
    const asked = await mailArrives(admin, "reviewer@tapwright.test", `Sign-off requested: ${t.name} v1`);
    expect(asked.to).toEqual(["reviewer@tapwright.test"]);
    expect(asked.text).toContain(`/sign-off/${id}`);
    expect(asked.text).toContain("Worst lane is the 24 dB one.");

    const version = await (await designer.get(`/api/v1/tap-tables/${t.id}/versions/1`)).json();
    expect(version.state).toBe("in-review");
    expect((await designer.send("POST", `/api/v1/tap-tables/${t.id}/versions/1/sign-off`, { reviewerId })).status).toBe(
      409,
    );

    const detail = await (await reviewer.get(`/api/v1/sign-offs/${id}`)).json();
    expect(detail).toMatchObject({
      state: "pending",
      version: 1,
      reviewer: { email: "reviewer@tapwright.test" },
      requestedBy: { email: "designer@tapwright.test" },
    });
    expect(detail.classes[0].channels).toHaveLength(3);
    expect(detail.requiredHeadroom_V).toBeCloseTo(0.005, 12);

    const q = await reviewer.send("POST", `/api/v1/sign-offs/${id}/comments`, {
      body: "Why is the 24 dB lane so close?",
      channelName: `${detail.classes[0].channels[2].name}`,
    });
    expect(q.status).toBe(201);
    const question = await q.json();
    const a = await designer.send("POST", `/api/v1/sign-offs/${id}/comments`, {
      body: "Longest trace; lab has it at the same margin.",
      parentId: question.id,
    });
    expect(a.status).toBe(201);
    const fw = await firmware.send("POST", `/api/v1/sign-offs/${id}/comments`, {
      body: "Firmware can take it either way.",
    });
    expect(fw.status).toBe(201);
    expect(
      (await designer.send("POST", `/api/v1/sign-offs/${id}/comments`, { body: "x", channelName: "No such lane" }))
        .status,
    ).toBe(422);
    const thread = await (await reviewer.get(`/api/v1/sign-offs/${id}/comments`)).json();
    expect(thread.items.map((c: { parentId: number | null }) => c.parentId)).toEqual([null, question.id, null]);

    expect((await designer.send("POST", `/api/v1/sign-offs/${id}/decision`, { decision: "approve" })).status).toBe(403);
    expect((await firmware.send("POST", `/api/v1/sign-offs/${id}/decision`, { decision: "approve" })).status).toBe(403);
    const ok = await reviewer.send("POST", `/api/v1/sign-offs/${id}/decision`, {
      decision: "approve",
      comment: "Margins checked against the lab sheet.",
    });
    expect(ok.status).toBe(200);
    expect((await ok.json()).state).toBe("approved");
    const done = await mailArrives(admin, "designer@tapwright.test", `Signed off: ${t.name} v1`);
    expect(done.to).toEqual(["designer@tapwright.test"]);
    expect(done.text).toContain("Margins checked against the lab sheet.");
    expect(
      (
        await reviewer.send("POST", `/api/v1/sign-offs/${id}/decision`, {
          decision: "reject",
          comment: "changed my mind",
        })
      ).status,
    ).toBe(409);

    const frozen = await (await designer.get(`/api/v1/tap-tables/${t.id}/versions/1`)).json();
    expect(frozen.state).toBe("approved");
    expect(frozen.frozenAt).not.toBeNull();
    const edit = await designer.send("PUT", `/api/v1/tap-tables/${t.id}/versions/1`, { note: "sneaky edit" });
    expect(edit.status).toBe(409);
    expect((await edit.json()).error.message).toMatch(/frozen/);
    const remap = await designer.send("PUT", `/api/v1/tap-tables/${t.id}/versions/1`, {
      registerMap: frozen.inputs.registerMap.map((f: { name: string }) => ({ ...f, name: `${f.name}_x` })),
    });
    expect(remap.status).toBe(409);
    expect((await designer.send("POST", `/api/v1/tap-tables/${t.id}/versions/1/sign-off`, { reviewerId })).status).toBe(
      409,
    );
    const after = await (await designer.get(`/api/v1/tap-tables/${t.id}/versions/1`)).json();
    expect(after.note).toBeNull();
    expect(after.result).toEqual(frozen.result);

    const events = await auditEvents(admin, "signoff.");
    const mine = events.filter((e) => e.targetId === String(id)).map((e) => e.action);
    expect(mine.filter((a) => a === "signoff.comment")).toHaveLength(3);
    expect(mine).toEqual(expect.arrayContaining(["signoff.request", "signoff.decision"]));
  });

  it("sending back needs a reason; the designer is told why; the version may be asked again", async () => {
    const t = await readyTable();
    const { id } = await (
      await designer.send("POST", `/api/v1/tap-tables/${t.id}/versions/1/sign-off`, { reviewerId })
    ).json();
    const bare = await reviewer.send("POST", `/api/v1/sign-offs/${id}/decision`, { decision: "reject" });
    expect(bare.status).toBe(400);
    expect((await bare.json()).error.path).toBe("comment");
    const back = await reviewer.send("POST", `/api/v1/sign-offs/${id}/decision`, {
      decision: "reject",
      comment: "Split the backplane class at 16 dB.",
    });
    expect(back.status).toBe(200);
    const mail = await mailArrives(admin, "designer@tapwright.test", `Sent back: ${t.name} v1`);
    expect(mail.text).toContain("Split the backplane class at 16 dB.");
    const v = await (await designer.get(`/api/v1/tap-tables/${t.id}/versions/1`)).json();
    expect(v.state).toBe("changes-requested");
    expect(
      (await designer.send("PUT", `/api/v1/tap-tables/${t.id}/versions/1`, { note: "answered in the thread" })).status,
    ).toBe(200);
    const again = await designer.send("POST", `/api/v1/tap-tables/${t.id}/versions/1/sign-off`, {
      reviewerId: adminId,
    });
    expect(again.status).toBe(201);
    await mailArrives(admin, "admin@tapwright.test", `Sign-off requested: ${t.name} v1`);
    const decisions = await auditEvents(admin, "signoff.decision");
    expect(decisions.some((e) => e.targetId === String(id) && e.detail?.decision === "reject")).toBe(true);
  });

  it("refuses reviewers who cannot decide, self-review, and requests from roles that may not ask", async () => {
    const t = await readyTable();
    const fwId = (await (await firmware.get("/api/v1/me")).json()).id;
    const res = await designer.send("POST", `/api/v1/tap-tables/${t.id}/versions/1/sign-off`, { reviewerId: fwId });
    expect(res.status).toBe(422);
    expect((await res.json()).error.path).toBe("reviewerId");
    expect(
      (await admin.send("POST", `/api/v1/tap-tables/${t.id}/versions/1/sign-off`, { reviewerId: adminId })).status,
    ).toBe(422);
    expect((await firmware.send("POST", `/api/v1/tap-tables/${t.id}/versions/1/sign-off`, { reviewerId })).status).toBe(
      403,
    );
    expect((await reviewer.send("POST", `/api/v1/tap-tables/${t.id}/versions/1/sign-off`, { reviewerId })).status).toBe(
      403,
    );
  });
});
