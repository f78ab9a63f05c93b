// A CTLE channel's aggressors, through the same receiver as the victim (front end, CTLE, receive
// FFE): the ones whose transmitter FIR is fixed are sampled once; a FEXT aggressor driven by the
// victim link's own FIR is sampled again for each transmit FIR the search tries — cheaply, from its
// cursors and their correlations per phase, computed once.
import { worstPhaseSampling } from "../crosstalk/aggressorSampling.ts";
import type { AggressorKind } from "../crosstalk/aggressorKind.ts";
import { combineCrosstalk, type CrosstalkParts, type SampledCursors } from "../crosstalk/crosstalkParts.ts";
import { applyFir } from "../equalizers/applyFir.ts";
import { scalePulse } from "../pulse/scalePulse.ts";
import type { Modulation, Pulse } from "../types.ts";

/** One aggressor at the sampler, before any FIR that depends on the search. */
export interface ReceivedAggressor {
  readonly name: string;
  readonly kind: AggressorKind;
  /**
   * Its crosstalk pulse at the sampler in volts: for a fixed FIR, the whole transmitted symbol
   * (swing and FIR applied); for the victim's FIR, per unit of FIR tap (swing applied, FIR not).
   */
  readonly pulse: Pulse;
  /** True when the aggressor's FIR is the victim's chosen transmit FIR (FEXT by default). */
  readonly followsVictimFir: boolean;
}

/** A FEXT aggressor that follows the victim's FIR: its cursors and their correlations at every phase. */
interface Follower {
  readonly index: number;
  readonly name: string;
  /** Per phase φ (0 … samplesPerUi − 1): the cursors `f_k(φ)` (samples φ + k·samplesPerUi). */
  readonly cursors: Float64Array[];
  /** Per phase: `R_φ(m) = Σ_k f_k(φ)·f_{k+m}(φ)` for m = 0 … maxTaps − 1. */
  readonly correlation: Float64Array[];
  /** Sample index of the pulse's peak (for the reported phase). */
  readonly peak: number;
}

/** The crosstalk of one CTLE channel. */
export interface ChannelCrosstalk {
  readonly aggressors: readonly ReceivedAggressor[];
  readonly modulation: Modulation;
  /** Gaussian noise at the sampler the small parts are lumped into (see `crosstalkParts`). */
  readonly noiseRms_V: number;
  /** The aggressors whose FIR is fixed, sampled at their worst phases (by input index). */
  readonly fixedSampled: readonly (SampledCursors | null)[];
  /** Their parts alone (the same for every transmit FIR; what the bounds count). */
  readonly fixed: CrosstalkParts;
  readonly followers: readonly Follower[];
  /** Memo of {@link crosstalkFor}'s last answer (and of its parts sorted, once asked). */
  last: { key: string; parts: CrosstalkParts; sorted?: Float64Array } | null;
}

/** Most transmit FIR taps a follower's correlations are prepared for. */
const MAX_FIR_TAPS = 16;

/** The crosstalk of a channel whose aggressors are already at the sampler. */
export function channelCrosstalk(aggressors: readonly ReceivedAggressor[], modulation: Modulation, noiseRms_V: number): ChannelCrosstalk {
  const fixedSampled: (SampledCursors | null)[] = aggressors.map((a) => {
    if (a.followsVictimFir) return null;
    const s = worstPhaseSampling(a.pulse);
    return { name: a.name, cursors: s.cursors, phase_UI: s.phase_UI };
  });
  const followers = aggressors.flatMap((a, index) => (a.followsVictimFir ? [follower(a, index)] : []));
  return {
    aggressors,
    modulation,
    noiseRms_V,
    fixedSampled,
    fixed: combineCrosstalk(fixedSampled.filter((x): x is SampledCursors => x !== null), modulation, noiseRms_V),
    followers,
    last: null,
  };
}

function follower(a: ReceivedAggressor, index: number): Follower {
  const { values_V: v, samplesPerUi: spu, mainIndex } = a.pulse;
  const cursors: Float64Array[] = [];
  const correlation: Float64Array[] = [];
  for (let ph = 0; ph < spu; ph++) {
    const f = new Float64Array(Math.ceil((v.length - ph) / spu));
    for (let k = 0; k < f.length; k++) f[k] = v[ph + k * spu];
    const r = new Float64Array(MAX_FIR_TAPS);
    for (let m = 0; m < MAX_FIR_TAPS; m++) {
      let s = 0;
      for (let k = 0; k + m < f.length; k++) s += f[k] * f[k + m];
      r[m] = s;
    }
    cursors.push(f);
    correlation.push(r);
  }
  return { index, name: a.name, cursors, correlation, peak: mainIndex };
}

/**
 * The crosstalk parts with transmit FIR `taps`: each aggressor at its worst
 * phase, the FEXT aggressors that follow the victim's FIR through `taps` — the energy of phase φ is
 * `Σ_{i,j} c_i·c_j·R_φ(i − j)`, and the cursors there are `f(φ) * c` (a whole number of UIs of delay
 * does not change an asynchronous aggressor's cursors). Per-aggressor figures in input order.
 */
export function crosstalkFor(x: ChannelCrosstalk, taps: ArrayLike<number>): CrosstalkParts {
  if (x.followers.length === 0) return x.fixed;
  if (taps.length > MAX_FIR_TAPS) throw new RangeError(`taps must hold at most ${MAX_FIR_TAPS} values, got ${taps.length}`);
  const key = Array.prototype.join.call(taps, ",");
  if (x.last !== null && x.last.key === key) return x.last.parts;
  const sampled = [...x.fixedSampled];
  for (const f of x.followers) {
    const spu = f.cursors.length;
    let best = 0;
    let bestEnergy = -1;
    for (let ph = 0; ph < spu; ph++) {
      const r = f.correlation[ph];
      let e = 0;
      for (let i = 0; i < taps.length; i++) {
        for (let j = 0; j < taps.length; j++) e += taps[i] * taps[j] * r[Math.abs(i - j)];
      }
      if (e > bestEnergy) {
        bestEnergy = e;
        best = ph;
      }
    }
    const h = f.cursors[best];
    const y = new Float64Array(h.length + taps.length - 1);
    for (let j = 0; j < taps.length; j++) {
      const c = taps[j];
      if (c === 0) continue;
      for (let k = 0; k < h.length; k++) y[k + j] += c * h[k];
    }
    let rel = (best - f.peak) / spu;
    rel -= Math.floor(rel + 0.5);
    sampled[f.index] = { name: f.name, cursors: y, phase_UI: rel };
  }
  const parts = combineCrosstalk(sampled as SampledCursors[], x.modulation, x.noiseRms_V);
  x.last = { key, parts };
  return parts;
}

/**
 * The kept parts of {@link crosstalkFor} for `taps`, largest first (what a leaf bound holds adverse);
 * null when every aggressor's FIR is fixed (the bound setup has them already).
 */
export function sortedCrosstalkParts(x: ChannelCrosstalk, taps: ArrayLike<number>): Float64Array | null {
  if (x.followers.length === 0) return null;
  crosstalkFor(x, taps);
  const last = x.last as NonNullable<ChannelCrosstalk["last"]>;
  last.sorted ??= Float64Array.from(last.parts.parts_V).sort().reverse();
  return last.sorted;
}

/**
 * An aggressor's pulse at the receiver's pins turned into the sampler's: `receive` filters it (front
 * end, CTLE, FFE), then its transmitter is applied — a fixed FIR and its swing, or, for one that follows
 * the victim's FIR, the swing alone.
 *
 * @param a - the aggressor's pulse at the pins for a 1 V symbol, kind, name and transmitter.
 * @param receive - the receiver from the pins to the sampler.
 * @param swing_V - the aggressor transmitter's symbol amplitude (half its peak-to-peak swing).
 */
export function receivedAggressor(
  a: { readonly name: string; readonly kind: AggressorKind; readonly pulse: Pulse; readonly txTaps?: readonly number[] },
  receive: (p: Pulse) => Pulse,
  swing_V: number,
): ReceivedAggressor {
  const follows = a.kind === "fext" && a.txTaps === undefined;
  const taps = a.txTaps ?? [1];
  const at = receive(a.pulse);
  const pulse = scalePulse(follows ? at : applyFir(at, taps, 0), swing_V);
  return { name: a.name, kind: a.kind, pulse, followsVictimFir: follows };
}
