// Tap tables for firmware: a table names the architecture, budget and register map; each version
// holds the channel classes, the quantized default per class, and every channel's headroom.
import {
  double,
  index,
  int,
  json,
  mysqlEnum,
  mysqlTable,
  timestamp,
  uniqueIndex,
  varchar,
} from "drizzle-orm/mysql-core";
import { versionStates, type VersionInputs, type VersionResult } from "@/features/tapTables/tapTables";
import { timestamps } from "./columns";
import { users } from "./auth";
import { budgets } from "./budgets";
import { jobs } from "./jobs";
import { studies } from "./studies";

export const tapTables = mysqlTable("tap_tables", {
  id: int("id").autoincrement().primaryKey(),
  name: varchar("name", { length: 200 }).notNull().unique(),
  description: varchar("description", { length: 2000 }),
  studyId: int("study_id").references(() => studies.id, { onDelete: "set null" }),
  createdBy: varchar("created_by", { length: 36 }).references(() => users.id, { onDelete: "set null" }),
  ...timestamps,
});

export const tapTableVersions = mysqlTable(
  "tap_table_versions",
  {
    id: int("id").autoincrement().primaryKey(),
    tableId: int("table_id")
      .notNull()
      .references(() => tapTables.id, { onDelete: "cascade" }),
    version: int("version").notNull(),
    state: mysqlEnum("state", versionStates).notNull().default("computing"),
    jobId: int("job_id")
      .notNull()
      .references(() => jobs.id),
    budgetId: int("budget_id").references(() => budgets.id, { onDelete: "set null" }),
    /** Copies of the budget, the architecture, the register map and the classes with their channels. */
    inputs: json("inputs").$type<VersionInputs>().notNull(),
    /** Per class and per channel results of the minimax, when computed. */
    result: json("result").$type<VersionResult>(),
    engineVersion: varchar("engine_version", { length: 40 }),
    note: varchar("note", { length: 2000 }),
    frozenAt: timestamp("frozen_at", { fsp: 3 }),
    createdBy: varchar("created_by", { length: 36 }).references(() => users.id, { onDelete: "set null" }),
    ...timestamps,
  },
  (t) => [uniqueIndex("tap_table_versions_table_version").on(t.tableId, t.version)],
);

/** One row per channel class: its register codes and the physical values they stand for. */
export const tapTableRows = mysqlTable(
  "tap_table_rows",
  {
    id: int("id").autoincrement().primaryKey(),
    versionId: int("version_id")
      .notNull()
      .references(() => tapTableVersions.id, { onDelete: "cascade" }),
    classIndex: int("class_index").notNull(),
    className: varchar("class_name", { length: 100 }).notNull(),
    codes: json("codes").$type<Record<string, number>>().notNull(),
    values: json("values").$type<Record<string, number>>().notNull(),
    worstHeadroom_V: double("worst_headroom_v").notNull(),
    channelCount: int("channel_count").notNull(),
  },
  (t) => [index("tap_table_rows_version_idx").on(t.versionId)],
);

export type TapTable = typeof tapTables.$inferSelect;
export type TapTableVersion = typeof tapTableVersions.$inferSelect;
export type TapTableRow = typeof tapTableRows.$inferSelect;
