// People: the list, role changes, invitations and their acceptance. Admin actions are audited.
import { createHash, randomBytes } from "node:crypto";
import { and, asc, eq, gt, isNull } from "drizzle-orm";
import { db, type Tx } from "@/server/db.server";
import { config } from "@/server/config.server";
import { accounts, apiTokens, invitations, sessions, users } from "@/db/schema";
import type { Role } from "./people";
import { ApiError, conflict, notFound } from "@/server/http/errors";
import { recordAudit } from "@/server/audit/audit.server";
import { enqueueMail, deliverQueuedMail } from "@/server/mail/mail.server";
import { hashPassword } from "@/server/auth/password.server";
import type { SessionUser } from "@/server/auth/sessionUser";
import { logError } from "@/server/http/logError";
import { countAttempt } from "@/server/auth/attempts.server";

const INVITATION_DAYS = 7;
const invitationGone = () =>
  new ApiError(404, "This invitation link is unknown, already used or expired; ask an admin for a new one.");
const sha256 = (text: string) => createHash("sha256").update(text).digest("hex");

export async function listPeople() {
  return db
    .select({
      id: users.id,
      name: users.name,
      email: users.email,
      role: users.role,
      deactivatedAt: users.deactivatedAt,
      createdAt: users.createdAt,
    })
    .from(users)
    .orderBy(asc(users.email));
}

export async function listOpenInvitations() {
  return db
    .select({
      id: invitations.id,
      email: invitations.email,
      role: invitations.role,
      expiresAt: invitations.expiresAt,
      createdAt: invitations.createdAt,
    })
    .from(invitations)
    .where(and(isNull(invitations.acceptedAt), gt(invitations.expiresAt, new Date())))
    .orderBy(asc(invitations.email));
}

/**
 * Locks every active admin's row (in id order), then the person's: two changes at once that each
 * remove one of the last two admins queue behind each other here, in one order (locking the person
 * first would let each hold one admin row and wait for the other's: a deadlock).
 */
async function lockAdminsAndPerson(tx: Tx, userId: string) {
  const admins = await tx
    .select({ id: users.id })
    .from(users)
    .where(and(eq(users.role, "admin"), isNull(users.deactivatedAt)))
    .orderBy(asc(users.id))
    .for("update");
  const [target] = await tx.select().from(users).where(eq(users.id, userId)).for("update");
  return { admins, target };
}

/** Refuses (409) when `userId` is the last active admin (`admins` locked by `lockAdminsAndPerson`). */
function keepAnAdmin(admins: readonly { id: string }[], userId: string, what: string) {
  if (admins.length <= 1 && admins.some((a) => a.id === userId))
    throw conflict(`This is the only admin; make someone else admin before you ${what}.`);
}

/**
 * Deactivates a person (offboarding) or lets them back in. Deactivation ends their sessions and
 * revokes their API tokens in the same transaction; they can no longer sign in.
 */
export async function setActive(actor: SessionUser, userId: string, active: boolean) {
  await db.transaction(async (tx) => {
    const { admins, target } = await lockAdminsAndPerson(tx, userId);
    if (!target) throw notFound("That person");
    if (active === !target.deactivatedAt) return;
    if (!active) {
      if (target.role === "admin") keepAnAdmin(admins, userId, "deactivate them");
      await tx.update(users).set({ deactivatedAt: new Date() }).where(eq(users.id, userId));
      await tx.delete(sessions).where(eq(sessions.userId, userId));
      await tx
        .update(apiTokens)
        .set({ revokedAt: new Date(), revokedBy: actor.id })
        .where(and(eq(apiTokens.userId, userId), isNull(apiTokens.revokedAt)));
    } else {
      await tx.update(users).set({ deactivatedAt: null }).where(eq(users.id, userId));
    }
    await recordAudit(tx, actor, active ? "user.reactivate" : "user.deactivate", "user", userId, {
      email: target.email,
    });
  });
}

/** Ends every session of a person (they must sign in again); their API tokens stay. */
export async function endSessions(actor: SessionUser, userId: string) {
  return db.transaction(async (tx) => {
    const [target] = await tx.select({ email: users.email }).from(users).where(eq(users.id, userId));
    if (!target) throw notFound("That person");
    const [result] = await tx.delete(sessions).where(eq(sessions.userId, userId));
    await recordAudit(tx, actor, "user.sessions.end", "user", userId, {
      email: target.email,
      sessions: result.affectedRows,
    });
    return { id: userId, sessionsEnded: result.affectedRows };
  });
}

/** Revokes an open invitation: its link stops working at once. */
export async function revokeInvitation(actor: SessionUser, id: number) {
  await db.transaction(async (tx) => {
    const [inv] = await tx
      .select()
      .from(invitations)
      .where(and(eq(invitations.id, id), isNull(invitations.acceptedAt)))
      .for("update");
    if (!inv) throw notFound("That open invitation");
    await tx.delete(invitations).where(eq(invitations.id, id));
    await recordAudit(tx, actor, "user.invite.revoke", "invitation", id, { email: inv.email, role: inv.role });
  });
}

/** Changes a person's role; refuses to leave the workspace without an admin. */
export async function setRole(actor: SessionUser, userId: string, role: Role) {
  await db.transaction(async (tx) => {
    const { admins, target } = await lockAdminsAndPerson(tx, userId);
    if (!target) throw notFound("That person");
    if (target.role === role) return;
    if (target.role === "admin") keepAnAdmin(admins, userId, "change their role");
    await tx.update(users).set({ role }).where(eq(users.id, userId));
    await recordAudit(tx, actor, "user.role", "user", userId, { email: target.email, from: target.role, to: role });
  });
}

/**
 * Invites a person by e-mail: stores the invitation (secret hashed) and queues the e-mail with the
 * link in one transaction. Returns the link too, so an admin can pass it on by hand.
 */
export async function invite(actor: SessionUser, email: string, role: Role) {
  const secret = randomBytes(24).toString("base64url");
  const link = new URL(`/invite/${secret}`, config.publicUrl).toString();
  await db.transaction(async (tx) => {
    const [existing] = await tx.select({ id: users.id }).from(users).where(eq(users.email, email));
    if (existing) throw conflict(`${email} already has an account; change their role instead.`);
    const expiresAt = new Date(Date.now() + INVITATION_DAYS * 86_400_000);
    const [{ id }] = await tx
      .insert(invitations)
      .values({ email, role, tokenHash: sha256(secret), invitedBy: actor.id, expiresAt })
      .$returningId();
    await enqueueMail(tx, {
      to: [email],
      subject: `You are invited to Tapwright as ${role}`,
      text:
        `${actor.name} (${actor.email}) invited you to the Tapwright workspace as ${role}.\n\n` +
        `Choose your name and password here (the link works for ${INVITATION_DAYS} days, once):\n${link}\n`,
    });
    await recordAudit(tx, actor, "user.invite", "invitation", id, { email, role });
  });
  void deliverQueuedMail().catch((e) => logError("mail delivery", e));
  return { email, role, link };
}

/** The open invitation behind a link, or null when it is unknown, used or expired. */
export async function findInvitation(secret: string) {
  const [row] = await db
    .select()
    .from(invitations)
    .where(
      and(
        eq(invitations.tokenHash, sha256(secret)),
        isNull(invitations.acceptedAt),
        gt(invitations.expiresAt, new Date()),
      ),
    );
  return row ?? null;
}

/** Counts an attempt to accept an invitation from `address`; 429 past TAPWRIGHT_INVITE_LIMIT (secrets cannot be guessed at speed). */
export async function limitInvitationAttempts(address: string): Promise<void> {
  const { max, window } = config.inviteLimit;
  const { allowed, retryAfter_s } = await countAttempt(`tapwright:invitation-accept:${address}`, max, window);
  if (!allowed)
    throw new ApiError(429, `Too many attempts to accept invitations from here; wait ${retryAfter_s} s and try again.`);
}

/**
 * Creates the person and their password in one transaction, and uses up the invitation. An unknown,
 * used or expired link is refused before the (deliberately slow) password hash is computed.
 */
export async function acceptInvitation(secret: string, name: string, password: string) {
  if (!(await findInvitation(secret))) throw invitationGone();
  const passwordHash = await hashPassword(password);
  return db.transaction(async (tx) => {
    const [inv] = await tx
      .select()
      .from(invitations)
      .where(
        and(
          eq(invitations.tokenHash, sha256(secret)),
          isNull(invitations.acceptedAt),
          gt(invitations.expiresAt, new Date()),
        ),
      )
      .for("update");
    if (!inv) throw invitationGone();
    const [existing] = await tx.select({ id: users.id }).from(users).where(eq(users.email, inv.email));
    if (existing) throw conflict(`${inv.email} already has an account; sign in instead.`);
    const id = crypto.randomUUID();
    await tx.insert(users).values({ id, name, email: inv.email, role: inv.role, emailVerified: true });
    await tx
      .insert(accounts)
      .values({ id: crypto.randomUUID(), accountId: id, providerId: "credential", userId: id, password: passwordHash });
    await tx.update(invitations).set({ acceptedAt: new Date() }).where(eq(invitations.id, inv.id));
    const person = { id, email: inv.email, name, role: inv.role };
    await recordAudit(tx, person, "user.join", "user", id, { role: inv.role });
    return person;
  });
}

/** Creates a person with a password directly (the demo seed; never reachable from the web). */
export async function ensurePerson(email: string, name: string, role: Role, password: string) {
  const [existing] = await db.select({ id: users.id }).from(users).where(eq(users.email, email));
  if (existing) return existing.id;
  const passwordHash = await hashPassword(password);
  const id = crypto.randomUUID();
  await db.transaction(async (tx) => {
    await tx.insert(users).values({ id, name, email, role, emailVerified: true });
    await tx
      .insert(accounts)
      .values({ id: crypto.randomUUID(), accountId: id, providerId: "credential", userId: id, password: passwordHash });
  });
  return id;
}
