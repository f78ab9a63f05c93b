// The uploaded file, byte for byte (its SHA-256 in the X-Content-SHA256 header).
import { endpoint, readParams } from "@/server/http/handler";
import { idParams } from "@/features/channels/channels";
import { originalFile } from "@/features/channels/channels.server";

export const GET = endpoint(async (ctx) => originalFile(readParams(ctx.params, idParams).id));
