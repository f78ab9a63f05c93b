// Admin: everyone with an account, and the open invitations.
import { endpoint } from "@/server/http/handler";
import { listOpenInvitations, listPeople } from "@/features/people/people.server";

export const GET = endpoint(async () => ({
  items: await listPeople(),
  invitations: await listOpenInvitations(),
  nextCursor: null,
}));
