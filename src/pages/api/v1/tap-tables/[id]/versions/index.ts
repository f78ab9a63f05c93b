// A new version of a tap table (a job: 202); what the request leaves out comes from the latest version.
import { currentUser, endpoint, readJson, readParams } from "@/server/http/handler";
import { json } from "@/server/http/errors";
import { createVersionRequest, tapTableParams } from "@/features/tapTables/tapTables";
import { getTapTable } from "@/features/tapTables/tapTables.server";
import { createVersion } from "@/features/tapTables/tapTableVersions.server";

export const GET = endpoint(async (ctx) => {
  const table = await getTapTable(readParams(ctx.params, tapTableParams).id);
  return { items: table.versions, nextCursor: null };
});

export const POST = endpoint(async (ctx) => {
  const { id } = readParams(ctx.params, tapTableParams);
  const body = await readJson(ctx.request, createVersionRequest);
  return json(await createVersion(currentUser(ctx), id, body), 202);
});
