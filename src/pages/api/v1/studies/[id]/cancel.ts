// Cancel a queued or running study → 200 { id, status: "failed", error: { message: "Cancelled by …" } }; 409 once finished.
import { currentUser, endpoint, readParams } from "@/server/http/handler";
import { studyParams } from "@/features/studies/studies";
import { cancelStudy } from "@/features/studies/studies.server";

export const POST = endpoint(async (ctx) => cancelStudy(currentUser(ctx), readParams(ctx.params, studyParams).id));
