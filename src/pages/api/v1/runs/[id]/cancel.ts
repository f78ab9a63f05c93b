// Cancel a queued or running run → 200 { id, status: "failed", error: { message: "Cancelled by …" } }; 409 once finished.
import { currentUser, endpoint, readParams } from "@/server/http/handler";
import { idParams } from "@/features/runs/runs";
import { cancelRun } from "@/features/runs/runs.server";

export const POST = endpoint(async (ctx) => cancelRun(currentUser(ctx), readParams(ctx.params, idParams).id));
