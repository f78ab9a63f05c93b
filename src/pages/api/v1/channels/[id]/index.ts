// One channel: its pulse, insertion loss and original file's fingerprint; deletion (runs keep their copy).
import { z } from "zod";
import { currentUser, endpoint, readParams } from "@/server/http/handler";
import { idParams } from "@/features/channels/channels";
import { deleteChannel, getChannel } from "@/features/channels/channels.server";

export const GET = endpoint(async (ctx) => getChannel(readParams(ctx.params, idParams).id));

const deleteQuery = z.object({ confirm: z.enum(["true", "1", "false", "0"]).optional() });

export const DELETE = endpoint(async (ctx) => {
  const { id } = readParams(ctx.params, idParams);
  const { confirm } = readParams(Object.fromEntries(ctx.url.searchParams), deleteQuery);
  return deleteChannel(currentUser(ctx), id, confirm === "true" || confirm === "1");
});
