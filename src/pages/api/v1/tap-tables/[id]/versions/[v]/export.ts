// The export of a version as CSV, JSON or a C header (also with an API token); audited.
import { currentUser, endpoint, readParams } from "@/server/http/handler";
import { downloadResponse } from "@/server/http/download";
import { exportQuery, versionParams } from "@/features/tapTables/tapTables";
import { exportVersion } from "@/features/tapTables/tapTableExports.server";

export const GET = endpoint(async (ctx) => {
  const { id, v } = readParams(ctx.params, versionParams);
  const { format } = readParams(Object.fromEntries(ctx.url.searchParams), exportQuery);
  return downloadResponse(await exportVersion(currentUser(ctx), ctx.locals.authVia, id, v, format));
});
