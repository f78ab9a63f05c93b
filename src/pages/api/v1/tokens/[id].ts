// Revoke an API token: one's own, or (admin) anyone's.
import { z } from "zod";
import { currentUser, endpoint, readParams } from "@/server/http/handler";
import { revokeToken } from "@/features/tokens/tokens.server";

export const DELETE = endpoint(async (ctx) => {
  const { id } = readParams(ctx.params, z.object({ id: z.coerce.number().int().positive() }));
  await revokeToken(currentUser(ctx), id);
  return { id, revoked: true };
});
