// Tuning runs: the list, and starting one ({ channelId, budgetId } → 202 { id, status: "queued" }).
import { currentUser, endpoint, readJson, readParams } from "@/server/http/handler";
import { json } from "@/server/http/errors";
import { listQuery, startRunRequest } from "@/features/runs/runs";
import { listRuns, startRun } from "@/features/runs/runs.server";

export const GET = endpoint(async (ctx) => listRuns(readParams(Object.fromEntries(ctx.url.searchParams), listQuery)));

export const POST = endpoint(async (ctx) =>
  json(await startRun(currentUser(ctx), await readJson(ctx.request, startRunRequest)), 202),
);
