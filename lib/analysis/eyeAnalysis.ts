// The figures of one statistical eye that the `eye` command reports: where it is sampled, how tall
// and wide it is at the target BER, and its bathtub.
import { DEFAULT_SAMPLING_POLICY, samplingPhase, type SamplingPolicy } from "../clocking/samplingPhase.ts";
import { type CrosstalkParts, crosstalkParts, type SampledAggressor } from "../crosstalk/crosstalkParts.ts";
import type { Pulse } from "../types.ts";
import { bathtub, eyeWidth } from "./bathtub.ts";
import { type StatisticalEyeOptions, statisticalEye } from "./statisticalEye.ts";

/** The figures of a statistical eye at a target BER. */
export interface EyeAnalysis {
  /** Smallest vertical opening (PAM4: of the three eyes), volts. */
  readonly eyeHeight_V: number;
  /** Every eye's opening, bottom eye first (one for NRZ, three for PAM4). */
  readonly eyeHeights_V: number[];
  readonly eyeWidth_UI: number;
  /** Sampling phase in UI relative to the pulse's `mainIndex`, and the policy that chose it. */
  readonly samplingPhase_UI: number;
  readonly policy: SamplingPolicy;
  /** Error ratio over one UI around the sampling phase (phase in UI relative to `mainIndex`). */
  readonly bathtub: { readonly phase_UI: number[]; readonly log10Ber: number[] };
  /** With aggressors: the crosstalk's rms (all and per aggressor, with its worst phase). */
  readonly crosstalk?: { readonly rms_V: number; readonly perAggressor: CrosstalkParts["perAggressor"] };
  /** With aggressors: the eye height of the same pulse without them (at its own sampling phase). */
  readonly eyeHeightWithoutCrosstalk_V?: number;
}

/**
 * Statistical eye of a pulse (volts at the sampler, already equalized) at `targetBer`: sampling
 * phase by the policy within ±½ UI of `mainIndex`, vertical openings there, eye width from the
 * bathtub at the decision thresholds of that phase, and the bathtub itself (1 UI). Aggressors (their
 * crosstalk pulses at the same sampler, for a 1 V aggressor symbol) add their worst-phase parts to
 * every law ({@link crosstalkParts}); the figures then include crosstalk, and the eye height without
 * it is reported beside them.
 *
 * @param pulse - the pulse response in volts.
 * @param options - eye options plus the target bit error ratio, the policy (default "centre", as
 *   a budget's) and aggressors.
 */
export function eyeAnalysis(
  pulse: Pulse,
  options: StatisticalEyeOptions & {
    readonly targetBer: number;
    readonly policy?: SamplingPolicy;
    readonly aggressors?: readonly SampledAggressor[];
  },
): EyeAnalysis {
  const ber = options.targetBer;
  if (!(Number.isFinite(ber) && ber > 0 && ber < 0.25))
    throw new RangeError(`targetBer must be a number in (0, 0.25), got ${String(ber)}`);
  const aggressors = options.aggressors ?? [];
  aggressors.forEach((a, i) => {
    if (a.pulse.ui_s !== pulse.ui_s || a.pulse.samplesPerUi !== pulse.samplesPerUi) {
      throw new RangeError(`aggressors[${i}].pulse must share the pulse's ui_s and samplesPerUi`);
    }
  });
  if (aggressors.length > 0) {
    const xt = crosstalkParts(aggressors, options.modulation, options.noiseRms_V);
    const own = eyeAnalysis(pulse, { ...options, aggressors: [] });
    const noiseRms_V = Math.sqrt(options.noiseRms_V ** 2 + xt.lumpedVariance_V2);
    return {
      ...eyeAnalysis(pulse, { ...options, noiseRms_V, aggressors: [], extraParts_V: xt.parts_V }),
      crosstalk: { rms_V: xt.rms_V, perAggressor: xt.perAggressor },
      eyeHeightWithoutCrosstalk_V: own.eyeHeight_V,
    };
  }
  const eye = statisticalEye(pulse, options);
  const policy = options.policy ?? DEFAULT_SAMPLING_POLICY;
  const t = samplingPhase(eye, policy, ber);
  const tub = bathtub(eye, t, 1);
  const spu = pulse.samplesPerUi;
  const heights = eye.eyeHeights(t, ber);
  return {
    eyeHeight_V: Math.min(...heights),
    eyeHeights_V: Array.from(heights),
    eyeWidth_UI: eyeWidth(eye, t, ber).eyeWidth_UI,
    samplingPhase_UI: t / spu,
    policy,
    bathtub: { phase_UI: Array.from(tub.phase_UI), log10Ber: Array.from(tub.log10Ber) },
  };
}
