// Outgoing e-mail: written to mail_outbox inside the action's transaction, then delivered through
// nodemailer to the configured SMTP server (the local fake in development and tests), with retries.
import nodemailer from "nodemailer";
import { and, asc, desc, eq, lt } from "drizzle-orm";
import { db, type DbOrTx } from "@/server/db.server";
import { devMailbox, mailOutbox } from "@/db/schema";
import { config } from "@/server/config.server";
import { logError } from "@/server/http/logError";

const MAX_ATTEMPTS = 5;

/**
 * A sent message's text as the outbox keeps it: invitation links carry a secret that works once,
 * and once the message is delivered the outbox has no reason to hold it in plain text.
 */
export function withoutSecrets(text: string): string {
  return text.replace(/\/invite\/[A-Za-z0-9_-]+/g, "/invite/[link removed after delivery]");
}

function transport() {
  return nodemailer.createTransport({
    host: config.smtp.host,
    port: config.smtp.port,
    secure: config.smtp.secure,
    connectionTimeout: 10_000,
    greetingTimeout: 10_000,
    socketTimeout: 20_000,
    ignoreTLS: config.smtp.ignoreTls,
    auth: config.smtp.auth,
  });
}

export interface Mail {
  to: string[];
  subject: string;
  text: string;
}

/** Queues a message as part of the caller's transaction; call `deliverQueuedMail()` after commit. */
export async function enqueueMail(tx: DbOrTx, mail: Mail): Promise<void> {
  await tx.insert(mailOutbox).values({ toAddress: mail.to.join(", "), subject: mail.subject, bodyText: mail.text });
}

let delivering: Promise<void> | null = null;
let passRequested = false;

/** One pass over the outbox: sends what is queued; failures stay queued for a retry. */
async function deliveryPass(): Promise<void> {
  const queued = await db
    .select()
    .from(mailOutbox)
    .where(and(eq(mailOutbox.status, "queued"), lt(mailOutbox.attempts, MAX_ATTEMPTS)))
    .orderBy(asc(mailOutbox.id))
    .limit(50);
  if (queued.length === 0) return;
  const t = transport();
  try {
    for (const m of queued) {
      try {
        await t.sendMail({
          from: config.smtp.from,
          to: m.toAddress,
          subject: m.subject,
          text: m.bodyText,
        });
        await db
          .update(mailOutbox)
          .set({ status: "sent", sentAt: new Date(), attempts: m.attempts + 1, bodyText: withoutSecrets(m.bodyText) })
          .where(eq(mailOutbox.id, m.id));
      } catch (e) {
        const attempts = m.attempts + 1;
        await db
          .update(mailOutbox)
          .set({
            attempts,
            lastError: String((e as Error).message).slice(0, 1000),
            status: attempts >= MAX_ATTEMPTS ? "failed" : "queued",
          })
          .where(eq(mailOutbox.id, m.id));
      }
    }
  } finally {
    t.close();
  }
}

/**
 * Delivers the outbox, one delivery loop at a time. A call made while a pass runs asks for one
 * more pass (the running one took its batch before the caller's message was queued), and its
 * promise settles when that pass is done.
 */
export function deliverQueuedMail(): Promise<void> {
  passRequested = true;
  delivering ??= (async () => {
    try {
      while (passRequested) {
        passRequested = false;
        await deliveryPass();
      }
    } finally {
      delivering = null;
    }
  })();
  return delivering;
}

let retryTimer: NodeJS.Timeout | undefined;
/** Retries queued mail every 30 s in the background (started once per process). */
export function startMailRetries(): void {
  retryTimer ??= setInterval(() => void deliverQueuedMail().catch((e) => logError("mail delivery", e)), 30_000).unref();
}

/** Messages the fake SMTP server caught (development and tests), newest first. */
export async function listDevMail(limit: number) {
  return db.select().from(devMailbox).orderBy(desc(devMailbox.id)).limit(limit);
}

export const devMailEnabled = () => config.devMail;
