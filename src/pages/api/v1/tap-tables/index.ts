// Tap tables: the list, and creating one with its first version (a job: 202, poll the version).
import { currentUser, endpoint, readJson, readParams } from "@/server/http/handler";
import { json } from "@/server/http/errors";
import { createTableRequest, listQuery } from "@/features/tables/tables";
import { createTable, listTables } from "@/features/tables/tables.server";

export const GET = endpoint(async (ctx) => {
  const q = readParams(Object.fromEntries(ctx.url.searchParams), listQuery);
  return listTables(q.limit, q.cursor);
});

export const POST = endpoint(async (ctx) => {
  const body = await readJson(ctx.request, createTableRequest);
  return json(await createTable(currentUser(ctx), body), 202);
});
