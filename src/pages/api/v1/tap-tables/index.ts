// Tap tables: the list, and creating one with its first version (a job: 202, poll the version).
import { currentUser, endpoint, readJson, readParams } from "@/server/http/handler";
import { json } from "@/server/http/errors";
import { createTapTableRequest, listQuery } from "@/features/tapTables/tapTables";
import { listTapTables } from "@/features/tapTables/tapTables.server";
import { createTapTable } from "@/features/tapTables/tapTableVersions.server";

export const GET = endpoint(async (ctx) => {
  const q = readParams(Object.fromEntries(ctx.url.searchParams), listQuery);
  return listTapTables(q.limit, q.cursor);
});

export const POST = endpoint(async (ctx) => {
  const body = await readJson(ctx.request, createTapTableRequest);
  return json(await createTapTable(currentUser(ctx), body), 202);
});
