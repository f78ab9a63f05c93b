// A channel's aggressors: neighbouring lanes' crosstalk into it (NEXT or FEXT), each with its
// crosstalk pulse at the victim's receiver, its coupling curve, its ICN and, when it came from a file
// of its own, that file byte for byte.
import { double, index, int, json, mysqlEnum, mysqlTable, varchar } from "drizzle-orm/mysql-core";
import { aggressorKinds, aggressorSources } from "@/features/channels/aggressors";
import type { StoredCurve, StoredPulse } from "@/features/channels/channels";
import { timestamps } from "./columns";
import { channels, longBlob } from "./channels";

export const channelAggressors = mysqlTable(
  "channel_aggressors",
  {
    id: int("id").autoincrement().primaryKey(),
    channelId: int("channel_id")
      .notNull()
      .references(() => channels.id, { onDelete: "cascade" }),
    /** Order in the upload (0, 1, …). */
    position: int("position").notNull(),
    name: varchar("name", { length: 200 }).notNull(),
    kind: mysqlEnum("kind", aggressorKinds).notNull(),
    source: mysqlEnum("source", aggressorSources).notNull(),
    /** Crosstalk pulse at the victim's receiver for a 1 V aggressor symbol. */
    pulse: json("pulse").$type<StoredPulse>().notNull(),
    /** 20·log10|X(f)| of the crosstalk path, when known in the frequency domain. */
    coupling: json("coupling").$type<StoredCurve | null>(),
    /** Integrated crosstalk noise for a 1 Vppd aggressor (peak amplitude 0.5 V), volts rms. */
    icnRms_V: double("icn_rms_v").notNull(),
    /** How the pulse was derived: the ports, the file's kind, the coupling model. */
    derivation: json("derivation").$type<Record<string, unknown>>().notNull(),
    /** The aggressor's own file, byte for byte (source "file" only). */
    filename: varchar("filename", { length: 255 }),
    contentType: varchar("content_type", { length: 100 }),
    size_bytes: int("size_bytes"),
    sha256: varchar("sha256", { length: 64 }),
    bytes: longBlob("bytes"),
    ...timestamps,
  },
  (t) => [index("channel_aggressors_channel_idx").on(t.channelId, t.position)],
);
