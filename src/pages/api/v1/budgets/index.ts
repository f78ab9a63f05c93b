// Budgets: the list, and a new budget (the engine's Budget object with a name).
import { currentUser, endpoint, readJson, readParams } from "@/server/http/handler";
import { json } from "@/server/http/errors";
import { budgetRequest, listQuery } from "@/features/budgets/budgets";
import { createBudget, listBudgets } from "@/features/budgets/budgets.server";

export const GET = endpoint(async (ctx) => {
  const q = readParams(Object.fromEntries(ctx.url.searchParams), listQuery);
  return listBudgets(q.limit, q.cursor);
});

export const POST = endpoint(async (ctx) =>
  json(await createBudget(currentUser(ctx), await readJson(ctx.request, budgetRequest)), 201),
);
