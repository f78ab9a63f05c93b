// Tells the job queue how to run a tuning run: its input is the run's own copy of the channel's
// pulse and the budget; its result is stored on the run. Imported by src/server/background.server.ts.
import { registerJobKind } from "@/server/jobs/queue.server";
import type { TuningRunResult } from "@lib/run";
import { runJobInput, storeRunResult } from "./runs.server";

registerJobKind("run", {
  input: runJobInput,
  save: (tx, runId, result) => storeRunResult(tx, runId, result as TuningRunResult),
});
