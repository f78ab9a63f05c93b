// The uploaded file, byte for byte (its SHA-256 in the X-Content-SHA256 header).
import { endpoint, readParams } from "@/server/http/handler";
import { downloadResponse } from "@/server/http/download";
import { idParams } from "@/features/channels/channels";
import { originalFile } from "@/features/channels/channels.server";

export const GET = endpoint(async (ctx) => downloadResponse(await originalFile(readParams(ctx.params, idParams).id)));
