// The watched cursors of a CTLE channel as linear functions of the transmit FIR taps, per sampling
// phase: what every headroom bound multiplies the taps (or a box of them) by.
import type { CtleChannel } from "../ctleChannel.ts";
import type { SearchSpace } from "../searchSpace.ts";
import type { BoundSetup } from "./boundSetup.ts";

/** The watched cursors' coefficients at one absolute sampling phase. */
export interface PhaseCoefficients {
  /** `watched × tapCount`: cursor `offsets[f]` is `Σ_j c_j·v[f·tapCount + j]`, volts per unit tap. */
  readonly v: Float64Array;
  /** `s·max_j Σ|h|` over the cursors the bound does not watch: bounds their Σ|r|, volts. */
  readonly tail: number;
}

/** Coefficients by absolute phase (samples from the main cursor). */
export type CoefficientSource = (p: number) => PhaseCoefficients;

/**
 * Coefficients of the watched cursors at phase `p` (samples from the main cursor), scaled by the
 * symbol amplitude `space.scale_V`.
 */
export function phaseCoefficients(
  setup: BoundSetup,
  space: SearchSpace,
  channel: CtleChannel,
  p: number,
): PhaseCoefficients {
  const h = channel.cursors(p);
  const tapCount = setup.tapCount;
  const watchedCount = setup.offsets.length;
  const base = channel.pre + space.firSpec.pre;
  const s = space.scale_V;
  const v = new Float64Array(watchedCount * tapCount);
  let total = 0;
  for (let i = 0; i < h.length; i++) total += Math.abs(h[i]);
  let tail = 0;
  for (let j = 0; j < tapCount; j++) {
    let watched = 0;
    for (let f = 0; f < watchedCount; f++) {
      const i = base + setup.offsets[f] - j;
      if (i >= 0 && i < h.length) {
        v[f * tapCount + j] = s * h[i];
        watched += Math.abs(h[i]);
      }
    }
    tail = Math.max(tail, total - watched);
  }
  return { v, tail: s * tail };
}

/** A {@link CoefficientSource} for one channel that computes each phase's coefficients once. */
export function cachedCoefficients(setup: BoundSetup, space: SearchSpace, channel: CtleChannel): CoefficientSource {
  const cache = new Map<number, PhaseCoefficients>();
  return (p: number): PhaseCoefficients => {
    let c = cache.get(p);
    if (c === undefined) {
      c = phaseCoefficients(setup, space, channel, p);
      cache.set(p, c);
    }
    return c;
  };
}
