// Long work kept in MariaDB: a queue of jobs run by the worker pool, and tuning runs.
import { bigint, double, index, int, json, mysqlEnum, mysqlTable, timestamp, varchar } from "drizzle-orm/mysql-core";
import type { TuningRunResult } from "@lib/run";
import { jobKinds, jobStatuses } from "@/features/jobs/jobs";
import type { RunInputs, RunSummary } from "@/features/runs/runs";
import { timestamps } from "./columns";
import { users } from "./auth";
import { channels } from "./channels";
import { budgets } from "./budgets";

/** Which backend a job was handed to: the embedded dispatcher claims only its own rows. */
export const jobQueues = ["embedded", "bullmq"] as const;
export type JobQueue = (typeof jobQueues)[number];

/**
 * One unit of engine work, whichever backend runs it (the embedded dispatcher or BullMQ workers):
 * the row is the truth about its status and progress. Each attempt claims it with a fresh
 * `lockToken` and keeps `lockedUntil` fresh while it works; the result is stored only while the
 * token is still the row's (a late or duplicate attempt is fenced off), and a job whose lock lapsed
 * (its worker died) is queued again. A job may have a parent (`parentId`), which waits for all its
 * children; `part` tells siblings apart (a sweep's batches).
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
    queue: mysqlEnum("queue", jobQueues).notNull().default("embedded"),
    parentId: int("parent_id"),
    part: int("part"),
    lockToken: varchar("lock_token", { length: 36 }),
    lockedBy: varchar("locked_by", { length: 64 }),
    lockedUntil: timestamp("locked_until", { fsp: 3 }),
    startedAt: timestamp("started_at", { fsp: 3 }),
    finishedAt: timestamp("finished_at", { fsp: 3 }),
    compute_ms: bigint("compute_ms", { mode: "number" }),
    /** A child job's result when its parent reads it (a tap table class reads its members' own optima). */
    result: json("result").$type<unknown>(),
    ...timestamps,
  },
  (t) => [
    index("jobs_status_idx").on(t.status, t.id),
    index("jobs_queue_idx").on(t.queue, t.status, t.id),
    index("jobs_target_idx").on(t.kind, t.targetId),
    index("jobs_parent_idx").on(t.parentId, t.status),
  ],
);

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
    result: json("result").$type<TuningRunResult>(),
    engineVersion: varchar("engine_version", { length: 40 }),
    /** A short summary for lists: headroom, eye height, the verdict and whether any DFE tap count closes the link. */
    summary: json("summary").$type<RunSummary>(),
    /** The run this one re-ran, if any. */
    rerunOf: int("rerun_of"),
    createdBy: varchar("created_by", { length: 36 }).references(() => users.id, { onDelete: "set null" }),
    ...timestamps,
  },
  (t) => [index("runs_channel_idx").on(t.channelId), index("runs_job_idx").on(t.jobId)],
);

export type Job = typeof jobs.$inferSelect;
export type Run = typeof runs.$inferSelect;
