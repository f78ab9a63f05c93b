// API tokens for scripts and build machines: `tw_<prefix>_<secret>`, shown once, kept as SHA-256.
import { createHash, randomBytes } from "node:crypto";
import { and, desc, eq, gt, isNull, or, sql } from "drizzle-orm";
import { db } from "@/server/db.server";
import { apiTokens, users } from "@/db/schema";
import type { Role } from "@/features/people/people";
import { ApiError, notFound } from "@/server/http/errors";
import { recordAudit } from "@/server/audit/audit.server";
import type { SessionUser } from "@/server/auth/sessionUser";

const sha256 = (text: string) => createHash("sha256").update(text).digest("hex");

export interface TokenView {
  id: number;
  name: string;
  prefix: string;
  createdAt: Date;
  lastUsedAt: Date | null;
  expiresAt: Date | null;
  revokedAt: Date | null;
  owner?: { id: string; email: string };
}

/** Creates a token for the user; the returned secret is the only copy that ever leaves the server. */
export async function createToken(
  user: SessionUser,
  name: string,
  expiresInDays?: number,
): Promise<{ token: TokenView; secret: string }> {
  const prefix = randomBytes(4).toString("hex");
  const secret = `tw_${prefix}_${randomBytes(24).toString("base64url")}`;
  return db.transaction(async (tx) => {
    const [{ id }] = await tx
      .insert(apiTokens)
      .values({
        userId: user.id,
        name,
        prefix,
        secretHash: sha256(secret),
        expiresAt: expiresInDays ? new Date(Date.now() + expiresInDays * 86_400_000) : null,
      })
      .$returningId();
    await recordAudit(tx, user, "token.create", "token", id, {
      name,
      prefix,
      ...(expiresInDays ? { expiresInDays } : {}),
    });
    const [row] = await tx.select().from(apiTokens).where(eq(apiTokens.id, id));
    return { token: view(row), secret };
  });
}

function view(row: typeof apiTokens.$inferSelect): TokenView {
  return {
    id: row.id,
    name: row.name,
    prefix: row.prefix,
    createdAt: row.createdAt,
    lastUsedAt: row.lastUsedAt,
    expiresAt: row.expiresAt,
    revokedAt: row.revokedAt,
  };
}

/** The user's own tokens, or (for admins with `all`) everyone's. */
export async function listTokens(user: SessionUser, all = false): Promise<TokenView[]> {
  const rows = await db
    .select({ token: apiTokens, email: users.email })
    .from(apiTokens)
    .innerJoin(users, eq(users.id, apiTokens.userId))
    .where(all && user.role === "admin" ? undefined : eq(apiTokens.userId, user.id))
    .orderBy(desc(apiTokens.createdAt));
  return rows.map((r) => ({ ...view(r.token), owner: { id: r.token.userId, email: r.email } }));
}

/** Revokes a token: its owner may, and an admin may revoke anyone's. */
export async function revokeToken(user: SessionUser, id: number): Promise<void> {
  await db.transaction(async (tx) => {
    const [row] = await tx.select().from(apiTokens).where(eq(apiTokens.id, id)).for("update");
    if (!row || (row.userId !== user.id && user.role !== "admin")) throw notFound("That API token");
    if (row.revokedAt) throw new ApiError(409, "That API token is already revoked.");
    await tx.update(apiTokens).set({ revokedAt: new Date(), revokedBy: user.id }).where(eq(apiTokens.id, id));
    await recordAudit(tx, user, "token.revoke", "token", id, { prefix: row.prefix, owner: row.userId });
  });
}

/** The person behind a bearer secret, or null when it is unknown, revoked, expired, or its owner was deactivated. */
export async function userForToken(secret: string): Promise<SessionUser | null> {
  if (!/^tw_[0-9a-f]{8}_[A-Za-z0-9_-]{20,}$/.test(secret)) return null;
  const [row] = await db
    .select({ tokenId: apiTokens.id, id: users.id, email: users.email, name: users.name, role: users.role })
    .from(apiTokens)
    .innerJoin(users, eq(users.id, apiTokens.userId))
    .where(
      and(
        eq(apiTokens.secretHash, sha256(secret)),
        isNull(apiTokens.revokedAt),
        or(isNull(apiTokens.expiresAt), gt(apiTokens.expiresAt, sql`NOW(3)`)),
        isNull(users.deactivatedAt),
      ),
    );
  if (!row) return null;
  await db.update(apiTokens).set({ lastUsedAt: new Date() }).where(eq(apiTokens.id, row.tokenId));
  return { id: row.id, email: row.email, name: row.name, role: row.role as Role };
}
