// One tuning run: status and progress, its inputs, and the result once done (?fields=status for polling).
import { z } from "zod";
import { endpoint, readParams } from "@/server/http/handler";
import { idParams } from "@/features/runs/runs";
import { getRun, runStatus } from "@/features/runs/runs.server";

const query = z.object({ fields: z.enum(["status", "all"], { error: "fields must be status or all." }).default("all") });

export const GET = endpoint(async (ctx) => {
  const { id } = readParams(ctx.params, idParams);
  const { fields } = readParams(Object.fromEntries(ctx.url.searchParams), query);
  return fields === "status" ? runStatus(id) : getRun(id);
});
