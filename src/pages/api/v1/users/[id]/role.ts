// Admin: change a person's role.
import { z } from "zod";
import { currentUser, endpoint, readJson, readParams } from "@/server/http/handler";
import { setRole } from "@/features/people/people.server";
import { setRoleRequest } from "@/features/people/people";

export const PUT = endpoint(async (ctx) => {
  const { id } = readParams(ctx.params, z.object({ id: z.string().min(1).max(36) }));
  const { role } = await readJson(ctx.request, setRoleRequest);
  await setRole(currentUser(ctx), id, role);
  return { id, role };
});
