// Ask a reviewer to sign off a version (designers, admins); the reviewer gets an e-mail.
import { currentUser, endpoint, readJson, readParams } from "@/server/http/handler";
import { json } from "@/server/http/errors";
import { versionParams } from "@/features/tapTables/tapTables";
import { signOffRequest } from "@/features/signoff/signoff";
import { requestSignOff } from "@/features/signoff/signoff.server";

export const POST = endpoint(async (ctx) => {
  const { id, v } = readParams(ctx.params, versionParams);
  const body = await readJson(ctx.request, signOffRequest);
  return json(await requestSignOff(currentUser(ctx), id, v, body), 201);
});
