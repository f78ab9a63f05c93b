// The engine's work for one tuning run, shared by the worker pool and the demo seed so that both
// store the same result: the run's copied pulse and budget in, lib/run's TuningRunResult out.
import { pulseFromJson } from "@lib/pulse";
import { tuningRun, type TuningRunResult } from "@lib/run";
import type { BudgetInput } from "@lib/contract/budget";
import type { StoredPulse } from "@/features/channels/channels";
import type { RunAggressor } from "./runs";

/** What the worker receives for a run: the copies taken when the run started. */
export interface RunJobInput {
  pulse: StoredPulse;
  budget: BudgetInput;
  /** The channel's aggressors (omitted: none). */
  aggressors?: RunAggressor[];
}

export function computeRun(input: RunJobInput, onProgress?: (fraction: number) => void): TuningRunResult {
  const aggressors = (input.aggressors ?? []).map((a) => ({
    name: a.name,
    kind: a.kind,
    pulse: pulseFromJson(a.pulse),
  }));
  return tuningRun(pulseFromJson(input.pulse), input.budget, onProgress, aggressors);
}
