// The audit trail and the mail the product sends (an outbox written in the same transaction as
// the action it reports, so no decision is lost without its e-mail, and no e-mail without its decision).
import { index, int, json, mysqlEnum, mysqlTable, text, timestamp, varchar } from "drizzle-orm/mysql-core";
import { timestamps } from "./columns";
import { users } from "./auth";

export const auditEvents = mysqlTable(
  "audit_events",
  {
    id: int("id").autoincrement().primaryKey(),
    actorId: varchar("actor_id", { length: 36 }).references(() => users.id, { onDelete: "set null" }),
    actorEmail: varchar("actor_email", { length: 254 }),
    /** What happened, as `area.verb`: `channel.upload`, `run.start`, `user.role`, … */
    action: varchar("action", { length: 64 }).notNull(),
    /** The kind and id of the thing acted on: `channel` / `12`. */
    targetType: varchar("target_type", { length: 32 }),
    targetId: varchar("target_id", { length: 64 }),
    detail: json("detail").$type<Record<string, unknown>>(),
    createdAt: timestamp("created_at", { fsp: 3 }).notNull().defaultNow(),
  },
  (t) => [index("audit_action_idx").on(t.action), index("audit_created_idx").on(t.createdAt)],
);

export const mailStatuses = ["queued", "sent", "failed"] as const;

export const mailOutbox = mysqlTable(
  "mail_outbox",
  {
    id: int("id").autoincrement().primaryKey(),
    toAddress: varchar("to_address", { length: 1000 }).notNull(),
    subject: varchar("subject", { length: 300 }).notNull(),
    bodyText: text("body_text").notNull(),
    status: mysqlEnum("status", mailStatuses).notNull().default("queued"),
    attempts: int("attempts").notNull().default(0),
    lastError: varchar("last_error", { length: 1000 }),
    sentAt: timestamp("sent_at", { fsp: 3 }),
    ...timestamps,
  },
  (t) => [index("mail_outbox_status_idx").on(t.status)],
);

/** Messages caught by the local fake SMTP server (development and tests only). */
export const devMailbox = mysqlTable("dev_mailbox", {
  id: int("id").autoincrement().primaryKey(),
  envelopeFrom: varchar("envelope_from", { length: 254 }),
  envelopeTo: varchar("envelope_to", { length: 1000 }).notNull(),
  subject: varchar("subject", { length: 300 }),
  bodyText: text("body_text"),
  raw: text("raw").notNull(),
  receivedAt: timestamp("received_at", { fsp: 3 }).notNull().defaultNow(),
});

export type AuditEvent = typeof auditEvents.$inferSelect;
