// Sign-offs, newest first (?state=pending|approved|rejected, ?mine=1).
import { currentUser, endpoint, readParams } from "@/server/http/handler";
import { listQuery } from "@/features/signoff/signoff";
import { listSignOffs } from "@/features/signoff/signoff.server";

export const GET = endpoint(async (ctx) =>
  listSignOffs(currentUser(ctx), readParams(Object.fromEntries(ctx.url.searchParams), listQuery)),
);
