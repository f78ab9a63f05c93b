// The job queue for admins: the backend, job rows by status, and the workers computing them.
import { endpoint } from "@/server/http/handler";
import { queueOverview } from "@/server/jobs/queue.server";

export const GET = endpoint(async () => queueOverview());
