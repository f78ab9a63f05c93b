// A budget moved to a corner: swing, noise, jitter and limiter sensitivity scaled by the corner's factors.
import { type Budget, type BudgetInput } from "../contract/budget.ts";
import type { Corner } from "../contract/corner.ts";
import { resolveBudget } from "../optimize/searchSpace.ts";

/**
 * The budget at a corner: `txSwing_Vppd × txSwingScale`, `noiseRms_V` and `inputNoiseRms_V ×
 * noiseScale`, `rjRms_UI` and `djPp_UI × jitterScale`, `limiterSensitivity_V × sensitivityScale`
 * (a missing factor is 1). Everything else — grids, BER target, required headroom — is the budget's.
 *
 * @param budget - the nominal budget (validated here).
 * @param corner - the corner's factors (its loss factor acts on the channel, not here).
 * @throws RangeError naming the corner and the field when a scaled value leaves the budget's range.
 */
export function cornerBudget(budget: BudgetInput | Budget, corner: Corner): Budget {
  const b = resolveBudget(budget);
  const swing = corner.txSwingScale ?? 1;
  const noise = corner.noiseScale ?? 1;
  const jitter = corner.jitterScale ?? 1;
  const sensitivity = corner.sensitivityScale ?? 1;
  const scaled: BudgetInput = {
    ...b,
    txSwing_Vppd: b.txSwing_Vppd * swing,
    noiseRms_V: b.noiseRms_V * noise,
    inputNoiseRms_V: b.inputNoiseRms_V * noise,
    limiterSensitivity_V: b.limiterSensitivity_V * sensitivity,
    ...(b.jitter === undefined
      ? {}
      : { jitter: { ...b.jitter, rjRms_UI: b.jitter.rjRms_UI * jitter, djPp_UI: b.jitter.djPp_UI * jitter } }),
  };
  try {
    return resolveBudget(scaled);
  } catch (e) {
    if (e instanceof RangeError) throw new RangeError(`corner "${corner.name}": ${e.message}`);
    throw e;
  }
}
