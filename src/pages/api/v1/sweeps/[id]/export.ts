// Every channel × corner pair of a sweep as CSV (also with an API token).
import { endpoint, readParams } from "@/server/http/handler";
import { downloadResponse } from "@/server/http/download";
import { sweepParams } from "@/features/sweeps/sweeps";
import { exportSweep } from "@/features/sweeps/sweeps.server";

export const GET = endpoint(async (ctx) => {
  const { filename, body } = await exportSweep(readParams(ctx.params, sweepParams).id);
  return downloadResponse({ filename, contentType: "text/csv; charset=utf-8", body, cacheControl: "no-store" });
});
