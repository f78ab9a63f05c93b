// Long jobs as every feature sees them: the kinds the queue runs and the states a job goes
// through (the database schema's enums), the states the API tells, and which states are final.

/** The kinds of work the queue runs in the engine's worker pool. */
export const jobKinds = [
  "run",
  "study",
  "table-version",
  "table-class",
  "table-member",
  "sweep",
  "sweep-batch",
] as const;
export type JobKind = (typeof jobKinds)[number];

/** queued → running → done | failed; `waiting`: a parent job whose children are not all done yet (it is queued when the last one is). */
export const jobStatuses = ["queued", "waiting", "running", "done", "failed"] as const;
export type JobStatus = (typeof jobStatuses)[number];

/** A job's status as the API and the pages tell it (a parent waiting for its children is running). */
export type ApiJobStatus = Exclude<JobStatus, "waiting">;

/** Whether a job has ended (it will not move again by itself). */
export function isJobFinished(status: JobStatus): boolean {
  return status === "done" || status === "failed";
}
