// The signed-in person.
import { currentUser, endpoint } from "@/server/http/handler";

export const GET = endpoint(async (ctx) => {
  const { id, email, name, role } = currentUser(ctx);
  return { id, email, name, role };
});
