// What an attacker or a careless client tries, and the answer each gets: oversized bodies (413 before
// buffering), a sign-in redirect off-site, a sign-off decided by its own requester, a non-Latin file
// name on download, guessing one account's password from many addresses, hammering invitation
// links, and reading invitation secrets out of the mail outbox.
import { createHash } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { anonymous, baseUrl, eventually, signIn, signInRaw, type Client } from "../support/http";
import { freePort, startServer } from "../support/server";
import { closeDb, unique, upload } from "../fixtures/workspace";
import { BIT_RATE, files } from "../fixtures/channelFiles";
import { population, studyFinished, versionComputed, type Population } from "./handoff.fixture";

let designer: Client;
let admin: Client;
let reviewer: Client;
let pop: Population;

beforeAll(async () => {
  [designer, admin, reviewer] = await Promise.all([signIn("designer"), signIn("admin"), signIn("reviewer")]);
  pop = await population(designer, [8, 16]);
});
afterAll(closeDb);

const MB100 = 100 * 1024 * 1024;

/** Sends `bytes` bytes of body (declared or chunked) and returns the status and the JSON answer. */
async function sendLarge(path: string, client: Client, o: { bytes: number; chunked?: boolean; type?: string }) {
  const chunk = new Uint8Array(1024 * 1024).fill(0x20);
  let sent = 0;
  const body = o.chunked
    ? new ReadableStream<Uint8Array>({
        pull(ctrl) {
          if (sent >= o.bytes) return ctrl.close();
          sent += chunk.length;
          ctrl.enqueue(chunk);
        },
      })
    : new Uint8Array(o.bytes).fill(0x20);
  const res = await client.fetch(path, {
    method: "POST",
    body,
    headers: { "content-type": o.type ?? "application/json" },
    duplex: "half",
  } as RequestInit);
  return { status: res.status, body: await res.json() };
}

describe("request bodies are capped before they are buffered", () => {
  it("a 100 MB JSON body gets 413 in the error shape, declared or chunked", async () => {
    const declared = await sendLarge("/api/v1/budgets", designer, { bytes: MB100 });
    expect(declared.status).toBe(413);
    expect(declared.body.error.message).toMatch(/64 KiB/);
    const chunked = await sendLarge("/api/v1/budgets", designer, { bytes: 2 * 1024 * 1024, chunked: true });
    expect(chunked.status).toBe(413);
  });

  it("the public routes too: sign-in and accepting an invitation", async () => {
    expect((await sendLarge("/api/auth/sign-in/email", anonymous(), { bytes: MB100 })).status).toBe(413);
    expect(
      (await sendLarge("/api/auth/sign-in/email", anonymous(), { bytes: 1024 * 1024, chunked: true })).status,
    ).toBe(413);
    expect((await sendLarge("/api/v1/invitations/abc/accept", anonymous(), { bytes: MB100 })).status).toBe(413);
  });

  it("an upload above the upload limit gets 413 naming the limit", async () => {
    const big = await sendLarge("/api/v1/channels", designer, {
      bytes: MB100,
      type: "multipart/form-data; boundary=x",
    });
    expect(big.status).toBe(413);
    expect(big.body.error.message).toMatch(/50(\.0)? MiB/);
  });
});

describe("the sign-in redirect stays on this site", () => {
  it("next that leaves the origin (backslash, scheme-relative, absolute) goes to the overview instead", async () => {
    for (const next of [
      "/%5Cevil.example",
      "/%5C%5Cevil.example",
      "//evil.example",
      "https://evil.example/x",
      "javascript:alert(1)",
      "/\t/evil.example",
    ]) {
      const res = await designer.get(`/sign-in?next=${next}`);
      expect(res.status, next).toBe(302);
      const location = res.headers.get("location")!;
      expect(new URL(location, baseUrl).origin, `${next} → ${location}`).toBe(new URL(baseUrl).origin);
      expect(location, next).toBe("/");
    }
  });

  it("a path on this site is kept, with its query", async () => {
    const res = await designer.get(`/sign-in?next=${encodeURIComponent("/runs?limit=5")}`);
    expect(res.headers.get("location")).toBe("/runs?limit=5");
  });
});

describe("four eyes on sign-off", () => {
  it("the requester may not decide their own sign-off, admins included, and is told why", async () => {
    const res = await admin.send("POST", "/api/v1/tap-tables", {
      name: unique("Four eyes"),
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
    expect((await versionComputed(admin, id, 1)).job.status).toBe("done");
    const reviewerId = (await (await reviewer.get("/api/v1/me")).json()).id;
    const so = await (await admin.send("POST", `/api/v1/tap-tables/${id}/versions/1/sign-off`, { reviewerId })).json();
    const own = await admin.send("POST", `/api/v1/sign-offs/${so.id}/decision`, {
      decision: "approve",
      comment: "fine by me",
    });
    expect(own.status).toBe(403);
    expect((await own.json()).error.message).toMatch(/you asked for this sign-off.*someone else/i);
    expect(
      (await reviewer.send("POST", `/api/v1/sign-offs/${so.id}/decision`, { decision: "approve", comment: "checked" }))
        .status,
    ).toBe(200);
  });

  it("the version's author may not be asked to decide it", async () => {
    const res = await admin.send("POST", "/api/v1/tap-tables", {
      name: unique("Author"),
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
    expect((await versionComputed(admin, id, 1)).job.status).toBe("done");
    const adminId = (await (await admin.get("/api/v1/me")).json()).id;
    const ask = await designer.send("POST", `/api/v1/tap-tables/${id}/versions/1/sign-off`, { reviewerId: adminId });
    expect(ask.status).toBe(422);
    expect((await ask.json()).error).toMatchObject({
      path: "reviewerId",
      message: expect.stringMatching(/built this version/),
    });
  });
});

describe("original-file downloads", () => {
  it("通道.s2p uploads and downloads: octet-stream, nosniff, an ASCII filename and the exact one as filename*", async () => {
    const body = files.s2p(12);
    const created = await upload(designer, "/api/v1/channels", "通道.s2p", body, {
      name: unique("Non-Latin"),
      bitRate_bps: String(BIT_RATE),
    });
    expect(created.status).toBe(201);
    const { id } = await created.json();
    const res = await designer.get(`/api/v1/channels/${id}/original`);
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toBe("application/octet-stream");
    expect(res.headers.get("x-content-type-options")).toBe("nosniff");
    const disposition = res.headers.get("content-disposition")!;
    expect(disposition).toMatch(/^attachment; filename="[\x20-\x7e]+"; filename\*=UTF-8''%E9%80%9A%E9%81%93\.s2p$/);
    expect(
      createHash("sha256")
        .update(Buffer.from(await res.arrayBuffer()))
        .digest("hex"),
    ).toBe(createHash("sha256").update(body).digest("hex"));
  });
});

describe("guessing", () => {
  it("failed sign-ins are counted per account: after five, even the right password waits (429)", async () => {
    const email = `${unique("guess").replace(/\W+/g, "-")}@tapwright.test`;
    const inv = await (await admin.send("POST", "/api/v1/invitations", { email, role: "firmware" })).json();
    const token = inv.link.split("/invite/")[1];
    expect(
      (
        await anonymous().send("POST", `/api/v1/invitations/${token}/accept`, {
          name: "Guess Target",
          password: "the-right-password",
        })
      ).status,
    ).toBe(201);
    for (let i = 0; i < 5; i++) expect((await signInRaw(email, `wrong-password-${i}`)).status).toBe(401);
    const right = await signInRaw(email, "the-right-password");
    expect(right.status).toBe(429);
    expect(JSON.stringify(await right.json())).toMatch(/account/);
  });

  it("accepting invitations is rate limited per client address", async () => {
    const server = await startServer(await freePort(), { TAPWRIGHT_INVITE_LIMIT: "3/60" });
    try {
      const statuses: number[] = [];
      for (let i = 0; i < 5; i++) {
        const r = await fetch(`${server.base}/api/v1/invitations/not-a-real-secret-${i}/accept`, {
          method: "POST",
          headers: { "content-type": "application/json", origin: server.base },
          body: JSON.stringify({ name: "Nobody", password: "a-long-password-1" }),
        });
        statuses.push(r.status);
      }
      // The count is per address and kept in the database, so earlier tests' accepts from this
      // address may already count: unknown links answer 404 until the limit, then 429.
      expect(statuses.at(-1)).toBe(429);
      expect(statuses.every((st) => st === 404 || st === 429)).toBe(true);
      expect(statuses.indexOf(429)).toBeLessThanOrEqual(3);
    } finally {
      await server.stop();
    }
  });
});

describe("the outbox", () => {
  it("keeps no invitation secret in plain text once the message is delivered", async () => {
    const email = `${unique("outbox").replace(/\W+/g, "-")}@tapwright.test`;
    const { link } = await (await admin.send("POST", "/api/v1/invitations", { email, role: "reviewer" })).json();
    const secret = link.split("/invite/")[1];
    const db = await import("mysql2/promise").then((m) => m.createConnection({ uri: process.env.DATABASE_URL! }));
    try {
      const row = await eventually(async () => {
        const [rows] = (await db.query("SELECT status, body_text AS body FROM mail_outbox WHERE to_address = ?", [
          email,
        ])) as unknown as [{ status: string; body: string }[]];
        return rows[0]?.status === "sent" ? rows[0] : undefined;
      });
      expect(row.body).not.toContain(secret);
      expect(row.body).toContain("/invite/[link removed after delivery]");
    } finally {
      await db.end();
    }
    // The link itself still works: it was delivered, and the invitation keeps only its hash.
    expect(
      (
        await anonymous().send("POST", `/api/v1/invitations/${secret}/accept`, {
          name: "Outbox Reader",
          password: "a-long-password-1",
        })
      ).status,
    ).toBe(201);
  });
});

describe("offboarding", () => {
  /** A fresh person who accepted an invitation, signed in. */
  async function newcomer(role = "designer") {
    const email = `${unique("leaver").replace(/\W+/g, "-")}@tapwright.test`;
    const { link } = await (await admin.send("POST", "/api/v1/invitations", { email, role })).json();
    const person = await (
      await anonymous().send("POST", `/api/v1/invitations/${link.split("/invite/")[1]}/accept`, {
        name: "Leaving Person",
        password: "a-long-password-1",
      })
    ).json();
    return { id: person.id as string, email, client: await signIn(email, "a-long-password-1") };
  }

  it("deactivating a person ends their sessions and tokens and keeps them out; reactivating lets them back", async () => {
    const p = await newcomer();
    const { secret } = await (await p.client.send("POST", "/api/v1/tokens", { name: "build box" })).json();
    const bearer = () => fetch(`${baseUrl}/api/v1/channels`, { headers: { authorization: `Bearer ${secret}` } });
    expect((await bearer()).status).toBe(200);
    expect((await admin.send("PUT", `/api/v1/users/${p.id}/active`, { active: false })).status).toBe(200);
    expect((await p.client.get("/api/v1/me")).status).toBe(401);
    expect((await bearer()).status).toBe(401);
    const again = await signInRaw(p.email, "a-long-password-1");
    expect(again.status).toBe(403);
    expect((await again.json()).error.message).toMatch(/deactivated/);
    expect((await admin.send("PUT", `/api/v1/users/${p.id}/active`, { active: true })).status).toBe(200);
    expect((await signInRaw(p.email, "a-long-password-1")).status).toBe(200);
    expect((await bearer()).status).toBe(401); // revoked tokens stay revoked
    expect((await designer.send("PUT", `/api/v1/users/${p.id}/active`, { active: false })).status).toBe(403);
  });

  it("an admin ends someone's sessions: they must sign in again", async () => {
    const p = await newcomer("firmware");
    expect((await p.client.get("/api/v1/me")).status).toBe(200);
    const res = await admin.send("DELETE", `/api/v1/users/${p.id}/sessions`);
    expect(res.status).toBe(200);
    expect((await res.json()).sessionsEnded).toBeGreaterThanOrEqual(1);
    expect((await p.client.get("/api/v1/me")).status).toBe(401);
  });

  it("a revoked invitation's link no longer works", async () => {
    const email = `${unique("revoked").replace(/\W+/g, "-")}@tapwright.test`;
    const { link } = await (await admin.send("POST", "/api/v1/invitations", { email, role: "reviewer" })).json();
    const open = (await (await admin.get("/api/v1/invitations")).json()).items as { id: number; email: string }[];
    const inv = open.find((i) => i.email === email)!;
    expect((await admin.send("DELETE", `/api/v1/invitations/${inv.id}`)).status).toBe(200);
    const accept = await anonymous().send("POST", `/api/v1/invitations/${link.split("/invite/")[1]}/accept`, {
      name: "Too Late",
      password: "a-long-password-1",
    });
    expect(accept.status).toBe(404);
  });

  it("an API token with an expiry stops working when it expires", async () => {
    const res = await designer.send("POST", "/api/v1/tokens", { name: unique("short-lived"), expiresInDays: 1 });
    expect(res.status).toBe(201);
    const token = await res.json();
    expect(new Date(token.expiresAt).getTime()).toBeGreaterThan(Date.now());
    const bearer = () => fetch(`${baseUrl}/api/v1/channels`, { headers: { authorization: `Bearer ${token.secret}` } });
    expect((await bearer()).status).toBe(200);
    const db = await import("mysql2/promise").then((m) => m.createConnection({ uri: process.env.DATABASE_URL! }));
    await db.query("UPDATE api_tokens SET expires_at = NOW(3) - INTERVAL 1 SECOND WHERE id = ?", [token.id]);
    await db.end();
    expect((await bearer()).status).toBe(401);
    expect((await designer.send("POST", "/api/v1/tokens", { name: "x", expiresInDays: 0 })).status).toBe(400);
  });
});

describe("demo accounts", () => {
  it("production refuses to start while a demo account can sign in", async () => {
    await expect(
      startServer(await freePort(), {
        NODE_ENV: "production",
        BETTER_AUTH_SECRET: "a-production-secret-of-forty-characters!!",
      }),
    ).rejects.toThrow(/exited with 1/);
  });
});

describe("lists read only what they show", () => {
  it("the tap-table list costs one query for its page, not two per table (and never loads a version's inputs)", async () => {
    const listed: number[] = [];
    for (let i = 0; i < 3; i++) {
      const res = await designer.send("POST", "/api/v1/tap-tables", {
        name: unique("Listed"),
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
      expect(res.status).toBe(202);
      listed.push((await res.json()).id);
    }
    // Their jobs (a tree per version) read the database too: let them finish before counting.
    for (const id of listed) await versionComputed(designer, id, 1);
    const db = await import("mysql2/promise").then((m) => m.createConnection({ uri: process.env.DATABASE_URL! }));
    const selects = async () =>
      Number(((await db.query("SHOW GLOBAL STATUS LIKE 'Com_select'"))[0] as { Value: string }[])[0].Value);
    try {
      const before = await selects();
      const res = await designer.get("/api/v1/tap-tables?limit=50");
      const after = await selects();
      const { items } = await res.json();
      expect(items.length).toBeGreaterThanOrEqual(4);
      expect(items.find((t: { name: string }) => t.name.startsWith("Listed"))).toMatchObject({
        architecture: "TX FIR + CTLE",
        classCount: 1,
        latestVersion: 1,
      });
      // The session's own lookups and a background poll may land in the window; a query per table may not.
      expect(after - before).toBeLessThan(items.length);
    } finally {
      await db.end();
    }
  });

  it("the studies list and a study's detail never load the studies' inputs (every channel's pulse)", async () => {
    for (let i = 0; i < 2; i++) {
      const res = await designer.send("POST", "/api/v1/studies", {
        name: unique("Listed study"),
        channelIds: pop.channelIds,
        budgetId: pop.budgetId,
      });
      expect(res.status).toBe(202);
      await studyFinished(designer, (await res.json()).id);
    }
    const db = await import("mysql2/promise").then((m) => m.createConnection({ uri: process.env.DATABASE_URL! }));
    // What MariaDB sent to all its clients: the list's share must be far below the inputs' size.
    const sent = async () =>
      Number(((await db.query("SHOW GLOBAL STATUS LIKE 'Bytes_sent'"))[0] as { Value: string }[])[0].Value);
    try {
      const [[{ inputs_B, newest }]] = (await db.query(
        "SELECT SUM(LENGTH(inputs)) AS inputs_B, MAX(id) AS newest FROM architecture_studies",
      )) as unknown as [{ inputs_B: number; newest: number }[]];
      expect(Number(inputs_B)).toBeGreaterThan(400_000);
      const before = await sent();
      const list = await designer.get("/api/v1/studies?limit=50");
      const between = await sent();
      const detail = await designer.get(`/api/v1/studies/${newest}`);
      const after = await sent();
      const { items } = await list.json();
      expect(items.find((s: { name: string }) => s.name.startsWith("Listed study"))).toMatchObject({
        channelCount: 2,
        status: "done",
      });
      const study = await detail.json();
      expect(study.channels.map((c: { id: number }) => c.id)).toEqual(pop.channelIds);
      expect(study.channels[0]).not.toHaveProperty("pulse");
      expect(study.candidates.length).toBeGreaterThan(0);
      // A background poll or a session lookup may land in the window: kilobytes, not the inputs' size.
      expect(between - before).toBeLessThan(Math.min(100_000, Number(inputs_B) / 4));
      expect(after - between).toBeLessThan(100_000 + JSON.stringify(study.result).length * 2);
    } finally {
      await db.end();
    }
  }, 300_000);
});
