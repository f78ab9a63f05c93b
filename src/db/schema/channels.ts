// Programs (the product or board channels belong to), channels with their derived pulse response,
// and the original upload kept byte for byte.
import { customType, double, index, int, json, mysqlEnum, mysqlTable, varchar } from "drizzle-orm/mysql-core";
import type { InputQuality } from "@lib/channel";
import { channelKinds, type ChannelDerivation, type StoredCurve, type StoredPulse } from "@/features/channels/channels";
import { timestamps } from "./columns";
import { users } from "./auth";

/** Raw bytes (MariaDB LONGBLOB) as a Node Buffer. */
export const longBlob = customType<{ data: Buffer; driverData: Buffer }>({
  dataType: () => "longblob",
});

export const programs = mysqlTable("programs", {
  id: int("id").autoincrement().primaryKey(),
  name: varchar("name", { length: 200 }).notNull().unique(),
  description: varchar("description", { length: 2000 }),
  ...timestamps,
});

export const channels = mysqlTable(
  "channels",
  {
    id: int("id").autoincrement().primaryKey(),
    programId: int("program_id")
      .notNull()
      .references(() => programs.id),
    name: varchar("name", { length: 200 }).notNull(),
    kind: mysqlEnum("kind", channelKinds).notNull(),
    bitRate_bps: double("bit_rate_bps").notNull(),
    pulse: json("pulse").$type<StoredPulse>().notNull(),
    insertionLoss: json("insertion_loss").$type<StoredCurve | null>(),
    /** Insertion loss at Nyquist in dB (positive = loss), when the source is in the frequency domain. */
    lossAtNyquist_dB: double("loss_at_nyquist_db"),
    mainCursor_V: double("main_cursor_v").notNull(),
    /** How the pulse was derived: the loss model, the port pairing, the response kind… */
    derivation: json("derivation").$type<ChannelDerivation>().notNull(),
    /** The engine's judgement of an uploaded Touchstone file (passivity, causality, band…); null for other sources. */
    quality: json("quality").$type<InputQuality | null>(),
    createdBy: varchar("created_by", { length: 36 }).references(() => users.id, { onDelete: "set null" }),
    ...timestamps,
  },
  (t) => [index("channels_program_idx").on(t.programId)],
);

/** The uploaded file, byte for byte, with its SHA-256 (one row per channel that came from a file). */
export const channelSources = mysqlTable("channel_sources", {
  channelId: int("channel_id")
    .primaryKey()
    .references(() => channels.id, { onDelete: "cascade" }),
  filename: varchar("filename", { length: 255 }).notNull(),
  contentType: varchar("content_type", { length: 100 }).notNull(),
  size_bytes: int("size_bytes").notNull(),
  sha256: varchar("sha256", { length: 64 }).notNull(),
  bytes: longBlob("bytes").notNull(),
});

export type Channel = typeof channels.$inferSelect;
