// Channels: the list (sortable, filterable, paged) and creation from a file (multipart) or a loss model (JSON).
import { currentUser, endpoint, readParams } from "@/server/http/handler";
import { json } from "@/server/http/errors";
import { listQuery } from "@/features/channels/channels";
import { createChannel, listChannels } from "@/features/channels/channels.server";
import { readChannelRequest } from "@/features/channels/channelRequest.server";

export const GET = endpoint(async (ctx) =>
  listChannels(readParams(Object.fromEntries(ctx.url.searchParams), listQuery)),
);

export const POST = endpoint(async (ctx) => {
  const request = await readChannelRequest(ctx.request);
  return json(await createChannel(currentUser(ctx), request), 201);
});
