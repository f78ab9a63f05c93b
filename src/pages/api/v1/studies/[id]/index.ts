// One architecture study: status and progress, per-candidate headroom and complexity, the decision.
import { endpoint, readParams } from "@/server/http/handler";
import { studyParams } from "@/features/studies/studies";
import { getStudy } from "@/features/studies/studies.server";

export const GET = endpoint(async (ctx) => getStudy(readParams(ctx.params, studyParams).id));
