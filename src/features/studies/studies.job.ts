// The worker's part of an architecture study (runs in the engine worker pool, no I/O): the engine's
// architecture evaluation over the study's channels, labelled for people.
import { resolveBudget } from "@lib/optimize";
import { pulseFromJson } from "@lib/pulse";
import { ENGINE_VERSION } from "@lib/run";
import { evaluateArchitectures } from "@lib/tapTables";
import type { StudyInputs, StudyResult } from "./studies";

export function computeStudy(inputs: StudyInputs, onProgress: (fraction: number) => void): StudyResult {
  const budget = resolveBudget(inputs.budget.params);
  const outcomes = evaluateArchitectures(
    inputs.channels.map((c) => pulseFromJson(c.pulse)),
    inputs.budget.params,
    inputs.candidates.map(({ key, tx, ctle, dfeTaps, ffe }) => ({ key, tx, ctle, dfeTaps, ffe })),
    onProgress,
    // Each channel's aggressors are in every candidate's eyes (none: the channel alone).
    inputs.channels.map((c) =>
      (c.aggressors ?? []).map((a) => ({ name: a.name, kind: a.kind, pulse: pulseFromJson(a.pulse) })),
    ),
  );
  return {
    engineVersion: ENGINE_VERSION,
    requiredHeadroom_V: budget.requiredHeadroom_V,
    targetBer: budget.targetBer,
    candidates: outcomes.map((o, i) => {
      const a = inputs.candidates[i];
      const lost = o.headroom_V.findIndex((h) => !Number.isFinite(h));
      if (lost !== -1) {
        throw new Error(
          `“${a.label}” has no legal setting for “${inputs.channels[lost].name}” under the budget (check the transmit FIR's ranges and step).`,
        );
      }
      return {
        key: a.key,
        label: a.label,
        architecture: a,
        complexity: o.complexity,
        worstHeadroom_V: o.worstHeadroom_V,
        medianHeadroom_V: o.medianHeadroom_V,
        worstChannel: { id: inputs.channels[o.worstChannel].id, name: inputs.channels[o.worstChannel].name },
        channels: inputs.channels.map((c, j) => ({ id: c.id, name: c.name, headroom_V: o.headroom_V[j] })),
      };
    }),
  };
}
