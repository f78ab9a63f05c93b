// A new version of a tap table (a job: 202); what the request leaves out comes from the latest version.
import { currentUser, endpoint, readJson, readParams } from "@/server/http/handler";
import { json } from "@/server/http/errors";
import { createVersionRequest, tableParams } from "@/features/tables/tables";
import { createVersion, getTable } from "@/features/tables/tables.server";

export const GET = endpoint(async (ctx) => {
  const table = await getTable(readParams(ctx.params, tableParams).id);
  return { items: table.versions, nextCursor: null };
});

export const POST = endpoint(async (ctx) => {
  const { id } = readParams(ctx.params, tableParams);
  const body = await readJson(ctx.request, createVersionRequest);
  return json(await createVersion(currentUser(ctx), id, body), 202);
});
