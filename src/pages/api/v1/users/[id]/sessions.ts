// Admin: end every session of a person (they must sign in again).
import { z } from "zod";
import { currentUser, endpoint, readParams } from "@/server/http/handler";
import { endSessions } from "@/features/people/people.server";

export const DELETE = endpoint(async (ctx) =>
  endSessions(currentUser(ctx), readParams(ctx.params, z.object({ id: z.string().min(1).max(36) })).id),
);
