// The decision record of a study: the chosen architecture and the rationale (designers, admins).
import { currentUser, endpoint, readJson, readParams } from "@/server/http/handler";
import { decisionRequest, studyParams } from "@/features/studies/studies";
import { decideStudy } from "@/features/studies/studies.server";

export const PUT = endpoint(async (ctx) => {
  const { id } = readParams(ctx.params, studyParams);
  return decideStudy(currentUser(ctx), id, await readJson(ctx.request, decisionRequest));
});
