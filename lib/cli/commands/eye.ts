// `eye`: the statistical eye of an (already equalized) pulse.
import { eyeAnalysis } from "../../analysis/eyeAnalysis.ts";
import { eyeRequestSchema } from "../../contract/eye.ts";
import { defineCommand } from "../defineCommand.ts";

/**
 * `eye`: → `{ eyeHeight_V, eyeWidth_UI, samplingPhase_UI, bathtub: { phase_UI, log10Ber }, eyeHeights_V, policy }`
 * (for PAM4 `eyeHeight_V` is the smallest of the three eyes); with aggressors also `crosstalk: { rms_V,
 * perAggressor: [{ name, rms_V, phase_UI }] }` and `eyeHeightWithoutCrosstalk_V`.
 */
export const eyeCommand = defineCommand({
  name: "eye",
  schema: eyeRequestSchema,
  errorPaths: { aliases: { dfeTaps: "dfe.taps" }, fallback: "pulse" },
  run: (r) =>
    eyeAnalysis(r.pulse, {
      modulation: r.modulation,
      noiseRms_V: r.noiseRms_V,
      targetBer: r.targetBer,
      jitter: r.jitter,
      dfeTaps: r.dfe?.taps,
      policy: r.policy,
      aggressors: r.aggressors?.map((a, i) => ({ name: a.name ?? `aggressor ${i + 1}`, pulse: a.pulse })),
    }),
});
