// Comments on a sign-off (everyone): a new thread or a reply, optionally about one channel.
import { currentUser, endpoint, readJson, readParams } from "@/server/http/handler";
import { json } from "@/server/http/errors";
import { commentRequest, signOffParams } from "@/features/signoff/signoff";
import { addComment, getSignOff } from "@/features/signoff/signoff.server";

export const GET = endpoint(async (ctx) => {
  const { comments } = await getSignOff(readParams(ctx.params, signOffParams).id);
  return { items: comments, nextCursor: null };
});

export const POST = endpoint(async (ctx) => {
  const { id } = readParams(ctx.params, signOffParams);
  return json(await addComment(currentUser(ctx), id, await readJson(ctx.request, commentRequest)), 201);
});
