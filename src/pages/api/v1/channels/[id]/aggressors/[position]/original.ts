// An aggressor's own uploaded file, byte for byte (its SHA-256 in the X-Content-SHA256 header).
import { z } from "zod";
import { endpoint, readParams } from "@/server/http/handler";
import { downloadResponse } from "@/server/http/download";
import { aggressorOriginalFile } from "@/features/channels/channels.server";

const params = z.object({
  id: z.coerce.number({ error: "The id must be a number." }).int().positive(),
  position: z.coerce.number({ error: "The aggressor's position must be a number." }).int().min(0),
});

export const GET = endpoint(async (ctx) => {
  const { id, position } = readParams(ctx.params, params);
  return downloadResponse(await aggressorOriginalFile(id, position));
});
