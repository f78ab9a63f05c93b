// The people a sign-off may be asked of (reviewers and admins).
import { endpoint } from "@/server/http/handler";
import { listReviewers } from "@/features/signoff/signoff.server";

export const GET = endpoint(async () => ({ items: await listReviewers(), nextCursor: null }));
