// Sign-in, sessions, the role matrix of api.md, and the API's error shape, against the running
// test server and its MariaDB.
import { describe, expect, it } from "vitest";
import { anonymous, baseUrl, signIn, signInRaw, demoPassword, type DemoRole } from "../support/http";
import { freePort, startServer } from "../support/server";

const ROLES: DemoRole[] = ["admin", "designer", "firmware", "reviewer"];

describe("health", () => {
  it("answers without sign-in and reaches the database", async () => {
    const res = await fetch(`${baseUrl}/api/v1/health`);
    expect(res.status).toBe(200);
    expect(await res.json()).toEqual({ ok: true, db: true });
  });
});

describe("sign-in", () => {
  it("succeeds with the right password and sets a HttpOnly, SameSite=Lax session cookie", async () => {
    const res = await signInRaw("designer@tapwright.test", demoPassword);
    expect(res.status).toBe(200);
    const cookie = res.headers.getSetCookie().find((c) => c.startsWith("tapwright.session_token="));
    expect(cookie).toBeDefined();
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
    expect(cookie).not.toMatch(/Secure/i); // plain http on loopback; Secure is on outside localhost
  });

  it("fails with a wrong password or an unknown e-mail, and the answer does not say which", async () => {
    const wrongPassword = await signInRaw("designer@tapwright.test", "not-the-password");
    const unknownEmail = await signInRaw("nobody@tapwright.test", demoPassword);
    expect(wrongPassword.status).toBe(401);
    expect(unknownEmail.status).toBe(401);
    const a = (await wrongPassword.json()) as { message: string };
    const b = (await unknownEmail.json()) as { message: string };
    expect(a.message).toBe(b.message);
    expect(a.message).not.toMatch(/password is|no user|not found|unknown/i);
  });

  it("/api/v1/me names the person and their role", async () => {
    for (const role of ROLES) {
      const c = await signIn(role);
      const me = await (await c.get("/api/v1/me")).json();
      expect(me).toMatchObject({ email: `${role}@tapwright.test`, role });
      expect(typeof me.id).toBe("string");
    }
  });
});

describe("unauthenticated requests", () => {
  it("get 401 with the error shape on the API", async () => {
    for (const path of ["/api/v1/me", "/api/v1/channels", "/api/v1/users", "/api/v1/tokens"]) {
      const res = await anonymous().get(path);
      expect(res.status, path).toBe(401);
      const body = await res.json();
      expect(typeof body.error.message).toBe("string");
    }
  });

  it("are sent to the sign-in page from pages, with the way back", async () => {
    const res = await anonymous().get("/runs?x=1");
    expect(res.status).toBe(302);
    expect(res.headers.get("location")).toBe("/sign-in?next=%2Fruns%3Fx%3D1");
  });
});

describe("the role matrix (api.md), one representative route per row", () => {
  const rows: { row: string; method: string; path: string; body?: unknown; allowed: DemoRole[] }[] = [
    { row: "read channels, budgets, runs, studies, tables", method: "GET", path: "/api/v1/channels", allowed: ROLES },
    {
      row: "upload / edit / start / build",
      method: "POST",
      path: "/api/v1/budgets",
      body: {},
      allowed: ["admin", "designer"],
    },
    {
      row: "request a sign-off",
      method: "POST",
      path: "/api/v1/tap-tables/999999/versions/1/sign-off",
      body: {},
      allowed: ["admin", "designer"],
    },
    {
      row: "decide a sign-off",
      method: "POST",
      path: "/api/v1/sign-offs/999999/decision",
      body: {},
      allowed: ["admin", "reviewer"],
    },
    { row: "export tap tables, own API tokens", method: "GET", path: "/api/v1/tokens", allowed: ROLES },
    {
      row: "invite, set roles, revoke anyone's tokens, audit",
      method: "GET",
      path: "/api/v1/audit",
      allowed: ["admin"],
    },
  ];
  const clients = new Map<DemoRole, Awaited<ReturnType<typeof signIn>>>();

  for (const r of rows) {
    for (const role of ROLES) {
      const allowed = r.allowed.includes(role);
      it(`${role} ${allowed ? "may" : "may not"}: ${r.row}`, async () => {
        if (!clients.has(role)) clients.set(role, await signIn(role));
        const res = await clients.get(role)!.send(r.method, r.path, r.body);
        if (allowed) {
          expect([401, 403], `${r.method} ${r.path} as ${role}`).not.toContain(res.status);
        } else {
          expect(res.status, `${r.method} ${r.path} as ${role}`).toBe(403);
          expect((await res.json()).error.message).toMatch(new RegExp(role));
        }
      });
    }
  }

  it("pages follow the same table: the admin page is the admin's alone", async () => {
    expect((await (await signIn("admin")).get("/admin")).status).toBe(200);
    const denied = await (await signIn("reviewer")).get("/admin");
    expect(denied.status).toBe(403);
    expect(await denied.text()).toMatch(/not for your role/);
  });
});

describe("the API's error shape", () => {
  it("answers malformed JSON with 400 and a message a person can act on", async () => {
    const admin = await signIn("admin");
    const res = await admin.fetch("/api/v1/invitations", {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: "{not json",
    });
    expect(res.status).toBe(400);
    expect((await res.json()).error.message).toMatch(/JSON/);
  });

  it("names the field that is wrong", async () => {
    const admin = await signIn("admin");
    const res = await admin.send("POST", "/api/v1/invitations", { email: "not-an-address", role: "designer" });
    expect(res.status).toBe(400);
    const body = await res.json();
    expect(body.error.path).toBe("email");
    expect(body.error.message).toMatch(/e-mail/);
  });

  it("refuses a cross-site form post (origin check)", async () => {
    const admin = await signIn("admin");
    const res = await admin.fetch("/api/v1/invitations", {
      method: "POST",
      headers: { "content-type": "application/x-www-form-urlencoded", origin: "http://evil.example" },
      body: "email=x%40y.z&role=admin",
    });
    expect(res.status).toBe(403);
  });
});

describe("sessions live in MariaDB", () => {
  it("survive a server restart and die at sign-out", async () => {
    const port = await freePort();
    let server = await startServer(port);
    try {
      const c = await signIn("firmware", demoPassword, server.base);
      expect((await c.get("/api/v1/me")).status).toBe(200);
      await server.stop();
      server = await startServer(port);
      expect((await c.get("/api/v1/me")).status).toBe(200);
      const out = await c.send("POST", "/api/auth/sign-out", {});
      expect(out.status).toBe(200);
      expect((await c.get("/api/v1/me")).status).toBe(401);
    } finally {
      await server.stop();
    }
  });
});

describe("sign-in is rate limited per client address", () => {
  it("answers 429 after too many attempts in the window", async () => {
    const server = await startServer(await freePort(), { TAPWRIGHT_SIGN_IN_LIMIT: "3/60" });
    try {
      const statuses: number[] = [];
      // Wrong passwords for an address no account has, so no demo account's own failure count grows.
      const nobody = `nobody-${Date.now()}@tapwright.test`;
      for (let i = 0; i < 6; i++) statuses.push((await signInRaw(nobody, "wrong-password-123", server.base)).status);
      expect(statuses).toContain(429);
      expect(statuses.at(-1)).toBe(429);
      // Even the right password is refused while the limit holds.
      expect((await signInRaw("reviewer@tapwright.test", demoPassword, server.base)).status).toBe(429);
    } finally {
      await server.stop();
    }
  });

  it("a different X-Forwarded-For on every attempt does not dodge it (the address comes from the socket)", async () => {
    const server = await startServer(await freePort(), { TAPWRIGHT_SIGN_IN_LIMIT: "5/60" });
    try {
      const statuses: number[] = [];
      for (let i = 0; i < 9; i++) {
        const res = await fetch(`${server.base}/api/auth/sign-in/email`, {
          method: "POST",
          headers: { "content-type": "application/json", origin: server.base, "x-forwarded-for": `203.0.113.${i + 1}` },
          body: JSON.stringify({ email: `nobody-${i}-${Date.now()}@tapwright.test`, password: "wrong-password-123" }),
        });
        statuses.push(res.status);
      }
      expect(statuses).toContain(429);
      expect(statuses.at(-1)).toBe(429);
    } finally {
      await server.stop();
    }
  });
});
