// What the engine derives from a file (pulse, insertion loss, SDD21 for a port pairing), without saving it.
import { endpoint } from "@/server/http/handler";
import { previewChannel } from "@/features/channels/channels.server";
import { readChannelRequest } from "@/features/channels/channelRequest.server";

export const POST = endpoint(async (ctx) => previewChannel(await readChannelRequest(ctx.request, { fileOnly: true })));
