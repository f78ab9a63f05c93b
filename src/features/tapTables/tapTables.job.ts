// The worker's part of a tap table version (runs in the engine worker pool, no I/O): per class the
// engine's minimax default on the register map's codes, and every channel under it.
import { resolveBudget } from "@lib/optimize";
import { pulseFromJson } from "@lib/pulse";
import { ENGINE_VERSION, tuningRun } from "@lib/run";
import { populationDefault, type PopulationResult } from "@lib/tapTables";
import { applyFir } from "@lib/equalizers";
import { budgetForArchitecture, receiverOnlyBudget, tapTableArchitectureProblem } from "./architectureBudget";
import type { ClassResult, VersionInputs, VersionResult, WorstEye } from "./tapTables";

/** Share of the progress bar the worst channel's eyes take at the end. */
const EYE_SHARE = 0.1;

/**
 * Computes a version from its inputs. Progress runs over the classes in proportion to their
 * channel counts, then the eyes of the worst channel under its class default.
 */
export function computeTapTableVersion(inputs: VersionInputs, onProgress: (fraction: number) => void): VersionResult {
  const problem = tapTableArchitectureProblem(inputs.architecture);
  if (problem) throw new Error(problem);
  const budget = resolveBudget(inputs.budget.params);
  const derived = resolveBudget(budgetForArchitecture(budget, inputs.architecture));
  const total = inputs.classes.reduce((n, c) => n + c.channels.length, 0);
  let done = 0;
  const defaults: PopulationResult[] = [];
  const classes: ClassResult[] = inputs.classes.map((cls, index) => {
    const weight = cls.channels.length;
    const r = populationDefault(
      cls.channels.map((ch) => pulseFromJson(ch.pulse)),
      derived,
      { registerMap: inputs.registerMap, onProgress: (f) => onProgress(((done + f * weight) / total) * (1 - EYE_SHARE)) },
    );
    defaults.push(r);
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
  const worstEye = eyesOfWorst(inputs, classes, defaults, derived, onProgress);
  onProgress(1);
  return { engineVersion: ENGINE_VERSION, requiredHeadroom_V: budget.requiredHeadroom_V, targetBer: budget.targetBer, classes, worstEye };
}

/**
 * The engine's tuning run of the worst channel with its class default: the channel through the
 * default's transmit FIR, tuned under a budget whose only setting is the default's receiver side.
 */
function eyesOfWorst(
  inputs: VersionInputs,
  classes: ClassResult[],
  defaults: PopulationResult[],
  derived: ReturnType<typeof resolveBudget>,
  onProgress: (fraction: number) => void,
): WorstEye {
  let ci = 0;
  let chi = 0;
  classes.forEach((c, i) =>
    c.channels.forEach((ch, j) => {
      if (ch.defaultHeadroom_V < classes[ci].channels[chi].defaultHeadroom_V) [ci, chi] = [i, j];
    }),
  );
  const setting = defaults[ci].setting;
  const channel = inputs.classes[ci].channels[chi];
  const withTx = applyFir(pulseFromJson(channel.pulse), Float64Array.from(setting.tx.taps), derived.tx.pre);
  const run = tuningRun(withTx, receiverOnlyBudget(derived, setting.ctle), (f) => onProgress(1 - EYE_SHARE + EYE_SHARE * f));
  return {
    channelId: channel.id,
    channelName: channel.name,
    className: classes[ci].name,
    headroom_V: run.metrics.limiterHeadroom_V,
    eyeHeight_V: run.metrics.eyeHeight_V,
    before: run.eyes.before,
    after: run.eyes.after,
  };
}
