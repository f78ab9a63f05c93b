// The worker's part of a tap table version (runs in the engine worker pool, no I/O): per class the
// engine's minimax default on the register map's codes, and every channel under it.
import { resolveBudget } from "@lib/optimize";
import { pulseFromJson } from "@lib/pulse";
import { populationDefault } from "@lib/tables";
import { budgetForArchitecture, tableArchitectureProblem } from "./architectureBudget";
import type { ClassResult, VersionInputs, VersionResult } from "./tables";

/**
 * Computes a version from its inputs. Progress runs over the classes in proportion to their
 * channel counts.
 */
export function computeTableVersion(inputs: VersionInputs, engineVersion: string, onProgress: (fraction: number) => void): VersionResult {
  const problem = tableArchitectureProblem(inputs.architecture);
  if (problem) throw new Error(problem);
  const budget = resolveBudget(inputs.budget.params);
  const derived = budgetForArchitecture(budget, inputs.architecture);
  const total = inputs.classes.reduce((n, c) => n + c.channels.length, 0);
  let done = 0;
  const classes: ClassResult[] = inputs.classes.map((cls, index) => {
    const weight = cls.channels.length;
    const r = populationDefault(
      cls.channels.map((ch) => pulseFromJson(ch.pulse)),
      derived,
      { registerMap: inputs.registerMap, onProgress: (f) => onProgress((done + f * weight) / total) },
    );
    done += weight;
    return {
      index,
      name: cls.name,
      lossRange_dB: cls.lossRange_dB,
      codes: r.codes ?? {},
      values: r.values ?? {},
      worstHeadroom_V: r.worstHeadroom_V,
      channels: cls.channels.map((ch, j) => ({
        id: ch.id,
        name: ch.name,
        lossAtNyquist_dB: ch.lossAtNyquist_dB,
        defaultHeadroom_V: r.channels[j].defaultHeadroom_V,
        defaultEyeHeight_V: r.channels[j].defaultEyeHeight_V,
        ownHeadroom_V: r.channels[j].ownHeadroom_V,
        own: r.channels[j].own,
      })),
    };
  });
  return { engineVersion, requiredHeadroom_V: budget.requiredHeadroom_V, targetBer: budget.targetBer, classes, worstEye: null };
}
