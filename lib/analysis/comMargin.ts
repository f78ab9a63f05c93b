// A COM-style figure of merit: the signal over the noise-plus-interference amplitude, in dB.
import type { StatisticalEye } from "./statisticalEye.ts";

/** A channel-operating-margin style result. */
export interface ComMargin {
  /** `20·log10(As/Ani)` in dB. */
  readonly com_dB: number;
  /** Signal amplitude: half the level spacing times the main cursor (NRZ: h0; PAM4: h0/3), volts. */
  readonly as_V: number;
  /** Noise-plus-interference amplitude exceeded with probability `der0`, volts (> 0). */
  readonly ani_V: number;
}

/**
 * COM-style margin at sampling phase `t`: `COM = 20·log10(As/Ani)`, where `As` is the distance of
 * a level from its decision threshold and `Ani` the amount of ISI, noise and jitter that closes an
 * eye from that level with probability `der0` — a level's conditional tail, as the standard's
 * detector error ratio is, not a bit error ratio (the worst eye of PAM4):
 * `Ani = max_i (As − (top_i − bottom_i)/2)` from the eye edges at `der0`.
 * Tapwright's statistical eye supplies the distributions; the channel and package models of the
 * standard are not reproduced, so this is a margin in the COM form, not a compliance number.
 *
 * @param eye - statistical eye (volts at the sampler).
 * @param t - sampling phase in samples.
 * @param der0 - target detector error ratio, 0 < der0 < 0.5.
 * @see IEEE Std 802.3, Annex 93A (COM = 20·log10(As/Ani)) [memory: recalled, not re-read].
 */
export function comMargin(eye: StatisticalEye, t: number, der0: number): ComMargin {
  const edges = eye.levelEdges(t, der0);
  const spacing = eye.levels[1] - eye.levels[0];
  const as = 0.5 * spacing * eye.main(t);
  if (!(as > 0)) throw new RangeError(`the main cursor at phase ${t} is not positive (${eye.main(t)} V)`);
  let ani = -Infinity;
  for (let i = 0; 2 * i < edges.length; i++) ani = Math.max(ani, as - 0.5 * (edges[2 * i + 1] - edges[2 * i]));
  if (!(ani > 0)) {
    throw new RangeError("the noise-plus-interference amplitude is 0 (no noise, ISI or jitter): COM is unbounded");
  }
  return { com_dB: 20 * Math.log10(as / ani), as_V: as, ani_V: ani };
}
