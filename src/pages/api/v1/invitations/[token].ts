// Admin: revoke an open invitation by its id (the segment beside accept/ is the link's secret there;
// here it is the id the invitation list shows). Its link stops working at once.
import { z } from "zod";
import { currentUser, endpoint, readParams } from "@/server/http/handler";
import { revokeInvitation } from "@/features/people/people.server";

export const DELETE = endpoint(async (ctx) => {
  const { token: id } = readParams(ctx.params, z.object({ token: z.coerce.number().int().positive() }));
  await revokeInvitation(currentUser(ctx), id);
  return { id, revoked: true };
});
