// The figures of one statistical eye that the `eye` command reports: where it is sampled, how tall
// and wide it is at the target BER, and its bathtub.
import { DEFAULT_SAMPLING_POLICY, samplingPhase, type SamplingPolicy } from "../clocking/samplingPhase.ts";
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
}

/**
 * Statistical eye of a pulse (volts at the sampler, already equalized) at `targetBer`: sampling
 * phase by the policy within ±½ UI of `mainIndex`, vertical openings there, eye width from the
 * bathtub at the decision thresholds of that phase, and the bathtub itself (1 UI).
 *
 * @param pulse - the pulse response in volts.
 * @param options - eye options plus the target bit error ratio and the policy (default "centre", as
 *   a budget's).
 */
export function eyeAnalysis(
  pulse: Pulse,
  options: StatisticalEyeOptions & { readonly targetBer: number; readonly policy?: SamplingPolicy },
): EyeAnalysis {
  const ber = options.targetBer;
  if (!(Number.isFinite(ber) && ber > 0 && ber < 0.25)) throw new RangeError(`targetBer must be a number in (0, 0.25), got ${String(ber)}`);
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
