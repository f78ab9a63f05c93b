// Corner sweeps: a sweep (its budget and corners), the channels it covers (copies of their pulses
// and of how each was made), and one result row per channel × corner pair.
import {
  boolean,
  double,
  index,
  int,
  json,
  mysqlEnum,
  mysqlTable,
  primaryKey,
  timestamp,
  unique,
  varchar,
} from "drizzle-orm/mysql-core";
import { channelKinds, type ChannelDerivation, type StoredPulse } from "@/features/channels/channels";
import type { PairSetting, SweepInputs, SweepSummary } from "@/features/sweeps/sweeps";
import { timestamps } from "./columns";
import { users } from "./auth";
import { budgets } from "./budgets";
import { jobs } from "./jobs";

export const sweeps = mysqlTable("sweeps", {
  id: int("id").autoincrement().primaryKey(),
  name: varchar("name", { length: 200 }).notNull(),
  /** The parent job: it waits for the batches, then gathers the summary. */
  jobId: int("job_id")
    .notNull()
    .references(() => jobs.id),
  budgetId: int("budget_id").references(() => budgets.id, { onDelete: "set null" }),
  inputs: json("inputs").$type<SweepInputs>().notNull(),
  pairCount: int("pair_count").notNull(),
  summary: json("summary").$type<SweepSummary>(),
  engineVersion: varchar("engine_version", { length: 40 }),
  createdBy: varchar("created_by", { length: 36 }).references(() => users.id, { onDelete: "set null" }),
  ...timestamps,
});

/** A sweep's copy of one channel: the pulse the nominal corner uses and what rebuilds it at other losses. */
export const sweepChannels = mysqlTable(
  "sweep_channels",
  {
    sweepId: int("sweep_id")
      .notNull()
      .references(() => sweeps.id, { onDelete: "cascade" }),
    /** Position in the sweep's channel list. */
    position: int("position").notNull(),
    /** The channel it was copied from (kept when the channel is deleted later). */
    channelId: int("channel_id").notNull(),
    kind: mysqlEnum("kind", channelKinds).notNull(),
    pulse: json("pulse").$type<StoredPulse>().notNull(),
    derivation: json("derivation").$type<ChannelDerivation>().notNull(),
  },
  (t) => [primaryKey({ columns: [t.sweepId, t.position] })],
);

/** One channel × corner pair's result; the unique key makes a pair's result a single row. */
export const sweepResults = mysqlTable(
  "sweep_results",
  {
    id: int("id").autoincrement().primaryKey(),
    sweepId: int("sweep_id")
      .notNull()
      .references(() => sweeps.id, { onDelete: "cascade" }),
    channelId: int("channel_id").notNull(),
    cornerIndex: int("corner_index").notNull(),
    limiterHeadroom_V: double("limiter_headroom_v"),
    eyeHeight_V: double("eye_height_v"),
    linearHeadroom_V: double("linear_headroom_v"),
    linearReachExhausted: boolean("linear_reach_exhausted"),
    fewestDfeTaps: int("fewest_dfe_taps"),
    setting: json("setting").$type<PairSetting>(),
    /** Why the engine refused this pair. */
    error: varchar("error", { length: 1000 }),
    compute_ms: int("compute_ms").notNull(),
    /** The batch job that stored it. */
    jobId: int("job_id").notNull(),
    createdAt: timestamp("created_at", { fsp: 3 }).notNull().defaultNow(),
  },
  (t) => [
    unique("sweep_results_pair").on(t.sweepId, t.channelId, t.cornerIndex),
    index("sweep_results_job_idx").on(t.jobId),
  ],
);

export type Sweep = typeof sweeps.$inferSelect;
export type SweepChannel = typeof sweepChannels.$inferSelect;
export type SweepResult = typeof sweepResults.$inferSelect;
