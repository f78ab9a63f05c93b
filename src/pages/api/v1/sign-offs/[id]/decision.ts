// The reviewer's decision: approve (freezes the version) or reject with a reason; e-mails the requester.
import { currentUser, endpoint, readJson, readParams } from "@/server/http/handler";
import { decisionRequest, signOffParams } from "@/features/signoff/signoff";
import { decideSignOff } from "@/features/signoff/signoff.server";

export const POST = endpoint(async (ctx) => {
  const { id } = readParams(ctx.params, signOffParams);
  return decideSignOff(currentUser(ctx), id, await readJson(ctx.request, decisionRequest));
});
