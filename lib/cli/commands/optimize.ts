// `optimize`: the best transmit FIR × CTLE × DFE setting for a pulse under a budget, with the proof.
import { optimizeRequestSchema } from "../../contract/optimize.ts";
import { optimize } from "../../optimize/optimize.ts";
import { defineCommand } from "../defineCommand.ts";

/**
 * `optimize`: → `{ tx: { taps }, ctle: { gDc_dB, gDc2_dB }, dfe: { taps, limits_V, clipped }, eye:
 * { eyeHeight_V, eyeWidth_UI }, limiterHeadroom_V, samplingPhase_UI, noiseRms_V, linearOnly: { … },
 * verdict: { linearReachExhausted, reasons, fewestDfeTaps }, clocking, surface, top, refinement, search,
 * crosstalk: { rms_V, perAggressor, eyeHeightWithoutCrosstalk_V, limiterHeadroomWithoutCrosstalk_V } | null, ffe }`.
 */
export const optimizeCommand = defineCommand({
  name: "optimize",
  schema: optimizeRequestSchema,
  errorPaths: { fallback: "budget" },
  run: (r) => optimize(r.pulse, r.budget, { topCount: r.topCount, aggressors: r.aggressors }),
});
