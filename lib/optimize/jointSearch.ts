// The joint search over CTLE grid × transmit FIR grid × closed-form DFE: branch and bound over the
// FIR taps with rigorous headroom bounds, so the answer equals exhaustive evaluation of the grid.
import { criterionLag, defaultPhaseWindow } from "../clocking/samplingPhase.ts";
import { resolveTapRanges, TAP_TOLERANCE } from "../equalizers/txFirConstraints.ts";
import { gridIndices } from "../equalizers/enumerateTxFirs.ts";
import { mmseEqualizer } from "../solvers/mmse.ts";
import { zeroForcing } from "../solvers/zeroForcing.ts";
import type { Pulse } from "../types.ts";
import { type CtleChannel, filteredChannel, phaseReach } from "./ctleChannel.ts";
import { ctleGridPulses } from "./ctleGridPulses.ts";
import { criterionPhaseOf, finishEye, heavyPhaseBound, lightPhaseBound, type PhaseEye, prepareEye } from "./evaluateSetting.ts";
import { type BoundScratch, createBoundScratch } from "./bound/boundScratch.ts";
import { type BoundSetup, boundSetup } from "./bound/boundSetup.ts";
import { boxBound } from "./bound/boxBound.ts";
import { BoxRanges } from "./bound/boxRanges.ts";
import { leafBound } from "./bound/leafBound.ts";
import { cachedCoefficients, type CoefficientSource } from "./bound/phaseCoefficients.ts";
import { affineRangeInto, createTapBox } from "./bound/tapBox.ts";
import type { CtleSetting, SearchSpace } from "./searchSpace.ts";

/** One evaluated setting. */
export interface Candidate {
  /** Index of the CTLE setting in `space.ctleSettings`. */
  readonly ctleIndex: number;
  readonly ctle: CtleSetting;
  /** Transmit FIR taps (fractions of the peak swing), main tap `taps[pre]`. */
  readonly taps: Float64Array;
  readonly dfeCount: number;
  /** Sampling phase in samples relative to the equalized pulse's nominal main cursor. */
  readonly phase: number;
  readonly dfeTaps: Float64Array;
  readonly dfeClipped: readonly boolean[];
  readonly eyeHeight_V: number;
  readonly limiterHeadroom_V: number;
  /** For a population, the member whose headroom this is (the worst); 0 for one channel. */
  readonly worstMember: number;
}

/** What is known about one CTLE setting after the search. */
export interface CtleOutcome {
  /** The best setting found with this CTLE (null when none was evaluated). */
  readonly best: Candidate | null;
  /** No FIR setting with this CTLE does better than this (volts; −Infinity when none is legal). */
  readonly upperBound_V: number;
  /** True when `best` is this CTLE's optimum (its headroom reaches `upperBound_V`). */
  readonly exact: boolean;
}

/** Options of {@link jointSearch}. */
export interface JointSearchOptions {
  /** DFE tap counts to optimize for, searched together (e.g. `[budget taps, 0]`). */
  readonly dfeCounts: readonly number[];
  /** Number of best settings kept (and proven) for the first DFE count (default 5). */
  readonly topCount?: number;
  /**
   * Feasibility mode: stop at the first setting whose headroom (first DFE count) reaches this value.
   * Then `best` is that setting, or null when no setting reaches it.
   */
  readonly target_V?: number;
  /** Reports the fraction of CTLE settings done (0 … 1). */
  readonly onProgress?: (fraction: number) => void;
  /**
   * The order in which to search the CTLE settings (indices into `space.ctleSettings`, each once),
   * e.g. best first by an earlier pass. Default: best first by the single-law bound of each
   * setting's first starting point.
   */
  readonly order?: readonly number[];
  /** Further starting points per CTLE setting (indexed like `space.ctleSettings`), tried before its own. */
  readonly seeds?: readonly (readonly Float64Array[])[];
}

/** What the search found. */
export interface JointSearchResult {
  /** Best setting per DFE count (null when no FIR setting is legal, or none reaches the target). */
  readonly best: (Candidate | null)[];
  /** Per DFE count and CTLE setting (in `space.ctleSettings` order), its best and its bound. */
  readonly perCtle: CtleOutcome[][];
  /** The best settings for the first DFE count, best first (exact: no other setting beats the last). */
  readonly top: Candidate[];
  /** Work done: exact evaluations, single-law bounds, bounded boxes, leaves reached. */
  readonly stats: { exact: number; heavy: number; boxes: number; leaves: number };
}

/** The CTLE channels of a search space, filtered once and shared by every pass over the grid. */
export interface PreparedChannels {
  readonly channels: readonly CtleChannel[];
}

/** Filters the pulse through every CTLE setting of the grid ({@link ctleGridPulses}: four inverse FFTs in all). */
export function prepareChannels(pulse: Pulse, space: SearchSpace): PreparedChannels {
  const maxPhase = phaseReach(space, pulse.samplesPerUi);
  const pulses = ctleGridPulses(pulse, space.ctleCorners, space.ctleSettings);
  return { channels: space.ctleSettings.map((s, i) => filteredChannel(pulses[i], space, s, maxPhase)) };
}


function floorStep(x: number, step: number): number {
  return Math.floor(x / step + 1e-9) * step;
}

/**
 * Starting points for one CTLE channel: the plain FIR (no side taps: the CTLE and the DFE do the
 * rest — often near the optimum with a DFE), and zero-forcing and MMSE FIRs on the channel's cursors
 * at phase 0 (MMSE regularized by the noise relative to the swing), scaled to the peak swing and
 * projected onto the FIR grid (each side tap rounded to the step and clamped into its range, the
 * main tap as large as the swing allows). Illegal or failing starts are left out.
 */
export function startingPoints(channel: CtleChannel, space: SearchSpace): Float64Array[] {
  const spec = space.firSpec;
  const ranges = resolveTapRanges(spec);
  const cursors = { h: channel.cursors(0), main: channel.pre };
  const raw: Float64Array[] = [Float64Array.from({ length: spec.pre + 1 + spec.post }, (_, j) => (j === spec.pre ? 1 : 0))];
  try {
    const m = mmseEqualizer(cursors, spec.pre, spec.post, channel.noiseRms_V / space.scale_V).taps;
    let s = 0;
    for (const c of m) s += Math.abs(c);
    if (s > 0) raw.push(Float64Array.from(m, (c) => c / s));
  } catch {
    // no MMSE start for all-zero cursors without noise
  }
  try {
    raw.push(zeroForcing(cursors, spec.pre, spec.post, { normalize: "peak-swing" }).taps);
  } catch {
    // a singular zero-forcing system gives no start
  }
  const out: Float64Array[] = [];
  for (const t of raw) {
    const q = new Float64Array(t.length);
    let side = 0;
    for (let j = 0; j < t.length; j++) {
      if (j === spec.pre) continue;
      const [lo, hi] = ranges[j];
      const k = Math.min(
        Math.floor(hi / spec.step + 1e-9),
        Math.max(Math.ceil(lo / spec.step - 1e-9), Math.round(t[j] / spec.step)),
      );
      q[j] = k * spec.step;
      side += Math.abs(k);
    }
    const main = floorStep(Math.min(ranges[spec.pre][1], 1 - side * spec.step), spec.step);
    if (main < ranges[spec.pre][0] - TAP_TOLERANCE) continue;
    q[spec.pre] = main;
    out.push(q);
  }
  return out;
}

class Found extends Error {}

/**
 * Searches the CTLE grid × transmit FIR grid (every setting `enumerateTxFirs` yields) with the DFE in
 * closed form, for each requested DFE count, maximizing the limiter headroom at the target BER under
 * the budget's sampling policy.
 *
 * The starting points of every CTLE setting (plain, MMSE and zero-forcing FIRs) are bounded first,
 * and the CTLE settings are then searched best first; in the first one, a short steepest-ascent walk
 * on the light bound from the best starting point picks the settings evaluated before the rest, so
 * that the thresholds start near their final values. Per CTLE setting the side taps are searched depth-first,
 * one per level; every box of settings is bounded by {@link boxBound} over the sampling phases the
 * policy can choose for it, and dropped when nothing in it can beat the threshold (the K-th best
 * headroom found so far for the first DFE count, the best for the others). Leaves pass four tiers:
 * {@link leafBound} (the watched cursors), {@link lightPhaseBound} (every cursor, no law built),
 * {@link heavyPhaseBound} (one exact law), then the exact eye. No bound ever
 * underestimates, so `best` and `top` are what exhaustive evaluation of the grid gives (exact ties
 * may resolve to an equally good setting), and every CTLE setting reports its optimum or a bound.
 *
 *
 * Given several channels (a population: one {@link PreparedChannels} per member, same budget and
 * UI), the figure of a setting is the worst member's headroom (each member samples at its own
 * policy phase and sets its own DFE): every bound is the least of the members' bounds, and the
 * search is exact for this minimax objective too.
 *
 * @param pulse - channel pulse for a 1 V symbol (used when `prepared` is not given; else only its
 *   samplesPerUi).
 * @param space - the resolved budget.
 * @param options - DFE counts, top-K size, feasibility target, progress callback.
 * @param prepared - channels from {@link prepareChannels} (to share between passes), or one per
 *   member of a population.
 */
export function jointSearch(
  pulse: Pulse,
  space: SearchSpace,
  options: JointSearchOptions,
  prepared: PreparedChannels | readonly PreparedChannels[] = prepareChannels(pulse, space),
): JointSearchResult {
  const counts = options.dfeCounts;
  if (counts.length === 0) throw new RangeError("dfeCounts must hold at least one DFE tap count");
  for (const n of counts) {
    if (!Number.isInteger(n) || n < 0 || n > space.dfeCount) {
      throw new RangeError(`dfeCounts must hold integers 0…${space.dfeCount} (the budget's DFE taps), got ${n}`);
    }
  }
  const topCount = options.topCount ?? 5;
  if (!Number.isInteger(topCount) || topCount < 1) throw new RangeError(`topCount must be an integer ≥ 1, got ${topCount}`);
  const target = options.target_V;
  if (target !== undefined && !Number.isFinite(target)) throw new RangeError(`target_V must be finite, got ${target}`);
  const members: readonly PreparedChannels[] = Array.isArray(prepared) ? prepared : [prepared as PreparedChannels];
  if (members.length === 0) throw new RangeError("prepared must hold at least one channel");
  for (const m of members) {
    if (m.channels.length !== space.ctleSettings.length) throw new RangeError("prepared channels do not match the CTLE grid");
    if (m.channels.some((c) => c.pulse.samplesPerUi !== pulse.samplesPerUi)) {
      throw new RangeError("every member must have the same samplesPerUi");
    }
  }
  const nCtle = space.ctleSettings.length;

  const spec = space.firSpec;
  const ranges = resolveTapRanges(spec);
  const T = ranges.length;
  const step = spec.step;
  const sides: number[] = [];
  for (let j = 0; j < T; j++) if (j !== spec.pre) sides.push(j);
  const grids = sides.map((j) => gridIndices(ranges[j][0], ranges[j][1], step));
  const [mainMin, mainMax] = ranges[spec.pre];
  const exactGrid = Math.abs(1 / step - Math.round(1 / step)) < 1e-9 && Math.abs(mainMax / step - Math.round(mainMax / step)) < 1e-9;
  const maxCount = Math.max(...counts);
  const O = counts.length;
  const spu = pulse.samplesPerUi;
  const window = defaultPhaseWindow(spu);
  const allPhases: number[] = [0];
  for (let d = 1; d <= window.hi; d++) allPhases.push(-d, d);

  const best: (Candidate | null)[] = counts.map(() => null);
  const top: Candidate[] = [];
  const found: (Candidate | null)[][] = counts.map(() => new Array(nCtle).fill(null));
  const pruned: Float64Array[] = counts.map(() => new Float64Array(nCtle).fill(Number.NEGATIVE_INFINITY));
  const stats = { exact: 0, heavy: 0, boxes: 0, leaves: 0 };

  const kth = (): number => (top.length < topCount ? Number.NEGATIVE_INFINITY : top[top.length - 1].limiterHeadroom_V);
  const threshold = (o: number): number => {
    if (target !== undefined) return target;
    if (o === 0) return kth();
    const b = best[o];
    return b === null ? Number.NEGATIVE_INFINITY : b.limiterHeadroom_V;
  };
  // A bound (or value) is worth pursuing when it can enter the result.
  const passes = (o: number, v: number): boolean => (target !== undefined ? v >= target : v > threshold(o));
  const pushTop = (c: Candidate) => {
    if (top.length >= topCount && !(c.limiterHeadroom_V > kth())) return;
    let i = top.length;
    while (i > 0 && top[i - 1].limiterHeadroom_V < c.limiterHeadroom_V) i--;
    top.splice(i, 0, c);
    if (top.length > topCount) top.pop();
  };

  /** One member channel at one CTLE setting. */
  interface Member {
    index: number;
    channel: CtleChannel;
    setup: BoundSetup;
    coef: CoefficientSource;
    /** Ranges of the watched cursors over the box being bounded. */
    ranges: BoxRanges;
    /** Jitter phase that last pruned a box (tried first on the next). */
    firstShift: number;
    crit: Map<number, Float64Array>;
    scratch: BoundScratch;
    /** The sampling phases the policy may choose for the leaf being evaluated (`leafSerial`). */
    leafPhases: readonly number[];
    leafSerial: number;
  }
  interface Ctx {
    ci: number;
    setting: CtleSetting;
    members: Member[];
    /** Member evaluated first (the last one found worst). */
    lead: number;
    seen: Set<string>;
  }
  // Criterion F(t) = main(t − lag) − main(t + lag) as coefficients per tap (scale included).
  const critAt = (ctx: Member, t: number): Float64Array => {
    let v = ctx.crit.get(t);
    if (v !== undefined) return v;
    const lag = criterionLag(space.policy as "centre" | "mueller-muller", spu);
    const mainCoef = (u: number): Float64Array => {
      const b = Math.floor(u);
      const f = u - b;
      const out = new Float64Array(T);
      for (const [p, w] of f === 0 ? [[b, 1]] : [[b, 1 - f], [b + 1, f]]) {
        const h = ctx.channel.cursors(p);
        for (let j = 0; j < T; j++) {
          const i = ctx.channel.pre + spec.pre - j;
          if (i >= 0 && i < h.length) out[j] += w * space.scale_V * h[i];
        }
      }
      return out;
    };
    const a = mainCoef(t - lag);
    const c = mainCoef(t + lag);
    v = Float64Array.from(a, (x, j) => x - c[j]);
    ctx.crit.set(t, v);
    return v;
  };

  const record = (ctx: Ctx, o: number, taps: Float64Array, e: PhaseEye, member: number) => {
    const cand: Candidate = {
      ctleIndex: ctx.ci,
      ctle: ctx.setting,
      taps: Float64Array.from(taps),
      dfeCount: counts[o],
      phase: e.phase,
      dfeTaps: e.dfeTaps,
      dfeClipped: e.dfeClipped,
      eyeHeight_V: e.eyeHeight_V,
      limiterHeadroom_V: e.limiterHeadroom_V,
      worstMember: member,
    };
    const f = found[o][ctx.ci];
    if (f === null || e.limiterHeadroom_V > f.limiterHeadroom_V) found[o][ctx.ci] = cand;
    const b = best[o];
    if (b === null || e.limiterHeadroom_V > b.limiterHeadroom_V) best[o] = cand;
    if (o === 0) pushTop(cand);
    if (target !== undefined && e.limiterHeadroom_V >= target) throw new Found();
  };
  const prune = (ctx: Ctx, o: number, ub: number) => {
    if (ub > pruned[o][ctx.ci]) pruned[o][ctx.ci] = ub;
  };

  // One member's figure for a setting: the three tiers over the policy's phases. Returns its eye when
  // known exactly (and at least every pruned phase's bound), else null and a bound on its headroom.
  let leafSerial = 0;
  const memberLeaf = (mc: Member, taps: Float64Array, o: number): { eye: PhaseEye | null; ub: number } => {
    if (mc.leafSerial !== leafSerial) {
      mc.leafPhases = space.policy === "max-height" ? allPhases : [criterionPhaseOf(mc.channel, space, taps)];
      mc.leafSerial = leafSerial;
    }
    const phases = mc.leafPhases;
    let bestEye: PhaseEye | null = null;
    let worstPruned = Number.NEGATIVE_INFINITY;
    for (const t of phases) {
      const floor = bestEye === null ? Number.NEGATIVE_INFINITY : bestEye.limiterHeadroom_V;
      const lb = leafBound(mc.setup, mc.coef, t, taps, counts[o], mc.scratch);
      const ub1 = lb.bound_V;
      if (!passes(o, ub1) || !(ub1 > floor)) {
        worstPruned = Math.max(worstPruned, ub1);
        continue;
      }
      const prepared = prepareEye(mc.channel, space, taps, counts[o], t);
      const jj = lb.shiftIndex;
      const shift = mc.setup.shifts.length === 0 ? 0 : mc.setup.shifts[jj];
      const weight = mc.setup.shifts.length === 0 ? 1 : mc.setup.weights[jj];
      const ubL = lightPhaseBound(space, prepared, shift, weight);
      if (!passes(o, ubL) || !(ubL > floor)) {
        worstPruned = Math.max(worstPruned, ubL);
        continue;
      }
      stats.heavy++;
      const ub2 =
        mc.setup.shifts.length === 0 ? Number.POSITIVE_INFINITY : heavyPhaseBound(space, prepared, shift, weight);
      if (!passes(o, ub2) || !(ub2 > floor)) {
        worstPruned = Math.max(worstPruned, ub2);
        continue;
      }
      stats.exact++;
      const e = finishEye(space, prepared);
      if (bestEye === null || e.limiterHeadroom_V > bestEye.limiterHeadroom_V) bestEye = e;
    }
    if (bestEye !== null && bestEye.limiterHeadroom_V >= worstPruned) return { eye: bestEye, ub: bestEye.limiterHeadroom_V };
    return { eye: null, ub: Math.max(worstPruned, bestEye?.limiterHeadroom_V ?? Number.NEGATIVE_INFINITY) };
  };

  // Evaluates one FIR setting for the live objectives: the worst member counts; a member that cannot
  // pass the threshold ends the evaluation early.
  const leaf = (ctx: Ctx, taps: Float64Array, alive: readonly boolean[]) => {
    const key = Array.from(taps, (c) => Math.round(c / step)).join(",");
    if (ctx.seen.has(key)) return;
    ctx.seen.add(key);
    stats.leaves++;
    leafSerial++;
    const M = ctx.members.length;
    for (let o = 0; o < O; o++) {
      if (!alive[o]) continue;
      let worst: { eye: PhaseEye; member: number } | null = null;
      let cut = false;
      for (let i = 0; i < M; i++) {
        const m = (ctx.lead + i) % M;
        const r = memberLeaf(ctx.members[m], taps, o);
        if (r.eye === null) {
          prune(ctx, o, r.ub);
          ctx.lead = m;
          cut = true;
          break;
        }
        if (worst === null || r.eye.limiterHeadroom_V < worst.eye.limiterHeadroom_V) worst = { eye: r.eye, member: m };
        if (i < M - 1 && !passes(o, worst.eye.limiterHeadroom_V)) {
          prune(ctx, o, worst.eye.limiterHeadroom_V);
          ctx.lead = m;
          cut = true;
          break;
        }
      }
      if (!cut && worst !== null) record(ctx, o, taps, worst.eye, worst.member);
    }
  };

  // The box of every setting whose side taps take grid indices within [lo[s], hi[s]] (positions in
  // grids[s]), written into the shared buffer `box` (false when no setting of it is legal).
  const box = createTapBox(T, spec.pre);
  const makeBox = (lo: Int32Array, hi: Int32Array): boolean => {
    box.base.fill(0);
    let count = 0;
    let fixedAbs = 0;
    let mainLo = 0;
    let freeMin = 0;
    for (let s = 0; s < sides.length; s++) {
      const j = sides[s];
      const ka = grids[s][lo[s]];
      const kb = grids[s][hi[s]];
      if (ka === kb) {
        box.base[j] = ka * step;
        fixedAbs += Math.abs(ka);
        continue;
      }
      const a = ka * step;
      const b = kb * step;
      box.free[count] = j;
      box.lo[count] = a;
      box.hi[count] = b;
      if (a >= 0) box.mainSlope[count] = -1;
      else if (b <= 0) box.mainSlope[count] = 1;
      else {
        // The main tap is not affine across a sign change: widen its interval instead.
        box.mainSlope[count] = 0;
        mainLo -= Math.max(-a, b);
      }
      count++;
      freeMin += a >= 0 ? a : b <= 0 ? -b : 0;
    }
    const affineMain = 1 - fixedAbs * step;
    const mHi = floorStep(Math.min(mainMax, affineMain - freeMin), step);
    if (mHi < mainMin - TAP_TOLERANCE) return false;
    // Flooring to the grid and the main tap's cap can only lower the main tap.
    if (!exactGrid) mainLo -= step;
    const over = affineMain - freeMin - mainMax;
    if (over > 0) mainLo -= over;
    box.base[spec.pre] = affineMain;
    box.count = count;
    box.mainLo = mainLo;
    return true;
  };

  // Phases the policy may choose for some setting of the box, among `parent` (the phases of an
  // enclosing box: a setting's phase does not depend on the box it is seen in).
  const critTable = new Float64Array(2 * (window.hi - window.lo + 1));
  const critStamp = new Int32Array(window.hi - window.lo + 1);
  let critSerial = 0;
  const boxPhases = (mc: Member, parent: readonly number[]): readonly number[] => {
    if (space.policy === "max-height") return allPhases;
    // A small tolerance keeps rounding differences from hiding a phase the leaf would choose.
    const eps = 1e-12 * space.scale_V;
    critSerial++;
    let out: number[] | null = null;
    for (let n = 0; n < parent.length; n++) {
      const t = parent[n];
      // A crossing at u (F(u−1) < 0 ≤ F(u)) may lock at u − 1 or u: t is kept for a crossing at t or t + 1.
      let keep = false;
      for (let u = t; u <= t + 1 && !keep; u++) {
        if (u - 1 < window.lo || u > window.hi) continue;
        keep = critTable[critIndex(mc, u - 1)] < eps && critTable[critIndex(mc, u) + 1] >= -eps;
      }
      if (!keep && t === window.lo) keep = critTable[critIndex(mc, t) + 1] >= -eps; // no crossing and F(lo) ≥ 0
      if (!keep && t === window.hi) keep = critTable[critIndex(mc, t)] < eps; // no crossing and F(hi) < 0
      if (keep) {
        if (out !== null) out.push(t);
      } else if (out === null) out = parent.slice(0, n);
    }
    return out ?? parent;
  };
  // Offset of phase t's [lo, hi] in the criterion range table, filled for the current box when first asked.
  const critIndex = (mc: Member, t: number): number => {
    const i = t - window.lo;
    if (critStamp[i] !== critSerial) {
      affineRangeInto(box, critAt(mc, t), 0, critTable, 2 * i);
      critStamp[i] = critSerial;
    }
    return 2 * i;
  };

  // The coarse figure of the last box bounded (see boxBound), likewise over phases and members: what
  // the halves are ordered by.
  let boxScore = 0;
  // Bound of a box: per member the largest bound over its phases, then the least over members. A
  // member's phase scan stops at the first phase that passes the threshold, and the member scan stops
  // at the first member that fails it; so a box that fails carries a true bound, while a box that
  // passes carries a value that only orders the halves.
  const boxValue = (ctx: Ctx, phases: readonly (readonly number[])[], o: number): number => {
    stats.boxes++;
    const thr = target !== undefined ? target - Number.EPSILON : threshold(o);
    const M = ctx.members.length;
    let least = Number.POSITIVE_INFINITY;
    let leastScore = Number.POSITIVE_INFINITY;
    for (let i = 0; i < M; i++) {
      const m = (ctx.lead + i) % M;
      const mc = ctx.members[m];
      let v = Number.NEGATIVE_INFINITY;
      let score = Number.NEGATIVE_INFINITY;
      for (const t of phases[m]) {
        const bb = boxBound(mc.setup, mc.ranges, t, counts[o], mc.scratch, thr, mc.firstShift);
        const b = bb.bound_V;
        if (b <= thr) mc.firstShift = bb.shiftIndex;
        if (b > v) v = b;
        const coarse = bb.coarse_V;
        if (coarse > score) score = coarse;
        if (passes(o, v)) break;
      }
      if (v < least) least = v;
      if (score < leastScore) leastScore = score;
      if (!passes(o, least)) break;
    }
    boxScore = leastScore;
    return least;
  };

  // Branch and bound over boxes of grid-index ranges: split the widest range (at the sign change
  // first, so that the main tap stays affine), bound both halves, visit the better one first. The
  // halves of each depth live in buffers kept for the whole search.
  const S = sides.length;
  interface Level {
    readonly lo: [Int32Array, Int32Array];
    readonly hi: [Int32Array, Int32Array];
    readonly alive: [boolean[], boolean[]];
    readonly score: Float64Array;
    /** Phases per member of each half: `own[h]` when bounded here, the parent's for a single setting. */
    readonly phases: (readonly (readonly number[])[])[];
    readonly own: (readonly number[])[][];
  }
  const levels: Level[] = [];
  const levelAt = (d: number): Level => {
    while (levels.length <= d) {
      levels.push({
        lo: [new Int32Array(S), new Int32Array(S)],
        hi: [new Int32Array(S), new Int32Array(S)],
        alive: [new Array<boolean>(O).fill(false), new Array<boolean>(O).fill(false)],
        score: new Float64Array(2),
        phases: [[], []],
        own: [[], []],
      });
    }
    return levels[d];
  };
  const leafTaps = new Float64Array(T);
  const descend = (
    ctx: Ctx,
    lo: Int32Array,
    hi: Int32Array,
    alive: readonly boolean[],
    parentPhases: readonly (readonly number[])[],
    depth: number,
  ) => {
    let split = -1;
    let width = 0;
    for (let s = 0; s < S; s++) {
      if (hi[s] - lo[s] > width) {
        width = hi[s] - lo[s];
        split = s;
      }
    }
    if (split < 0) {
      let side = 0;
      for (let s = 0; s < S; s++) {
        leafTaps[sides[s]] = grids[s][lo[s]] * step;
        side += Math.abs(grids[s][lo[s]]);
      }
      // The enumeration's rule: the main tap is the largest grid value ≤ min(max, 1 − Σ|side|).
      const main = floorStep(Math.min(mainMax, 1 - side * step), step);
      if (main < mainMin - TAP_TOLERANCE) return;
      leafTaps[spec.pre] = main;
      leaf(ctx, leafTaps, alive);
      return;
    }
    const g = grids[split];
    let mid = (lo[split] + hi[split]) >> 1;
    if (g[lo[split]] < 0 && g[hi[split]] > 0) {
      let z = lo[split];
      while (g[z + 1] < 0) z++;
      mid = z; // [negative values] and [0 and positive values]
    }
    const L = levelAt(depth);
    let live = 0;
    let first = -1;
    let second = -1;
    for (let h = 0; h < 2; h++) {
      const clo = L.lo[h];
      const chi = L.hi[h];
      clo.set(lo);
      chi.set(hi);
      if (h === 0) chi[split] = mid;
      else clo[split] = mid + 1;
      const childAlive = L.alive[h];
      let single = true;
      for (let s = 0; s < S && single; s++) single = clo[s] === chi[s];
      if (single) {
        // A single setting: its own tiers decide.
        for (let o = 0; o < O; o++) childAlive[o] = alive[o];
        L.score[h] = Number.POSITIVE_INFINITY;
        L.phases[h] = parentPhases;
        if (live++ === 0) first = h;
        else second = h;
        continue;
      }
      if (!makeBox(clo, chi)) continue;
      const M = ctx.members.length;
      const phases = L.own[h];
      phases.length = M;
      L.phases[h] = phases;
      for (let m = 0; m < M; m++) {
        const mc = ctx.members[m];
        mc.ranges.reset(box);
        phases[m] = boxPhases(mc, parentPhases[m]);
      }
      let score = Number.NEGATIVE_INFINITY;
      let any = false;
      let firstAlive = true;
      for (let o = 0; o < O; o++) {
        childAlive[o] = false;
        if (!alive[o]) continue;
        const ub = boxValue(ctx, phases, o);
        if (passes(o, ub)) {
          childAlive[o] = true;
          any = true;
        } else prune(ctx, o, ub);
        if (firstAlive) score = boxScore;
        firstAlive = false;
      }
      // A live half stays live: its bound may be partial (see boxValue), so it is not re-tested here.
      if (any) {
        L.score[h] = score;
        if (live++ === 0) first = h;
        else second = h;
      }
    }
    if (live === 2 && L.score[second] > L.score[first]) {
      const t = first;
      first = second;
      second = t;
    }
    if (live >= 1) descend(ctx, L.lo[first], L.hi[first], L.alive[first], L.phases[first], depth + 1);
    if (live === 2) descend(ctx, L.lo[second], L.hi[second], L.alive[second], L.phases[second], depth + 1);
  };

  // Each CTLE setting's context is made when the search first needs it.
  const contexts: (Ctx | undefined)[] = new Array(nCtle);
  const contextOf = (ci: number): Ctx => {
    let ctx = contexts[ci];
    if (ctx !== undefined) return ctx;
    ctx = {
      ci,
      setting: space.ctleSettings[ci],
      lead: 0,
      seen: new Set<string>(),
      members: members.map((m, index) => {
        const channel = m.channels[ci];
        const setup = boundSetup(space, channel, maxCount);
        const coef = cachedCoefficients(setup, space, channel);
        let reach = 0;
        for (const sh of setup.shifts) reach = Math.max(reach, Math.abs(sh));
        return {
          index,
          channel,
          setup,
          coef,
          ranges: new BoxRanges(setup, coef, window.lo - reach, window.hi + reach),
          firstShift: 0,
          crit: new Map<number, Float64Array>(),
          scratch: createBoundScratch(setup),
          leafPhases: allPhases,
          leafSerial: -1,
        };
      }),
    };
    contexts[ci] = ctx;
    return ctx;
  };
  const given = options.order;
  if (given !== undefined) {
    const hit = new Uint8Array(nCtle);
    for (const ci of given) {
      if (!Number.isInteger(ci) || ci < 0 || ci >= nCtle || hit[ci] === 1) {
        throw new RangeError(`order must list every CTLE setting index 0…${nCtle - 1} once`);
      }
      hit[ci] = 1;
    }
    if (given.length !== nCtle) throw new RangeError(`order must list every CTLE setting index 0…${nCtle - 1} once`);
  }
  if (options.seeds !== undefined && options.seeds.length !== nCtle) {
    throw new RangeError(`seeds must hold one list per CTLE setting (${nCtle}), got ${options.seeds.length}`);
  }
  // Per CTLE setting, how many of its starting points the order looks at: the given ones and the
  // first member's own.
  const keyCounts = new Int32Array(nCtle);
  const seedsOf = (ci: number): Float64Array[] => {
    const given = options.seeds?.[ci] ?? [];
    const own = contextOf(ci).members.map((mc) => startingPoints(mc.channel, space));
    keyCounts[ci] = given.length + own[0].length;
    return [...given, ...own.flat()];
  };
  const everyone = new Array<boolean>(O).fill(true);

  // A cheap estimate of a setting's figure for objective o (within a fraction of a millivolt of the
  // exact one): per member the best over its policy's phases of the light bound, the least over
  // members. Used only to choose which settings to evaluate first.
  const estimate = (ctx: Ctx, taps: Float64Array, o: number): number => {
    let least = Number.POSITIVE_INFINITY;
    for (const mc of ctx.members) {
      const phases = space.policy === "max-height" ? allPhases : [criterionPhaseOf(mc.channel, space, taps)];
      let best = Number.NEGATIVE_INFINITY;
      for (const t of phases) {
        const lb = leafBound(mc.setup, mc.coef, t, taps, counts[o], mc.scratch);
        const ub = lb.bound_V;
        if (!(ub > best)) continue;
        const jj = lb.shiftIndex;
        const light =
          mc.setup.shifts.length === 0
            ? ub
            : lightPhaseBound(space, prepareEye(mc.channel, space, taps, counts[o], t), mc.setup.shifts[jj], mc.setup.weights[jj]);
        const v = Math.min(ub, light);
        if (v > best) best = v;
      }
      if (best < least) least = best;
    }
    return least;
  };
  // The legal grid setting with side-tap grid positions `pos` (null when the main tap falls short).
  const settingAt = (pos: Int32Array): Float64Array | null => {
    const taps = new Float64Array(T);
    let side = 0;
    for (let s = 0; s < sides.length; s++) {
      taps[sides[s]] = grids[s][pos[s]] * step;
      side += Math.abs(grids[s][pos[s]]);
    }
    const main = floorStep(Math.min(mainMax, 1 - side * step), step);
    if (main < mainMin - TAP_TOLERANCE) return null;
    taps[spec.pre] = main;
    return taps;
  };
  // Settings worth evaluating first in the first CTLE setting searched, so that the thresholds start
  // near their final values: per objective, a steepest-ascent walk on the estimate from the best
  // starting point over single-step moves of one side tap, then the end point's neighbours; all of
  // them, best estimate first.
  const climb = (ctx: Ctx, starts: readonly Float64Array[]): Float64Array[] => {
    if (grids.some((g) => g.length === 0)) return [];
    const found = new Map<string, { taps: Float64Array; value: number }>();
    const picks: { taps: Float64Array; value: number }[] = [];
    const positionOf = (taps: Float64Array): Int32Array | null => {
      const pos = new Int32Array(sides.length);
      for (let s = 0; s < sides.length; s++) {
        const i = grids[s].indexOf(Math.round(taps[sides[s]] / step));
        if (i < 0) return null;
        pos[s] = i;
      }
      return pos;
    };
    /** The grid positions one step away from `at` along one side tap. */
    const neighbours = (at: Int32Array): Int32Array[] => {
      const out: Int32Array[] = [];
      for (let s = 0; s < sides.length; s++) {
        for (const d of [-1, 1]) {
          const q = at[s] + d;
          if (q < 0 || q >= grids[s].length) continue;
          const pos = Int32Array.from(at);
          pos[s] = q;
          out.push(pos);
        }
      }
      return out;
    };
    for (let o = 0; o < O; o++) {
      const value = (pos: Int32Array): number => {
        const key = `${o}:${pos.join(",")}`;
        const known = found.get(key);
        if (known !== undefined) return known.value;
        const taps = settingAt(pos);
        const v = taps === null ? Number.NEGATIVE_INFINITY : estimate(ctx, taps, o);
        if (taps !== null) found.set(key, { taps, value: v });
        return v;
      };
      let at: Int32Array | null = null;
      let atValue = Number.NEGATIVE_INFINITY;
      for (const s of starts) {
        const pos = positionOf(s);
        if (pos === null) continue;
        const v = value(pos);
        if (v > atValue) {
          at = pos;
          atValue = v;
        }
      }
      if (at === null) continue;
      for (let steps = 0; steps < 4 * sides.length * 26; steps++) {
        let next: Int32Array | null = null;
        let nextValue = atValue;
        for (const pos of neighbours(at)) {
          const v = value(pos);
          if (v > nextValue) {
            next = pos;
            nextValue = v;
          }
        }
        if (next === null) break;
        at = next;
        atValue = nextValue;
      }
      // The end point and its neighbours, best first: as many as the objective keeps (and one more).
      const near: { taps: Float64Array; value: number }[] = [];
      const end = found.get(`${o}:${at.join(",")}`);
      if (end !== undefined) near.push(end);
      for (const pos of neighbours(at)) {
        const x = found.get(`${o}:${pos.join(",")}`);
        if (x !== undefined) near.push(x);
      }
      near.sort((a, b) => b.value - a.value);
      picks.push(...near.slice(0, o === 0 ? topCount + 1 : 2));
    }
    return picks.map((x) => x.taps);
  };
  try {
    const seeds: (Float64Array[] | undefined)[] = new Array(nCtle);
    const seedList = (ci: number): Float64Array[] => (seeds[ci] ??= seedsOf(ci));
    let order: number[];
    if (given !== undefined) order = [...given];
    else {
      // Order the CTLE settings by the best light bound of their starting points (for the first DFE
      // count; per starting point the least over the members): close to the best of their exact
      // figures, so the setting searched first usually holds the optimum and sets the threshold. A
      // population orders by its first member's starting points.
      const keys = space.ctleSettings.map((_, i) => {
        const ctx = contextOf(i);
        let best = Number.NEGATIVE_INFINITY;
        const starts = seedList(i);
        for (const s of starts.slice(0, keyCounts[i])) {
          let key = Number.POSITIVE_INFINITY;
          for (const mc of ctx.members) {
            const phase = space.policy === "max-height" ? 0 : criterionPhaseOf(mc.channel, space, s);
            const lb = leafBound(mc.setup, mc.coef, phase, s, counts[0], mc.scratch);
            const ub = lb.bound_V;
            const jj = lb.shiftIndex;
            const light =
              mc.setup.shifts.length === 0
                ? ub
                : lightPhaseBound(space, prepareEye(mc.channel, space, s, counts[0], phase), mc.setup.shifts[jj], mc.setup.weights[jj]);
            key = Math.min(key, ub, light);
          }
          if (key > best) best = key;
        }
        return best;
      });
      order = keys.map((_, i) => i).sort((a, b) => keys[b] - keys[a] || a - b);
    }
    let done = 0;
    for (const ci of order) {
      const ctx = contextOf(ci);
      if (done === 0 && target === undefined) for (const s of climb(ctx, seedList(ci))) leaf(ctx, s, everyone);
      // The whole FIR grid as one box first: the starting points are evaluated for the objectives it
      // leaves alive only (for the others nothing in this CTLE setting can enter the result).
      const lo = new Int32Array(sides.length);
      const hi = Int32Array.from(grids, (g) => g.length - 1);
      if (!grids.some((g) => g.length === 0) && makeBox(lo, hi)) {
        for (const mc of ctx.members) mc.ranges.reset(box);
        const phases = ctx.members.map((mc) => boxPhases(mc, allPhases));
        const alive = everyone.map((_, o) => {
          const ub = boxValue(ctx, phases, o);
          if (passes(o, ub)) return true;
          prune(ctx, o, ub);
          return false;
        });
        if (alive.some(Boolean)) {
          for (const s of seedList(ci)) leaf(ctx, s, alive);
          descend(ctx, lo, hi, alive, phases, 0);
        }
      }
      done++;
      options.onProgress?.(done / nCtle);
    }
  } catch (e) {
    if (!(e instanceof Found)) throw e;
  }
  if (target !== undefined && best[0] !== null && best[0].limiterHeadroom_V < target) best[0] = null;
  const perCtle: CtleOutcome[][] = counts.map((_, o) =>
    space.ctleSettings.map((_, ci) => {
      const f = found[o][ci];
      const v = f === null ? Number.NEGATIVE_INFINITY : f.limiterHeadroom_V;
      const upper = Math.max(v, pruned[o][ci]);
      return { best: f, upperBound_V: upper, exact: f !== null && v >= pruned[o][ci] };
    }),
  );
  return { best, perCtle, top, stats };
}
