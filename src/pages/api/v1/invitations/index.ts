// Admin: invite a person by e-mail with a role.
import { currentUser, endpoint, readJson } from "@/server/http/handler";
import { json } from "@/server/http/errors";
import { invite, listOpenInvitations } from "@/features/people/people.server";
import { inviteRequest } from "@/features/people/people";

export const GET = endpoint(async () => ({ items: await listOpenInvitations(), nextCursor: null }));

export const POST = endpoint(async (ctx) => {
  const { email, role } = await readJson(ctx.request, inviteRequest);
  return json(await invite(currentUser(ctx), email, role), 201);
});
