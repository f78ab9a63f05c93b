// An asynchronous aggressor seen by the victim's sampler: its crosstalk pulse sampled once per UI at
// the phase of largest energy, and the rms it adds.
import { assertPulse } from "../pulse/assertPulse.ts";
import type { Modulation, Pulse } from "../types.ts";

/** An aggressor's crosstalk cursors at its worst phase. */
export interface AggressorSampling {
  /** Sample offset 0 … samplesPerUi − 1 of the phase within the pulse record (samples `phase + k·samplesPerUi`). */
  readonly phase: number;
  /** The same phase in UI relative to the crosstalk pulse's `mainIndex` (its peak), within [−½, ½). */
  readonly phase_UI: number;
  /** The crosstalk cursors `x(t_x + k·UI)`, volts for a 1 V aggressor symbol (zeros dropped at both ends). */
  readonly cursors: Float64Array;
  /** `Σ_k x(t_x + k·UI)²`, V². */
  readonly energy_V2: number;
}

/** Mean square of a symbol: 1 for NRZ (±1), 5/9 for PAM4 (±1, ±1/3 equiprobable). */
export function symbolPower(modulation: Modulation): number {
  if (modulation === "nrz") return 1;
  if (modulation === "pam4") return 5 / 9;
  throw new RangeError(`modulation must be "nrz" or "pam4", got ${String(modulation)}`);
}

/**
 * The phase `t_x` among the pulse's `samplesPerUi` phases that maximizes `Σ_k x(t_x + k·UI)²` (the
 * first on ties), and the cursors there. An aggressor's symbols are independent of the victim's and its
 * clock is not the victim's, so its sampling phase is unknown; this worst case is the usual convention.
 *
 * @param pulse - the crosstalk pulse at the victim's sampler for a 1 V aggressor symbol.
 * @see IEEE 802.3, Annex 93A, crosstalk in COM: each aggressor at the phase of largest energy [memory:
 *   recalled, not re-read].
 */
export function worstPhaseSampling(pulse: Pulse): AggressorSampling {
  assertPulse(pulse);
  const spu = pulse.samplesPerUi;
  const v = pulse.values_V;
  let best = 0;
  let bestEnergy = -1;
  for (let ph = 0; ph < spu; ph++) {
    let e = 0;
    for (let i = ph; i < v.length; i += spu) e += v[i] * v[i];
    if (e > bestEnergy) {
      bestEnergy = e;
      best = ph;
    }
  }
  let first = best;
  let last = best + Math.floor((v.length - 1 - best) / spu) * spu;
  while (first < last && v[first] === 0) first += spu;
  while (last > first && v[last] === 0) last -= spu;
  const cursors = new Float64Array((last - first) / spu + 1);
  for (let k = 0; k < cursors.length; k++) cursors[k] = v[first + k * spu];
  let rel = (best - pulse.mainIndex) / spu;
  rel -= Math.floor(rel + 0.5);
  return { phase: best, phase_UI: rel, cursors, energy_V2: bestEnergy };
}

/**
 * Rms of the crosstalk an aggressor adds at the victim's sampler: `√(E[a²]·Σ_k x_k²)` for
 * independent equiprobable symbols `a` through cursors `x` (for NRZ the square root of the sampled
 * pulse's energy).
 *
 * @param cursors - crosstalk cursors, volts for a 1 V aggressor symbol, times the aggressor's amplitude.
 * @param modulation - "nrz" or "pam4".
 */
export function crosstalkRms(cursors: ArrayLike<number>, modulation: Modulation): number {
  const power = symbolPower(modulation);
  let e = 0;
  for (let k = 0; k < cursors.length; k++) {
    const x = cursors[k];
    if (!Number.isFinite(x)) throw new RangeError(`cursors[${k}] is not finite (${x})`);
    e += x * x;
  }
  return Math.sqrt(power * e);
}
