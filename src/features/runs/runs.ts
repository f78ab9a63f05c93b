// Tuning runs: request schemas, the shapes the API answers, and small presentation helpers.
// No server code here: islands import this file.
import { z } from "zod";
import type { JobStatus, RunInputs } from "@/db/schema/jobs";

const id = (what: string) => z.number({ error: `${what} must be a number.` }).int(`${what} must be an integer.`).positive(`${what} must be positive.`);

/** POST /api/v1/runs. */
export const startRunRequest = z.object({ channelId: id("channelId"), budgetId: id("budgetId") });
export type StartRunRequest = z.infer<typeof startRunRequest>;

export const listQuery = z.object({
  limit: z.coerce.number().int().min(1).max(200).default(50),
  cursor: z.coerce.number().int().min(0).optional(),
  channelId: z.coerce.number().int().positive().optional(),
  budgetId: z.coerce.number().int().positive().optional(),
});
export type RunListQuery = z.input<typeof listQuery>;

export const idParams = z.object({ id: z.coerce.number({ error: "The id must be a number." }).int().positive() });

/** The short summary a finished run keeps for lists. */
export interface RunSummary {
  limiterHeadroom_V: number;
  eyeHeight_V: number;
  linearReachExhausted: boolean;
}

/** A row of a run list. */
export interface RunListItem {
  id: number;
  status: JobStatus;
  progress: number;
  channel: { id: number | null; name: string };
  budget: { id: number | null; name: string };
  summary: RunSummary | null;
  error: string | null;
  createdBy: string | null;
  createdAt: string | Date;
  finishedAt: string | Date | null;
}

/** When the run was queued, started and finished, and how long the engine computed. */
export interface RunTimings {
  queuedAt: string | Date;
  startedAt: string | Date | null;
  finishedAt: string | Date | null;
  compute_ms: number | null;
}

/** GET /api/v1/runs/:id. `result` holds the engine's tuning result once the run is done. */
export interface RunView extends RunListItem {
  jobId: number;
  inputs: RunInputs;
  result: Record<string, unknown> | null;
  engineVersion: string | null;
  rerunOf: number | null;
  timings: RunTimings;
}

export const statusLabels: Record<JobStatus, string> = { queued: "Queued", running: "Running", done: "Done", failed: "Failed" };

/** Badge classes for a status. */
export function statusClass(status: JobStatus): string {
  return { queued: "bg-line text-ink-soft", running: "bg-warn-soft text-warn", done: "bg-good-soft text-good", failed: "bg-bad-soft text-bad" }[status];
}

/** Milliseconds between two instants, or null. */
export function elapsed_ms(from: string | Date | null, to: string | Date | null): number | null {
  if (!from || !to) return null;
  return new Date(to).getTime() - new Date(from).getTime();
}

/** A duration for people: "850 ms", "2.4 s", "1 min 12 s". */
export function formatDuration(ms: number | null): string {
  if (ms === null) return "—";
  if (ms < 1000) return `${Math.round(ms)} ms`;
  if (ms < 60_000) return `${(ms / 1000).toFixed(1)} s`;
  return `${Math.floor(ms / 60_000)} min ${Math.round((ms % 60_000) / 1000)} s`;
}

/** Names of transmit FIR taps from the earliest pre-cursor tap: c(−1), c(0), c(+1), … */
export function firTapLabels(count: number, pre: number): string[] {
  return Array.from({ length: count }, (_, j) => {
    const k = j - pre;
    return `c(${k > 0 ? "+" : k < 0 ? "−" : ""}${Math.abs(k)})`;
  });
}

/** Columns of a trajectory: `rows[k][j]` → one array per tap j. */
export function byTap(rows: readonly (readonly number[])[]): number[][] {
  const n = rows[0]?.length ?? 0;
  return Array.from({ length: n }, (_, j) => rows.map((r) => r[j]));
}

/** The receiver's figure of merit of transmit training (ISI + noise over the main cursor squared) as an SNR in dB. */
export function trainingSnr_dB(objective: number): number {
  return -10 * Math.log10(objective);
}

/** The eye's target BER as people write it: "1e-12". */
export function formatBer(ber: number): string {
  return ber.toExponential(0).replace("e+", "e");
}
