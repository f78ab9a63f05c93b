// Admin: the audit trail, newest first, with filters.
import { z } from "zod";
import { endpoint, readParams } from "@/server/http/handler";
import { listAudit } from "@/server/audit/audit.server";

const query = z.object({
  action: z.string().max(64).optional(),
  actor: z.string().max(254).optional(),
  targetType: z.string().max(32).optional(),
  from: z.coerce.date().optional(),
  to: z.coerce.date().optional(),
  limit: z.coerce.number().int().min(1).max(500).default(100),
  cursor: z.coerce.number().int().positive().optional(),
});

export const GET = endpoint(async (ctx) => listAudit(readParams(Object.fromEntries(ctx.url.searchParams), query)));
