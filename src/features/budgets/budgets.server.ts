// Budgets in MariaDB: list, read, create, replace, delete. Every write is validated with the
// engine's own Budget schema (lib/contract/budget.ts) and audited in its transaction.
import { asc, count, eq } from "drizzle-orm";
import { db } from "@/server/db.server";
import { budgets, runs, users, type BudgetRow } from "@/db/schema";
import { conflict, notFound } from "@/server/http/errors";
import { recordAudit } from "@/server/audit/audit.server";
import type { SessionUser } from "@/server/auth/sessionUser";
import { budgetSchema, type Budget } from "@lib/contract/budget";
import type { BudgetRequest, BudgetView } from "./budgets";
import { checkSearchSize } from "@/server/sources.server";
import { SAMPLES_PER_UI } from "@/features/channels/channels";

const columns = {
  id: budgets.id,
  name: budgets.name,
  description: budgets.description,
  params: budgets.params,
  createdBy: users.name,
  createdAt: budgets.createdAt,
  updatedAt: budgets.updatedAt,
};

function toView(
  r: Pick<BudgetRow, "id" | "name" | "description" | "params" | "createdAt" | "updatedAt"> & {
    createdBy: string | null;
  },
): BudgetView {
  return {
    ...r.params,
    id: r.id,
    name: r.name,
    description: r.description,
    createdBy: r.createdBy,
    createdAt: r.createdAt,
    updatedAt: r.updatedAt,
  };
}

function split(body: BudgetRequest): { name: string; description: string | null; params: Budget } {
  const { name, description, ...rest } = body;
  // Parse again so that what is stored is exactly the engine's Budget (defaults filled, nothing extra).
  const params = budgetSchema.parse(rest);
  // A search too large for any channel is refused at once (channels are stored at SAMPLES_PER_UI).
  checkSearchSize(params, SAMPLES_PER_UI, 1, "tx");
  return { name, description: description || null, params };
}

const isDuplicate = (e: unknown) =>
  (e as { cause?: { code?: string }; code?: string })?.cause?.code === "ER_DUP_ENTRY" ||
  (e as { code?: string })?.code === "ER_DUP_ENTRY";
const duplicate = (name: string) => conflict(`A budget named "${name}" already exists; choose another name.`);

/** Budgets by name, with paging. */
export async function listBudgets(limit: number, offset = 0) {
  const rows = await db
    .select(columns)
    .from(budgets)
    .leftJoin(users, eq(users.id, budgets.createdBy))
    .orderBy(asc(budgets.name), asc(budgets.id))
    .limit(limit + 1)
    .offset(offset);
  const items = rows.slice(0, limit).map(toView);
  return { items, nextCursor: rows.length > limit ? String(offset + limit) : null };
}

/** Names and rates for pickers. */
export async function budgetChoices() {
  const rows = await db
    .select({ id: budgets.id, name: budgets.name, params: budgets.params })
    .from(budgets)
    .orderBy(asc(budgets.name));
  return rows.map((r) => {
    const p = r.params;
    return { id: r.id, name: r.name, modulation: p.modulation, bitRate_bps: p.bitRate_bps ?? null };
  });
}

export async function getBudget(id: number): Promise<BudgetView> {
  const [row] = await db
    .select(columns)
    .from(budgets)
    .leftJoin(users, eq(users.id, budgets.createdBy))
    .where(eq(budgets.id, id));
  if (!row) throw notFound(`Budget ${id}`);
  const [{ n }] = await db.select({ n: count() }).from(runs).where(eq(runs.budgetId, id));
  return { ...toView(row), runCount: n };
}

export async function createBudget(user: SessionUser | null, body: BudgetRequest): Promise<BudgetView> {
  const { name, description, params } = split(body);
  let id: number;
  try {
    id = await db.transaction(async (tx) => {
      const [{ id }] = await tx
        .insert(budgets)
        .values({ name, description, params, createdBy: user?.id ?? null })
        .$returningId();
      await recordAudit(tx, user, "budget.create", "budget", id, { name });
      return id;
    });
  } catch (e) {
    if (isDuplicate(e)) throw duplicate(name);
    throw e;
  }
  return getBudget(id);
}

export async function updateBudget(user: SessionUser, id: number, body: BudgetRequest): Promise<BudgetView> {
  const { name, description, params } = split(body);
  try {
    await db.transaction(async (tx) => {
      const [row] = await tx.select({ id: budgets.id }).from(budgets).where(eq(budgets.id, id)).for("update");
      if (!row) throw notFound(`Budget ${id}`);
      await tx.update(budgets).set({ name, description, params }).where(eq(budgets.id, id));
      await recordAudit(tx, user, "budget.update", "budget", id, { name });
    });
  } catch (e) {
    if (isDuplicate(e)) throw duplicate(name);
    throw e;
  }
  return getBudget(id);
}

/** Deletes a budget; tuning runs keep their own copy of it. */
export async function deleteBudget(user: SessionUser, id: number) {
  return db.transaction(async (tx) => {
    const [row] = await tx
      .select({ id: budgets.id, name: budgets.name })
      .from(budgets)
      .where(eq(budgets.id, id))
      .for("update");
    if (!row) throw notFound(`Budget ${id}`);
    const [{ n }] = await tx.select({ n: count() }).from(runs).where(eq(runs.budgetId, id));
    await tx.delete(budgets).where(eq(budgets.id, id));
    await recordAudit(tx, user, "budget.delete", "budget", id, { name: row.name, runs: n });
    return { id, deleted: true, runsKept: n };
  });
}

/** How many budgets the workspace holds. */
export async function countBudgets(): Promise<number> {
  const [{ n }] = await db.select({ n: count() }).from(budgets);
  return n;
}
