// Public: accept an invitation, choosing a name and a password (rate limited per client address).
import { z } from "zod";
import { endpoint, readJson, readParams } from "@/server/http/handler";
import { json } from "@/server/http/errors";
import { acceptInvitation, limitInvitationAttempts } from "@/features/people/people.server";
import { acceptInvitationRequest } from "@/features/people/people";

export const POST = endpoint(async (ctx) => {
  const { token } = readParams(ctx.params, z.object({ token: z.string().min(10).max(100) }));
  await limitInvitationAttempts(ctx.clientAddress);
  const { name, password } = await readJson(ctx.request, acceptInvitationRequest);
  return json(await acceptInvitation(token, name, password), 201);
});
