// What the engine derives from a file (pulse, insertion loss, SDD21 for a port pairing), without saving it.
import { endpoint } from "@/server/http/handler";
import { previewChannel, readChannelRequest } from "@/features/channels/channels.server";

export const POST = endpoint(async (ctx) => previewChannel(await readChannelRequest(ctx.request, { fileOnly: true })));
