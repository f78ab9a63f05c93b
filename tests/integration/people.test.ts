// Invitations by e-mail (through the local fake SMTP server), accepting them, role changes, API
// tokens, and the audit events each action leaves.
import { describe, expect, it } from "vitest";
import { anonymous, eventually, signIn } from "../support/http";

const unique = () => `${Date.now().toString(36)}${Math.floor(Math.random() * 1e6).toString(36)}`;

describe("invitations", () => {
  it("an admin invites; the e-mail arrives; the person joins with the invited role", async () => {
    const admin = await signIn("admin");
    const email = `kit.${unique()}@tapwright.test`;
    const res = await admin.send("POST", "/api/v1/invitations", { email, role: "reviewer" });
    expect(res.status).toBe(201);
    const { link } = await res.json();
    expect(link).toMatch(/\/invite\/[A-Za-z0-9_-]+$/);

    const mail = await eventually(
      async () => {
        const box = await (await admin.get("/api/v1/dev/mail")).json();
        return box.items.find((m: { to: string[] }) => m.to.includes(email));
      },
      15_000,
      "the invitation e-mail",
    );
    expect(mail.subject).toMatch(/invited to Tapwright as reviewer/);
    expect(mail.text).toContain(link);

    const token = link.split("/invite/")[1];
    const page = await anonymous().get(`/invite/${token}`);
    expect(page.status).toBe(200);
    expect(await page.text()).toContain(email);

    const short = await anonymous().send("POST", `/api/v1/invitations/${token}/accept`, {
      name: "Kit Varga",
      password: "short",
    });
    expect(short.status).toBe(400);
    expect((await short.json()).error.path).toBe("password");

    const accept = await anonymous().send("POST", `/api/v1/invitations/${token}/accept`, {
      name: "Kit Varga",
      password: "a-long-password-1",
    });
    expect(accept.status).toBe(201);
    const again = await anonymous().send("POST", `/api/v1/invitations/${token}/accept`, {
      name: "Kit Varga",
      password: "a-long-password-1",
    });
    expect(again.status).toBe(404);

    const kit = await signIn(email, "a-long-password-1");
    expect(await (await kit.get("/api/v1/me")).json()).toMatchObject({ email, role: "reviewer", name: "Kit Varga" });

    const audit = await (await admin.get(`/api/v1/audit?action=user.`)).json();
    const actions = audit.items
      .filter(
        (e: { detail: { email?: string } | null; actorEmail: string }) =>
          e.detail?.email === email || e.actorEmail === email,
      )
      .map((e: { action: string }) => e.action);
    expect(actions).toEqual(expect.arrayContaining(["user.invite", "user.join"]));
  });

  it("refuses to invite someone who already has an account (409)", async () => {
    const admin = await signIn("admin");
    const res = await admin.send("POST", "/api/v1/invitations", { email: "designer@tapwright.test", role: "designer" });
    expect(res.status).toBe(409);
  });
});

describe("roles", () => {
  it("an admin changes a role; the person's next request carries it; it is audited", async () => {
    const admin = await signIn("admin");
    const email = `sol.${unique()}@tapwright.test`;
    const { link } = await (await admin.send("POST", "/api/v1/invitations", { email, role: "firmware" })).json();
    await anonymous().send("POST", `/api/v1/invitations/${link.split("/invite/")[1]}/accept`, {
      name: "Sol Ito",
      password: "another-password",
    });
    const sol = await signIn(email, "another-password");
    const me = await (await sol.get("/api/v1/me")).json();
    expect(me.role).toBe("firmware");

    const bad = await admin.send("PUT", `/api/v1/users/${me.id}/role`, { role: "overlord" });
    expect(bad.status).toBe(400);
    const ok = await admin.send("PUT", `/api/v1/users/${me.id}/role`, { role: "designer" });
    expect(ok.status).toBe(200);
    expect((await (await sol.get("/api/v1/me")).json()).role).toBe("designer");

    const audit = await (await admin.get(`/api/v1/audit?action=user.role`)).json();
    expect(
      audit.items.some(
        (e: { targetId: string; detail: { to: string } }) => e.targetId === me.id && e.detail.to === "designer",
      ),
    ).toBe(true);
  });

  it("will not remove the last admin", async () => {
    const admin = await signIn("admin");
    const me = await (await admin.get("/api/v1/me")).json();
    const res = await admin.send("PUT", `/api/v1/users/${me.id}/role`, { role: "reviewer" });
    expect(res.status).toBe(409);
    expect((await res.json()).error.message).toMatch(/only admin/);
  });

  it("two demotions at once of the last two admins leave one admin: one is refused, neither fails", async () => {
    const admin = await signIn("admin");
    const me = (await (await admin.get("/api/v1/me")).json()) as { id: string };
    const email = `ada.${unique()}@tapwright.test`;
    const { link } = await (await admin.send("POST", "/api/v1/invitations", { email, role: "designer" })).json();
    await anonymous().send("POST", `/api/v1/invitations/${link.split("/invite/")[1]}/accept`, {
      name: "Ada Mbeki",
      password: "third-password-1",
    });
    const ada = await signIn(email, "third-password-1");
    const adaId = ((await (await ada.get("/api/v1/me")).json()) as { id: string }).id;
    const activeAdmins = async (client: typeof admin) =>
      (
        (await (await client.get("/api/v1/users")).json()) as {
          items: { id: string; role: string; deactivatedAt: string | null }[];
        }
      ).items.filter((u) => u.role === "admin" && u.deactivatedAt === null);
    expect((await activeAdmins(admin)).map((u) => u.id)).toEqual([me.id]);
    // Several rounds, each demotion by the admin it does not demote, so that the two requests overlap.
    for (let round = 0; round < 6; round++) {
      expect((await admin.send("PUT", `/api/v1/users/${adaId}/role`, { role: "admin" })).status).toBe(200);
      const answers = await Promise.all([
        admin.send("PUT", `/api/v1/users/${adaId}/role`, { role: "designer" }),
        ada.send("PUT", `/api/v1/users/${me.id}/role`, { role: "designer" }),
      ]);
      // One passes; the other is refused: 409 from the guard, or 403 when it arrives after its sender
      // was already demoted. Never both, never a 500 (two guards waiting for each other's rows).
      const statuses = answers.map((a) => a.status);
      expect(
        statuses.filter((x) => x === 200),
        `round ${round}: ${statuses}`,
      ).toHaveLength(1);
      expect([403, 409], `round ${round}: ${statuses}`).toContain(statuses.find((x) => x !== 200));
      const left = answers[0].status === 200 ? admin : ada;
      const admins = await activeAdmins(left);
      expect(admins.map((u) => u.id)).toEqual([left === admin ? me.id : adaId]);
      if (left === ada) {
        // Back to the suite's admin alone.
        expect((await ada.send("PUT", `/api/v1/users/${me.id}/role`, { role: "admin" })).status).toBe(200);
        expect((await admin.send("PUT", `/api/v1/users/${adaId}/role`, { role: "designer" })).status).toBe(200);
      }
    }
    expect((await activeAdmins(admin)).map((u) => u.id)).toEqual([me.id]);
  });
});

describe("API tokens", () => {
  it("read with a token; never write with one; die when revoked", async () => {
    const fw = await signIn("firmware");
    const created = await fw.send("POST", "/api/v1/tokens", { name: "build server" });
    expect(created.status).toBe(201);
    const { id, secret } = await created.json();
    expect(secret).toMatch(/^tw_[0-9a-f]{8}_/);

    const bearer = (path: string, init: RequestInit = {}) =>
      anonymous().fetch(path, { ...init, headers: { ...(init.headers ?? {}), authorization: `Bearer ${secret}` } });
    expect((await (await bearer("/api/v1/me")).json()).email).toBe("firmware@tapwright.test");
    const write = await bearer("/api/v1/tokens", {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: '{"name":"x"}',
    });
    expect(write.status).toBe(401);

    const list = await (await fw.get("/api/v1/tokens")).json();
    expect(list.items.find((t: { id: number }) => t.id === id)).toBeDefined();
    expect(JSON.stringify(list)).not.toContain(secret);

    const other = await signIn("designer");
    expect((await other.send("DELETE", `/api/v1/tokens/${id}`)).status).toBe(404);
    expect((await fw.send("DELETE", `/api/v1/tokens/${id}`)).status).toBe(200);
    expect((await bearer("/api/v1/me")).status).toBe(401);
  });

  it("an admin may revoke anyone's token", async () => {
    const rev = await signIn("reviewer");
    const { id } = await (await rev.send("POST", "/api/v1/tokens", { name: "notebook" })).json();
    const admin = await signIn("admin");
    expect((await admin.send("DELETE", `/api/v1/tokens/${id}`)).status).toBe(200);
    const audit = await (await admin.get(`/api/v1/audit?action=token.revoke`)).json();
    expect(audit.items.some((e: { targetId: string }) => e.targetId === String(id))).toBe(true);
  });
});
