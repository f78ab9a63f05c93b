// Cancel a sweep that has not finished (and its batches) → 200 { id, status: "failed", error: { message: "Cancelled by …" } }; 409 once finished.
import { currentUser, endpoint, readParams } from "@/server/http/handler";
import { sweepParams } from "@/features/sweeps/sweeps";
import { cancelSweep } from "@/features/sweeps/sweeps.server";

export const POST = endpoint(async (ctx) => cancelSweep(currentUser(ctx), readParams(ctx.params, sweepParams).id));
