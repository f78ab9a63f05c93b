// One sweep: progress (done of total pairs, time left), its inputs and results; when done each
// channel's binding corner (`worst`). ?fields=status answers only the progress, for polling.
import { z } from "zod";
import { endpoint, readParams } from "@/server/http/handler";
import { sweepParams } from "@/features/sweeps/sweeps";
import { getSweep, getSweepStatus } from "@/features/sweeps/sweeps.server";

const query = z.object({
  fields: z.enum(["status", "all"], { error: "fields must be status or all." }).default("all"),
});

export const GET = endpoint(async (ctx) => {
  const { id } = readParams(ctx.params, sweepParams);
  const { fields } = readParams(Object.fromEntries(ctx.url.searchParams), query);
  return fields === "status" ? getSweepStatus(id) : getSweep(id);
});
