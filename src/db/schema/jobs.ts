// Long work kept in MariaDB: a queue of jobs run by the worker pool, and tuning runs.
import { bigint, double, index, int, json, mysqlEnum, mysqlTable, timestamp, varchar } from "drizzle-orm/mysql-core";
import { timestamps } from "./columns";
import { users } from "./auth";
import { channels, type StoredPulse } from "./channels";
import { budgets } from "./budgets";

export const jobKinds = ["run", "study", "table-version"] as const;
export type JobKind = (typeof jobKinds)[number];
export const jobStatuses = ["queued", "running", "done", "failed"] as const;
export type JobStatus = (typeof jobStatuses)[number];

/**
 * One unit of engine work. A server process claims a queued job by writing its own id into
 * `lockedBy` and keeps `lockedUntil` fresh while it works; a job whose lock lapsed (its server
 * died) is queued again.
 */
export const jobs = mysqlTable(
  "jobs",
  {
    id: int("id").autoincrement().primaryKey(),
    kind: mysqlEnum("kind", jobKinds).notNull(),
    targetId: int("target_id").notNull(),
    status: mysqlEnum("status", jobStatuses).notNull().default("queued"),
    progress: double("progress").notNull().default(0),
    error: varchar("error", { length: 2000 }),
    attempts: int("attempts").notNull().default(0),
    lockedBy: varchar("locked_by", { length: 64 }),
    lockedUntil: timestamp("locked_until", { fsp: 3 }),
    startedAt: timestamp("started_at", { fsp: 3 }),
    finishedAt: timestamp("finished_at", { fsp: 3 }),
    compute_ms: bigint("compute_ms", { mode: "number" }),
    ...timestamps,
  },
  (t) => [index("jobs_status_idx").on(t.status, t.id), index("jobs_target_idx").on(t.kind, t.targetId)],
);

/** What a run was computed from, copied at its start so that it never changes afterwards. */
export interface RunInputs {
  channel: { id: number; name: string; bitRate_bps: number; pulse: StoredPulse };
  budget: { id: number; name: string; params: Record<string, unknown> };
}

export const runs = mysqlTable(
  "runs",
  {
    id: int("id").autoincrement().primaryKey(),
    jobId: int("job_id")
      .notNull()
      .references(() => jobs.id),
    channelId: int("channel_id").references(() => channels.id, { onDelete: "set null" }),
    budgetId: int("budget_id").references(() => budgets.id, { onDelete: "set null" }),
    inputs: json("inputs").$type<RunInputs>().notNull(),
    /** The engine's tuning result (lib/run), when done. */
    result: json("result").$type<Record<string, unknown>>(),
    engineVersion: varchar("engine_version", { length: 40 }),
    /** A short summary for lists: headroom, eye height, the verdict and whether any DFE tap count closes the link. */
    summary: json("summary").$type<{ limiterHeadroom_V: number; eyeHeight_V: number; linearReachExhausted: boolean; closes?: boolean } | null>(),
    /** The run this one re-ran, if any. */
    rerunOf: int("rerun_of"),
    createdBy: varchar("created_by", { length: 36 }).references(() => users.id, { onDelete: "set null" }),
    ...timestamps,
  },
  (t) => [index("runs_channel_idx").on(t.channelId), index("runs_job_idx").on(t.jobId)],
);

export type Job = typeof jobs.$inferSelect;
export type Run = typeof runs.$inferSelect;
