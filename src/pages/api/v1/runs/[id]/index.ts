// One tuning run: status and progress, its inputs, and the result once done (?fields=status for polling);
// a finished run's detail is served from bytes serialized and compressed once.
import { z } from "zod";
import { endpoint, readParams } from "@/server/http/handler";
import { idParams } from "@/features/runs/runs";
import { runDetailResponse, runStatus } from "@/features/runs/runs.server";

const query = z.object({
  fields: z.enum(["status", "all"], { error: "fields must be status or all." }).default("all"),
});

export const GET = endpoint(async (ctx) => {
  const { id } = readParams(ctx.params, idParams);
  const { fields } = readParams(Object.fromEntries(ctx.url.searchParams), query);
  return fields === "status" ? runStatus(id) : runDetailResponse(ctx.request, id);
});
