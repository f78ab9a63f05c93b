// Back-channel transmit training: the receiver asks the transmitter to step its FIR taps until no step helps.
import type { Cursors } from "../pulse/cursorsAt.ts";
import { convolveCursors } from "../equalizers/convolveCursors.ts";
import { resolveTapRanges, TAP_TOLERANCE, type TxFirSpec } from "../equalizers/txFirConstraints.ts";
import { checkCursorWindow } from "./checkCursors.ts";

/** A coefficient update request: hold, increment or decrement by one step. */
export type TapRequest = "hold" | "increment" | "decrement";

/**
 * The transmitter's answer per tap, with the meanings of the coefficient status field of
 * IEEE 802.3 Clause 72.6.10.2: not updated, updated, at its minimum, at its maximum.
 */
export type TapStatus = "not_updated" | "updated" | "minimum" | "maximum";

/** Whether a tap ended pushing against a limit it could not pass. */
export type TapSaturation = "none" | "minimum" | "maximum";

/** Settings of a training run. */
export interface TxTrainingOptions {
  /** Tap counts, step and ranges of the transmitter; `Σ|c| ≤ 1` is enforced by the transmitter. */
  readonly spec: TxFirSpec;
  /** rms noise at the receiver in volts (≥ 0, default 0); it keeps the swing from being given away. */
  readonly noiseRms_V?: number;
  /** Post-cursors the receiver's DFE cancels (not counted as ISI), default 0. */
  readonly dfeTaps?: number;
  /** Starting taps, legal under `spec` (default: main tap 1, side taps 0). */
  readonly initial?: ArrayLike<number>;
  /** Upper bound on exchanges (default 10000). */
  readonly maxRounds?: number;
}

/** One exchange over the back channel. */
export interface TrainingRound {
  readonly requests: TapRequest[];
  readonly status: TapStatus[];
  /** Taps after the transmitter applied the requests. */
  readonly taps: Float64Array;
  /** The receiver's figure of merit after the round (lower is better). */
  readonly objective: number;
}

/** The outcome of training. */
export interface TxTrainingResult {
  readonly taps: Float64Array;
  /** Every exchange in order; `rounds[k].taps` is the trajectory. */
  readonly rounds: TrainingRound[];
  /** True when the receiver ended by holding every tap (no allowed step improves the objective). */
  readonly converged: boolean;
  /** Per tap, the limit it was pressing against at the end, if any. */
  readonly saturation: TapSaturation[];
  /** Figure of merit at the start and at the end. */
  readonly objectiveStart: number;
  readonly objective: number;
}

/** What the link-training exchange works with: the channel, the transmitter's grid and limits, the receiver's noise and DFE. */
interface TrainingLink {
  readonly cursors: Cursors;
  readonly pre: number;
  readonly step: number;
  readonly ranges: readonly (readonly [number, number])[];
  readonly noiseRms_V: number;
  readonly dfeTaps: number;
}

/** A change the receiver may ask for: step `d[i]` (±1) on tap `j[i]` (a paired main step: `d` 0, see {@link applyMove}). */
interface Move {
  readonly j: readonly number[];
  readonly d: readonly number[];
  readonly id: string;
}

/** Tap values of integer step counts. */
function tapValues(link: TrainingLink, steps: Int32Array): Float64Array {
  return Float64Array.from(steps, (v) => v * link.step);
}

/** The starting step counts: the caller's taps, or main tap 1 and side taps 0 (checked legal). */
function initialSteps(link: TrainingLink, initial: ArrayLike<number> | undefined): Int32Array {
  const { pre, step, ranges } = link;
  const n = ranges.length;
  const k = new Int32Array(n);
  if (initial === undefined) {
    k[pre] = Math.floor(1 / step + 1e-9);
  } else {
    if (initial.length !== n) throw new RangeError(`initial must hold ${n} taps, got ${initial.length}`);
    for (let j = 0; j < n; j++) {
      const q = initial[j] / step;
      if (!Number.isFinite(q) || Math.abs(q - Math.round(q)) > 1e-6) {
        throw new RangeError(`initial[${j}] must be a finite multiple of the step ${step}`);
      }
      k[j] = Math.round(q);
    }
  }
  if (!isLegal(link, k)) throw new RangeError("initial taps are not a legal setting of spec (range or Σ|c| ≤ 1)");
  return k;
}

/** Whether step counts are a legal setting: every tap in its range and `Σ|c| ≤ 1`. */
function isLegal(link: TrainingLink, steps: Int32Array): boolean {
  let s = 0;
  for (let j = 0; j < steps.length; j++) {
    const c = steps[j] * link.step;
    if (c < link.ranges[j][0] - TAP_TOLERANCE || c > link.ranges[j][1] + TAP_TOLERANCE) return false;
    s += Math.abs(c);
  }
  return s <= 1 + TAP_TOLERANCE;
}

/** The receiver's figure of merit `(ISI power + σ²) / g₀²` for step counts `steps` (lower is better). */
function figureOfMerit(link: TrainingLink, steps: Int32Array): number {
  const g = convolveCursors(link.cursors, tapValues(link, steps), link.pre);
  const g0 = g.h[g.main];
  if (!(g0 > 0)) return Number.POSITIVE_INFINITY;
  let isi = 0;
  for (let i = 0; i < g.h.length; i++) {
    if (i === g.main || (i > g.main && i <= g.main + link.dfeTaps)) continue;
    isi += g.h[i] * g.h[i];
  }
  return (isi + link.noiseRms_V * link.noiseRms_V) / (g0 * g0);
}

/** Every change the receiver may ask for: one step of one tap, and one step of a side tap paired with the main tap. */
function candidateMoves(tapCount: number, pre: number): Move[] {
  const moves: Move[] = [];
  for (let j = 0; j < tapCount; j++) {
    for (const d of [1, -1]) {
      moves.push({ j: [j], d: [d], id: `${j}:${d}` });
      if (j !== pre) moves.push({ j: [j, pre], d: [d, 0], id: `${j}:${d}+main` });
    }
  }
  return moves;
}

/** Applies a move to step counts; a paired main step goes against the side tap's magnitude change. */
function applyMove(link: TrainingLink, steps: Int32Array, m: Move): Int32Array {
  const t = Int32Array.from(steps);
  const side = m.j[0];
  t[side] += m.d[0];
  if (m.j.length === 2) {
    const grows = Math.abs(t[side]) > Math.abs(steps[side]);
    t[link.pre] += grows ? -1 : 1;
  }
  return t;
}

/** Which limit changed tap `j` breaks (moving in direction `dir`) in the proposed step counts, if any. */
function brokenLimit(link: TrainingLink, next: Int32Array, j: number, dir: number): TapStatus | null {
  const { step, ranges } = link;
  const c = next[j] * step;
  if (c < ranges[j][0] - TAP_TOLERANCE) return "minimum";
  if (c > ranges[j][1] + TAP_TOLERANCE) return "maximum";
  let s = 0;
  for (let i = 0; i < next.length; i++) s += Math.abs(next[i] * step);
  if (s > 1 + TAP_TOLERANCE) return dir > 0 ? "maximum" : "minimum";
  return null;
}

/** Per tap, the limit that refuses an improving change of it (alone or paired), at the end of training. */
function saturationOf(
  link: TrainingLink,
  moves: readonly Move[],
  steps: Int32Array,
  improves: (value: number) => boolean,
): TapSaturation[] {
  const saturation: TapSaturation[] = new Array(steps.length).fill("none");
  for (const move of moves) {
    const next = applyMove(link, steps, move);
    if (!improves(figureOfMerit(link, next))) continue;
    const j = move.j[0];
    const why = brokenLimit(link, next, j, move.d[0]);
    if (why === "minimum" || why === "maximum") saturation[j] = why;
  }
  return saturation;
}

/**
 * Simulates transmit training over a back channel. The receiver's figure of merit is
 * `(ISI power + σ²) / g₀²` on the combined cursors `g = h * c` (ISI excluding the main cursor and
 * the post-cursors a DFE of `dfeTaps` taps cancels) — the inverse of its slicer SNR. Each round the
 * receiver sends one request per tap. It considers every one-step change of a single tap, and every
 * one-step change of a side tap paired with the opposite step of the main tap (which keeps `Σ|c|`
 * and so gets past the peak-swing limit), and asks for the one that lowers its figure most, holding
 * the other taps. The transmitter applies a round's requests together when every changed tap stays
 * in its range and `Σ|c| ≤ 1`; otherwise it applies none and answers `minimum`/`maximum` for the taps
 * that would break a limit (`not_updated` for the rest). The receiver does not repeat a refused
 * request until some tap has moved. Training ends when no request helps (converged) or after
 * `maxRounds`. Every accepted round lowers the figure strictly, so training always ends.
 *
 * @param cursors - channel cursors `{ h, main }` at the receiver for a full-swing transmitter.
 * @see IEEE 802.3 Clause 72.6.10 (coefficient update and status fields of link training).
 */
export function txTraining(cursors: Cursors, options: TxTrainingOptions): TxTrainingResult {
  const { spec } = options;
  const ranges = resolveTapRanges(spec);
  checkCursorWindow(cursors, spec.pre, spec.post);
  const noise = options.noiseRms_V ?? 0;
  if (!(noise >= 0) || !Number.isFinite(noise))
    throw new RangeError(`noiseRms_V must be a finite number ≥ 0, got ${String(noise)}`);
  const dfe = options.dfeTaps ?? 0;
  if (!Number.isInteger(dfe) || dfe < 0) throw new RangeError(`dfeTaps must be an integer ≥ 0, got ${String(dfe)}`);
  const maxRounds = options.maxRounds ?? 10_000;
  if (!Number.isInteger(maxRounds) || maxRounds < 0) {
    throw new RangeError(`maxRounds must be an integer ≥ 0, got ${String(maxRounds)}`);
  }
  const link: TrainingLink = { cursors, pre: spec.pre, step: spec.step, ranges, noiseRms_V: noise, dfeTaps: dfe };
  const n = ranges.length;
  // Taps are held as integer step counts so that repeated steps do not drift off the grid.
  const k = initialSteps(link, options.initial);
  const moves = candidateMoves(n, spec.pre);

  const rounds: TrainingRound[] = [];
  const objectiveStart = figureOfMerit(link, k);
  let current = objectiveStart;
  let blocked = new Set<string>(); // moves refused since the last accepted round
  let converged = false;
  const improves = (value: number) => value < current * (1 - 1e-12);
  for (let round = 0; round < maxRounds; round++) {
    let best: { move: Move; next: Int32Array; value: number } | null = null;
    for (const move of moves) {
      if (blocked.has(move.id)) continue;
      const next = applyMove(link, k, move);
      const value = figureOfMerit(link, next);
      if (improves(value) && (best === null || value < best.value)) best = { move, next, value };
    }
    if (best === null) {
      converged = true;
      break;
    }
    const requests: TapRequest[] = new Array(n).fill("hold");
    const status: TapStatus[] = new Array(n).fill("not_updated");
    const { move, next } = best;
    for (const j of move.j) requests[j] = next[j] > k[j] ? "increment" : "decrement";
    let refused = false;
    for (const j of move.j) {
      const why = brokenLimit(link, next, j, next[j] - k[j]);
      if (why !== null) {
        status[j] = why;
        refused = true;
      }
    }
    if (refused) {
      blocked.add(move.id);
    } else {
      for (const j of move.j) status[j] = "updated";
      k.set(next);
      current = best.value;
      blocked = new Set();
    }
    rounds.push({ requests, status, taps: tapValues(link, k), objective: current });
  }
  const saturation = saturationOf(link, moves, k, improves);
  return { taps: tapValues(link, k), rounds, converged, saturation, objectiveStart, objective: current };
}
