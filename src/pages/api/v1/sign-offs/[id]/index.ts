// One sign-off: each channel's limiter headroom against the required headroom, the study's
// decision record, the comment thread, the state.
import { endpoint, readParams } from "@/server/http/handler";
import { signOffParams } from "@/features/signoff/signoff";
import { getSignOff } from "@/features/signoff/signoff.server";

export const GET = endpoint(async (ctx) => getSignOff(readParams(ctx.params, signOffParams).id));
