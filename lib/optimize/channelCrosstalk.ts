// A CTLE channel's aggressors, through the same receiver as the victim (front end, CTLE, receive
// FFE): the ones whose transmitter FIR is fixed are sampled once; a FEXT aggressor driven by the
// victim link's own FIR is sampled again for each transmit FIR the search tries — cheaply, from its
// cursors and their correlations per phase, computed once.
import { worstPhaseSampling } from "../crosstalk/aggressorSampling.ts";
import type { AggressorKind } from "../crosstalk/aggressorKind.ts";
import { PAM4_INNER_LEVEL } from "../analysis/isiParts.ts";
import {
  combineCrosstalk,
  type CrosstalkParts,
  LUMP_DIVISOR,
  type SampledCursors,
} from "../crosstalk/crosstalkParts.ts";
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
  /** Scratch for its cursors through a FIR (the longest phase plus `MAX_FIR_TAPS − 1`). */
  readonly scratch: Float64Array;
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
  /** The fixed aggressors' kept parts, largest first. */
  readonly fixedSorted: Float64Array;
  /** Memo of {@link crosstalkFor}'s last answer. */
  last: { key: string; parts: CrosstalkParts } | null;
  /** Memo of {@link sortedCrosstalkParts}' last answer (a view of `leafScratch`). */
  leaf: { key: string; sorted: Float64Array } | null;
  /** Room for every kept part of one transmit FIR. */
  readonly leafScratch: Float64Array;
}

/** Most transmit FIR taps a follower's correlations are prepared for. */
const MAX_FIR_TAPS = 16;

/** The crosstalk of a channel whose aggressors are already at the sampler. */
export function channelCrosstalk(
  aggressors: readonly ReceivedAggressor[],
  modulation: Modulation,
  noiseRms_V: number,
): ChannelCrosstalk {
  const fixedSampled: (SampledCursors | null)[] = aggressors.map((a) => {
    if (a.followsVictimFir) return null;
    const s = worstPhaseSampling(a.pulse);
    return { name: a.name, cursors: s.cursors, phase_UI: s.phase_UI };
  });
  const followers = aggressors.flatMap((a, index) => (a.followsVictimFir ? [follower(a, index)] : []));
  const fixed = combineCrosstalk(
    fixedSampled.filter((x): x is SampledCursors => x !== null),
    modulation,
    noiseRms_V,
  );
  const perCursor = modulation === "pam4" ? 2 : 1;
  const room = fixed.parts_V.length + followers.reduce((n, f) => n + perCursor * f.scratch.length, 0);
  return {
    aggressors,
    modulation,
    noiseRms_V,
    fixedSampled,
    fixed,
    followers,
    fixedSorted: Float64Array.from(fixed.parts_V).sort().reverse(),
    last: null,
    leaf: null,
    leafScratch: new Float64Array(room),
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
  const longest = Math.max(...cursors.map((f) => f.length));
  return {
    index,
    name: a.name,
    cursors,
    correlation,
    peak: mainIndex,
    scratch: new Float64Array(longest + MAX_FIR_TAPS - 1),
  };
}

/**
 * A follower's worst phase for FIR `taps` (largest `Σ_{i,j} c_i·c_j·R_φ(i − j)`, the first on ties)
 * and its cursors there, `f(φ) * c`, written into `out` (its first `f(φ).length + taps.length − 1`
 * values); answers the phase's sample offset and the cursor count.
 */
function followerAt(f: Follower, taps: ArrayLike<number>, out: Float64Array): { phase: number; length: number } {
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
  const length = h.length + taps.length - 1;
  out.fill(0, 0, length);
  for (let j = 0; j < taps.length; j++) {
    const c = taps[j];
    if (c === 0) continue;
    for (let k = 0; k < h.length; k++) out[k + j] += c * h[k];
  }
  return { phase: best, length };
}

/**
 * The crosstalk parts with transmit FIR `taps`: each aggressor at its worst
 * phase, the FEXT aggressors that follow the victim's FIR through `taps` — the energy of phase φ is
 * `Σ_{i,j} c_i·c_j·R_φ(i − j)`, and the cursors there are `f(φ) * c` (a whole number of UIs of delay
 * does not change an asynchronous aggressor's cursors). Per-aggressor figures in input order.
 */
export function crosstalkFor(x: ChannelCrosstalk, taps: ArrayLike<number>): CrosstalkParts {
  if (x.followers.length === 0) return x.fixed;
  if (taps.length > MAX_FIR_TAPS)
    throw new RangeError(`taps must hold at most ${MAX_FIR_TAPS} values, got ${taps.length}`);
  const key = Array.prototype.join.call(taps, ",");
  if (x.last !== null && x.last.key === key) return x.last.parts;
  const sampled = [...x.fixedSampled];
  for (const f of x.followers) {
    const { phase, length } = followerAt(f, taps, f.scratch);
    let rel = (phase - f.peak) / f.cursors.length;
    rel -= Math.floor(rel + 0.5);
    sampled[f.index] = { name: f.name, cursors: f.scratch.slice(0, length), phase_UI: rel };
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
  if (taps.length > MAX_FIR_TAPS)
    throw new RangeError(`taps must hold at most ${MAX_FIR_TAPS} values, got ${taps.length}`);
  const key = Array.prototype.join.call(taps, ",");
  if (x.leaf !== null && x.leaf.key === key) return x.leaf.sorted;
  // The same parts as crosstalkFor's, without building them per aggressor: the fixed ones are kept
  // from the start; a follower's cursor gives |y| (NRZ) or |y|·(1 ± ⅓)/2 (PAM4), kept when at least
  // the lumping threshold.
  const out = x.leafScratch;
  out.set(x.fixedSorted);
  let n = x.fixedSorted.length;
  const threshold = x.noiseRms_V / LUMP_DIVISOR;
  const pam4 = x.modulation === "pam4";
  const a = (1 + PAM4_INNER_LEVEL) / 2;
  const b = (1 - PAM4_INNER_LEVEL) / 2;
  for (const f of x.followers) {
    const { length } = followerAt(f, taps, f.scratch);
    for (let k = 0; k < length; k++) {
      const m = Math.abs(f.scratch[k]);
      if (!pam4) {
        if (m >= threshold) out[n++] = m;
      } else {
        if (a * m >= threshold) out[n++] = a * m;
        if (b * m >= threshold) out[n++] = b * m;
      }
    }
  }
  const sorted = out.subarray(0, n).sort().reverse();
  x.leaf = { key, sorted };
  return sorted;
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
  a: {
    readonly name: string;
    readonly kind: AggressorKind;
    readonly pulse: Pulse;
    readonly txTaps?: readonly number[];
  },
  receive: (p: Pulse) => Pulse,
  swing_V: number,
): ReceivedAggressor {
  const follows = a.kind === "fext" && a.txTaps === undefined;
  const taps = a.txTaps ?? [1];
  const at = receive(a.pulse);
  const pulse = scalePulse(follows ? at : applyFir(at, taps, 0), swing_V);
  return { name: a.name, kind: a.kind, pulse, followsVictimFir: follows };
}
