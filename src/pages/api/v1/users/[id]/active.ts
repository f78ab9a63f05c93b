// Admin: deactivate a person (their sessions and API tokens end, they cannot sign in) or let them back in.
import { z } from "zod";
import { currentUser, endpoint, readJson, readParams } from "@/server/http/handler";
import { setActive } from "@/features/people/people.server";
import { setActiveRequest } from "@/features/people/people";

export const PUT = endpoint(async (ctx) => {
  const { id } = readParams(ctx.params, z.object({ id: z.string().min(1).max(36) }));
  const { active } = await readJson(ctx.request, setActiveRequest);
  await setActive(currentUser(ctx), id, active);
  return { id, active };
});
