// Architecture studies: candidate equalizer architectures over a set of channels, and the decision.
import { int, json, mysqlTable, timestamp, varchar } from "drizzle-orm/mysql-core";
import type { StudyDecision, StudyInputs, StudyResult } from "@/features/studies/studies";
import { timestamps } from "./columns";
import { users } from "./auth";
import { budgets } from "./budgets";
import { jobs } from "./jobs";

export const studies = mysqlTable("architecture_studies", {
  id: int("id").autoincrement().primaryKey(),
  name: varchar("name", { length: 200 }).notNull(),
  jobId: int("job_id")
    .notNull()
    .references(() => jobs.id),
  budgetId: int("budget_id").references(() => budgets.id, { onDelete: "set null" }),
  /** Copies of the channels (id, name, pulse), the budget and the candidates, taken at the start. */
  inputs: json("inputs").$type<StudyInputs>().notNull(),
  result: json("result").$type<StudyResult>(),
  engineVersion: varchar("engine_version", { length: 40 }),
  decision: json("decision").$type<StudyDecision | null>(),
  decidedBy: varchar("decided_by", { length: 36 }).references(() => users.id, { onDelete: "set null" }),
  decidedAt: timestamp("decided_at", { fsp: 3 }),
  createdBy: varchar("created_by", { length: 36 }).references(() => users.id, { onDelete: "set null" }),
  ...timestamps,
});

export type Study = typeof studies.$inferSelect;
