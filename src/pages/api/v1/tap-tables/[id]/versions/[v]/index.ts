// One version: status, classes with their codes, per-channel headroom, the diff against the
// previous version, its sign-offs; PUT edits what is not frozen (409 otherwise).
import { currentUser, endpoint, readJson, readParams } from "@/server/http/handler";
import { updateVersionRequest, versionParams } from "@/features/tapTables/tapTables";
import { getVersion } from "@/features/tapTables/tapTables.server";
import { updateVersion } from "@/features/tapTables/tapTableVersions.server";

export const GET = endpoint(async (ctx) => {
  const { id, v } = readParams(ctx.params, versionParams);
  return getVersion(id, v);
});

export const PUT = endpoint(async (ctx) => {
  const { id, v } = readParams(ctx.params, versionParams);
  return updateVersion(currentUser(ctx), id, v, await readJson(ctx.request, updateVersionRequest));
});
