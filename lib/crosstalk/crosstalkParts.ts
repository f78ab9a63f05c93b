// Asynchronous aggressors as what the statistical eye convolves in: each one's crosstalk cursors at
// its worst phase, as independent two-point parts, with the rms each adds.
import { isiParts, PAM4_INNER_LEVEL } from "../analysis/isiParts.ts";
import type { Modulation, Pulse } from "../types.ts";
import { crosstalkRms, worstPhaseSampling } from "./aggressorSampling.ts";

/** An aggressor at the victim's sampler: its crosstalk pulse for a 1 V aggressor symbol, and its name. */
export interface SampledAggressor {
  readonly name: string;
  readonly pulse: Pulse;
}

/**
 * Parts below `noiseRms_V / LUMP_DIVISOR` join the Gaussian noise with their variance: the tail's
 * exponential rate is about `λ = Q/σ`, and a lumped part `m` misplaces its share of the tail's log
 * moment generating function by at most `(λm)²/12` (Q ≈ 7 at 1e-12: under 0.4 %). Aggressors carry
 * hundreds of such parts; lumping them keeps an eye with 8 aggressors as fast as one without.
 */
export const LUMP_DIVISOR = 32;

/** The crosstalk of a set of aggressors at the victim's sampler. */
export interface CrosstalkParts {
  /** Two-point magnitudes (volts) of the aggressors' cursors that stay parts, for the eye's `extraParts_V`. */
  readonly parts_V: Float64Array;
  /** Variance (V²) of the small parts joined to the Gaussian noise (see {@link LUMP_DIVISOR}). */
  readonly lumpedVariance_V2: number;
  /** Rms of all the crosstalk (powers add: the aggressors are independent), volts. */
  readonly rms_V: number;
  /** Per aggressor: its rms and its worst phase (UI from its crosstalk pulse's peak, in [−½, ½)). */
  readonly perAggressor: { readonly name: string; readonly rms_V: number; readonly phase_UI: number }[];
}

/** An aggressor's cursors at its worst phase, at the sampler. */
export interface SampledCursors {
  readonly name: string;
  /** Cursors in volts (a 1 V aggressor symbol, or its transmitter's swing when applied). */
  readonly cursors: ArrayLike<number>;
  /** The worst phase, UI from the crosstalk pulse's peak. */
  readonly phase_UI: number;
}

/**
 * Each aggressor sampled once per UI at its own worst phase ({@link worstPhaseSampling}) and turned
 * into independent two-point parts (`isiParts`: one per cursor for NRZ, two for PAM4 of ideal levels):
 * the aggressors' symbols are independent of the victim's and of each other and equiprobable, and
 * their clocks are not the victim's, so no DFE cancels them and the victim's jitter does not move
 * them. Parts far below the noise join it by their variance (central limit theorem; see
 * {@link LUMP_DIVISOR}). With no aggressors the parts are empty and the eye is unchanged.
 *
 * @param aggressors - crosstalk pulses at the sampler (same UI and samples per UI as the victim).
 * @param modulation - the link's modulation (the aggressors use the same).
 * @param noiseRms_V - the Gaussian noise at the sampler (0: nothing is lumped).
 */
export function crosstalkParts(
  aggressors: readonly SampledAggressor[],
  modulation: Modulation,
  noiseRms_V = 0,
): CrosstalkParts {
  if (!Array.isArray(aggressors)) throw new TypeError("aggressors must be an array");
  return combineCrosstalk(
    aggressors.map((a, i) => {
      if (a === null || typeof a !== "object") throw new TypeError(`aggressors[${i}] must be an object`);
      const s = worstPhaseSampling(a.pulse);
      return { name: a.name, cursors: s.cursors, phase_UI: s.phase_UI };
    }),
    modulation,
    noiseRms_V,
  );
}

/**
 * {@link crosstalkParts} from aggressors already sampled at their worst phases: their parts, those
 * below `noiseRms_V / LUMP_DIVISOR` lumped by variance, and each one's rms `√(E[a²]·Σx²)`.
 */
export function combineCrosstalk(
  sampled: readonly SampledCursors[],
  modulation: Modulation,
  noiseRms_V = 0,
): CrosstalkParts {
  if (!(Number.isFinite(noiseRms_V) && noiseRms_V >= 0))
    throw new RangeError(`noiseRms_V must be a finite number ≥ 0, got ${String(noiseRms_V)}`);
  const threshold = noiseRms_V / LUMP_DIVISOR;
  const kept: number[] = [];
  let lumpedVariance_V2 = 0;
  let power = 0;
  const perAggressor = sampled.map((a) => {
    const parts = isiParts(Float64Array.from(a.cursors), modulation, PAM4_INNER_LEVEL);
    for (const m of parts) {
      if (m >= threshold) kept.push(m);
      else lumpedVariance_V2 += m * m;
    }
    const rms_V = crosstalkRms(a.cursors, modulation);
    power += rms_V * rms_V;
    return { name: a.name, rms_V, phase_UI: a.phase_UI };
  });
  return { parts_V: Float64Array.from(kept), lumpedVariance_V2, rms_V: Math.sqrt(power), perAggressor };
}
