// The audit trail: who did what to which thing, and when. Written inside the action's transaction.
import { and, desc, eq, gte, like, lt, lte, or, type SQL } from "drizzle-orm";
import { db, type DbOrTx } from "@/server/db.server";
import { auditEvents } from "@/db/schema";
import type { SessionUser } from "@/server/auth/sessionUser";

export async function recordAudit(
  tx: DbOrTx,
  actor: SessionUser | null,
  action: string,
  targetType?: string,
  targetId?: string | number,
  detail?: Record<string, unknown>,
): Promise<void> {
  await tx.insert(auditEvents).values({
    actorId: actor?.id ?? null,
    actorEmail: actor?.email ?? null,
    action,
    targetType: targetType ?? null,
    targetId: targetId === undefined ? null : String(targetId),
    detail: detail ?? null,
  });
}

export interface AuditFilter {
  action?: string;
  actor?: string;
  targetType?: string;
  from?: Date;
  to?: Date;
  limit: number;
  cursor?: number;
}

/** Newest first; `cursor` is the id to continue below. */
export async function listAudit(filter: AuditFilter) {
  const where: SQL[] = [];
  if (filter.action) where.push(like(auditEvents.action, `${filter.action}%`));
  if (filter.actor) where.push(or(eq(auditEvents.actorEmail, filter.actor), eq(auditEvents.actorId, filter.actor))!);
  if (filter.targetType) where.push(eq(auditEvents.targetType, filter.targetType));
  if (filter.from) where.push(gte(auditEvents.createdAt, filter.from));
  if (filter.to) where.push(lte(auditEvents.createdAt, filter.to));
  if (filter.cursor) where.push(lt(auditEvents.id, filter.cursor));
  const rows = await db
    .select()
    .from(auditEvents)
    .where(where.length ? and(...where) : undefined)
    .orderBy(desc(auditEvents.id))
    .limit(filter.limit + 1);
  const items = rows.slice(0, filter.limit);
  return { items, nextCursor: rows.length > filter.limit ? String(items[items.length - 1].id) : null };
}
