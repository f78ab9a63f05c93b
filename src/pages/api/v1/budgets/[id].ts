// One budget: read, replace, delete (tuning runs keep their own copy).
import { currentUser, endpoint, readJson, readParams } from "@/server/http/handler";
import { budgetRequest, idParams } from "@/features/budgets/budgets";
import { deleteBudget, getBudget, updateBudget } from "@/features/budgets/budgets.server";

export const GET = endpoint(async (ctx) => getBudget(readParams(ctx.params, idParams).id));

export const PUT = endpoint(async (ctx) => {
  const { id } = readParams(ctx.params, idParams);
  return updateBudget(currentUser(ctx), id, await readJson(ctx.request, budgetRequest));
});

export const DELETE = endpoint(async (ctx) => deleteBudget(currentUser(ctx), readParams(ctx.params, idParams).id));
