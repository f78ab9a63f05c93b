// Development and tests only (admin): the messages the local fake SMTP server caught.
import { z } from "zod";
import { endpoint, readParams } from "@/server/http/handler";
import { notFound } from "@/server/http/errors";
import { devMailEnabled, listDevMail } from "@/server/mail/mail.server";

export const GET = endpoint(async (ctx) => {
  if (!devMailEnabled()) throw notFound("The dev mailbox (it exists only with the local fake SMTP server)");
  const { limit } = readParams(
    Object.fromEntries(ctx.url.searchParams),
    z.object({ limit: z.coerce.number().int().min(1).max(500).default(100) }),
  );
  const rows = await listDevMail(limit);
  return {
    items: rows.map((m) => ({
      id: m.id,
      from: m.envelopeFrom,
      to: m.envelopeTo.split(", "),
      subject: m.subject,
      text: m.bodyText,
      receivedAt: m.receivedAt,
    })),
    nextCursor: null,
  };
});
