// Corner sweeps: the list, and starting one (a parent job and its batches: 202, poll GET /api/v1/sweeps/:id).
import { currentUser, endpoint, readJson, readParams } from "@/server/http/handler";
import { json } from "@/server/http/errors";
import { createSweepRequest, listQuery } from "@/features/sweeps/sweeps";
import { listSweeps, startSweep } from "@/features/sweeps/sweeps.server";

export const GET = endpoint(async (ctx) => {
  const q = readParams(Object.fromEntries(ctx.url.searchParams), listQuery);
  return listSweeps(q.limit, q.cursor);
});

export const POST = endpoint(async (ctx) => {
  const body = await readJson(ctx.request, createSweepRequest);
  return json(await startSweep(currentUser(ctx), body), 202);
});
