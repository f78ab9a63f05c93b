// Upper bounds on the limiter headroom of a setting, and of a whole box of settings, that are cheap
// enough to prune the joint search without ever discarding the true optimum.
import { qFromBer } from "../analysis/ber.ts";
import { jitterKernel } from "../analysis/jitterKernel.ts";
import { DEFAULT_HALF_BINS, NOISE_TAIL_SIGMAS } from "../analysis/sampleDistribution.ts";
import type { CtleChannel } from "./ctleChannel.ts";
import { kernelFloorOf } from "./evaluateSetting.ts";
import type { SearchSpace } from "./searchSpace.ts";

/**
 * Per CTLE channel: which equalized cursors the bound looks at, and the constants of the bound.
 *
 * The bound rests on three facts about the eye's upper edge `top = L·g₀ + q` (`q` the lower
 * `b`-quantile of ISI plus noise `X + n`, `X` symmetric and independent of `n`):
 * 1. `P(Y + n < x) ≥ min(Φ(x/σ), ¼)` for any symmetric `Y` (Φ is convex below its ¼-quantile);
 * 2. for any `k` residual cursors `S`, all of them at their adverse extreme has probability `m^−k`
 *    (m = 2 for NRZ, 4 for PAM4), so with fact 1 for the rest: `q ≤ −Σ_S|r| − σ·Q(b·m^k)` whenever
 *    `b·m^k ≤ ¼` (k = 0 is fact 1 alone: `q ≤ −σ·Q(b)`);
 * 3. under jitter the tail is a mixture over phases `t + j` with weights `w_j`, so the edge at phase t
 *    is no higher than the bound at any single phase `t + j` with `b/w_j`; the least of them counts.
 * The computed eye bins the ISI (a two-point part moves less than one grid step Δ; a PAM4 cursor is
 * two parts) and interpolates between nodes (less than Δ), so the bound of `k` cursors adds
 * `2(k + 1)·Δ` (NRZ) or `(4k + 2)·Δ` (PAM4), with Δ bounded from above.
 */
export interface BoundSetup {
  /** Number of FIR taps. */
  readonly taps: number;
  /** Offsets (relative to the main cursor) of the equalized cursors used; offset 0 first. */
  readonly offsets: Int32Array;
  /** Jitter phase offsets `j` (samples) whose weight gives a bound (`b/w_j ≤ ¼`), outermost first, and their weights. */
  readonly shifts: Int32Array;
  readonly weights: Float64Array;
  /** `σ·Q(b·m^k/w_j)` of fact 2 at `[j·K + k]` (k = 0 for fact 1); NaN where it gives nothing. */
  readonly qSigma: Float64Array;
  /** Binning slack in grid steps for a bound over k cursors: `slack[k]·Δ`. */
  readonly slack: Float64Array;
  /** Noise rms of the channel (for the grid step). */
  readonly noiseRms_V: number;
  /** Level spacing: the eye is `levelGap·g₀ + 2q`. */
  readonly levelGap: number;
  readonly sensitivity_V: number;
  /** DFE limits (volts). */
  readonly limits_V: Float64Array;
}

/** Offsets of pre-cursors and of post-cursors beyond the DFE span that the bound watches. */
const EXTRA = 3;

/** Bound constants for one CTLE channel, for DFE counts up to `maxDfe`. */
export function boundSetup(space: SearchSpace, channel: CtleChannel, maxDfe: number): BoundSetup {
  const T = space.firSpec.pre + 1 + space.firSpec.post;
  const offs: number[] = [0];
  for (let k = 1; k <= EXTRA; k++) offs.push(-k);
  for (let k = 1; k <= maxDfe + EXTRA; k++) offs.push(k);
  const K = offs.length;
  const ber = space.budget.targetBer;
  const kernel = jitterKernel(space.jitter, channel.pulse.samplesPerUi, 0, kernelFloorOf(space));
  // Phases whose weight gives a bound, outermost first: their worse eyes usually bound lowest.
  const usable = Array.from(kernel.weights, (w, i) => ({ shift: kernel.first + i, w })).filter((x) => ber / x.w <= 0.25);
  usable.sort((a, b) => Math.abs(b.shift) - Math.abs(a.shift) || a.shift - b.shift);
  const shifts = usable.map((x) => x.shift);
  const weights = usable.map((x) => x.w);
  const sigma = channel.noiseRms_V;
  const mult = space.modulation === "pam4" ? 4 : 2;
  const qSigma = new Float64Array(shifts.length * K);
  weights.forEach((w, j) => {
    for (let k = 0; k < K; k++) {
      const arg = (ber / w) * mult ** k;
      qSigma[j * K + k] = arg <= 0.25 ? sigma * qFromBer(arg) : Number.NaN;
    }
  });
  const slack = Float64Array.from({ length: K }, (_, k) => (mult === 2 ? 2 * (k + 1) : 4 * k + 2));
  return {
    taps: T,
    offsets: Int32Array.from(offs),
    shifts: Int32Array.from(shifts),
    weights: Float64Array.from(weights),
    qSigma,
    slack,
    noiseRms_V: sigma,
    levelGap: space.levelGap,
    sensitivity_V: space.budget.limiterSensitivity_V,
    limits_V: space.dfeLimits_V,
  };
}

/** The watched cursors' coefficients at one absolute sampling phase. */
export interface PhaseCoefficients {
  /** `F × T`: cursor `offsets[f]` is `Σ_j c_j·v[f·T + j]`. */
  readonly v: Float64Array;
  /** `s·max_j Σ|h|` over the cursors the bound does not watch: bounds their Σ|r|, volts. */
  readonly tail: number;
}

/** Coefficients of the watched cursors at phase `p` (samples from the main cursor). */
export function phaseCoefficients(setup: BoundSetup, space: SearchSpace, channel: CtleChannel, p: number): PhaseCoefficients {
  const h = channel.cursors(p);
  const T = setup.taps;
  const F = setup.offsets.length;
  const base = channel.pre + space.firSpec.pre;
  const s = space.scale_V;
  const v = new Float64Array(F * T);
  let total = 0;
  for (let i = 0; i < h.length; i++) total += Math.abs(h[i]);
  let tail = 0;
  for (let j = 0; j < T; j++) {
    let watched = 0;
    for (let f = 0; f < F; f++) {
      const i = base + setup.offsets[f] - j;
      if (i >= 0 && i < h.length) {
        v[f * T + j] = s * h[i];
        watched += Math.abs(h[i]);
      }
    }
    tail = Math.max(tail, total - watched);
  }
  return { v, tail: s * tail };
}

/** Coefficients by absolute phase, computed once per channel. */
export type CoefficientSource = (p: number) => PhaseCoefficients;

function clip(x: number, l: number): number {
  return x > l ? l : x < -l ? -l : x;
}

function minAbs(lo: number, hi: number): number {
  return lo <= 0 && hi >= 0 ? 0 : Math.min(Math.abs(lo), Math.abs(hi));
}

/**
 * Bound from the main cursor and the watched residual magnitudes (sorted here, descending);
 * `sumAbs` bounds their total from above (for the grid step).
 */
function boundFrom(setup: BoundSetup, j: number, tail: number, g0: number, mags: Float64Array, n: number, sumAbs: number): number {
  for (let i = 1; i < n; i++) {
    const x = mags[i];
    let j = i - 1;
    while (j >= 0 && mags[j] < x) {
      mags[j + 1] = mags[j];
      j--;
    }
    mags[j + 1] = x;
  }
  const delta = (sumAbs + tail + NOISE_TAIL_SIGMAS * setup.noiseRms_V) / DEFAULT_HALF_BINS;
  const q = setup.qSigma;
  const K = setup.offsets.length;
  let best = Number.POSITIVE_INFINITY;
  let cum = 0;
  for (let k = 0; k < K; k++) {
    if (k > 0) cum += mags[k - 1];
    const qk = q[j * K + k];
    if (Number.isNaN(qk)) break;
    const v = -2 * cum - 2 * qk + setup.slack[k] * delta;
    if (v < best) best = v;
  }
  const eye = setup.levelGap * g0 + best;
  return (eye > 0 ? eye : 0) - setup.sensitivity_V;
}

/**
 * Upper bound on the limiter headroom of FIR `taps` sampled at phase `t` with `dfeCount` DFE taps
 * (closed form, clipped, set at `t`): the least of the single-phase bounds over the jitter phases.
 * `scratch` must hold `offsets.length + 4` numbers; `scratch[offsets.length]` receives the index (in
 * `setup.shifts`) of the phase that gave the bound.
 */
export function leafBound(
  setup: BoundSetup,
  coef: CoefficientSource,
  t: number,
  taps: ArrayLike<number>,
  dfeCount: number,
  scratch: Float64Array,
): number {
  const T = setup.taps;
  const F = setup.offsets.length;
  const own = coef(t).v;
  let out = Number.POSITIVE_INFINITY;
  let arg = 0;
  for (let jj = 0; jj < setup.shifts.length; jj++) {
    const shift = setup.shifts[jj];
    const pc = coef(t + shift);
    const a = pc.v;
    let g0 = 0;
    for (let j = 0; j < T; j++) g0 += taps[j] * a[j];
    let sum = 0;
    for (let f = 1; f < F; f++) {
      let v = 0;
      for (let j = 0; j < T; j++) v += taps[j] * a[f * T + j];
      const k = setup.offsets[f];
      let r: number;
      if (k > 0 && k <= dfeCount) {
        const lim = setup.limits_V[k - 1];
        if (shift === 0) {
          r = Math.abs(v) - lim;
          if (r < 0) r = 0;
        } else {
          let w = 0;
          for (let j = 0; j < T; j++) w += taps[j] * own[f * T + j];
          r = Math.abs(v - clip(w, lim));
        }
      } else {
        r = Math.abs(v);
      }
      scratch[f - 1] = r;
      sum += r;
    }
    const b = boundFrom(setup, jj, pc.tail, g0, scratch, F - 1, sum);
    if (b < out) {
      out = b;
      arg = jj;
    }
  }
  scratch[F] = arg;
  return out;
}

/**
 * Taps as an affine function of the free side taps over a box: `c = base + Σ_s x_s·dir_s`, with the
 * main tap following the side taps (`c_main = 1 − Σ|side|` on a box where each side tap keeps its
 * sign). The box gives each free side tap an interval. A box is a reusable buffer: the first
 * `count` entries of `free`, `lo`, `hi` and `mainSlope` are in use.
 */
export interface TapBox {
  /** Taps at the box's reference point (free side taps 0; their values come from `lo`/`hi`). */
  readonly base: Float64Array;
  /** Indices of the free side taps and, per free tap, its interval and the main tap's slope. */
  readonly free: Int32Array;
  readonly lo: Float64Array;
  readonly hi: Float64Array;
  readonly mainSlope: Float64Array;
  /** Number of free side taps. */
  count: number;
  /** Main tap index; an extra interval `[mainLo, 0]` on the main tap covers grid flooring and caps. */
  readonly main: number;
  mainLo: number;
}

/** An empty box for FIRs of `taps` taps with the main tap at `main`. */
export function createTapBox(taps: number, main: number): TapBox {
  return {
    base: new Float64Array(taps),
    free: new Int32Array(taps),
    lo: new Float64Array(taps),
    hi: new Float64Array(taps),
    mainSlope: new Float64Array(taps),
    count: 0,
    main,
    mainLo: 0,
  };
}

/** Range of `Σ_j c_j·vec[o + j]` over a box, written to `out[at]`, `out[at + 1]`. */
function affineRange(box: TapBox, vec: Float64Array, o: number, T: number, out: Float64Array, at: number): void {
  let c = 0;
  for (let j = 0; j < T; j++) c += box.base[j] * vec[o + j];
  let lo = c;
  let hi = c;
  const vm = vec[o + box.main];
  for (let s = 0; s < box.count; s++) {
    const coef = vec[o + box.free[s]] + box.mainSlope[s] * vm;
    const a = coef * box.lo[s];
    const b = coef * box.hi[s];
    if (a < b) {
      lo += a;
      hi += b;
    } else {
      lo += b;
      hi += a;
    }
  }
  const m = box.mainLo * vm;
  if (m < 0) lo += m;
  else hi += m;
  out[at] = lo;
  out[at + 1] = hi;
}

/**
 * The ranges over one box of every watched cursor at any absolute phase, computed when first asked
 * and shared by every sampling phase, jitter phase and DFE count the box is bounded for; and the
 * ranges of each cursor's change between a sampling phase and a jitter phase around it (what a DFE
 * tap set at the sampling phase leaves at the jitter phase, when the tap does not clip).
 */
export class BoxRanges {
  /** Per phase, `2F + 1` numbers: `[lo, hi]` of each watched cursor `f`, then the tail bound. */
  readonly values: Float64Array;
  /** Per (sampling phase, jitter phase index), `2F` numbers: `[lo, hi]` of cursor f at t + shift minus at t. */
  readonly diffs: Float64Array;
  readonly #setup: BoundSetup;
  readonly #coef: CoefficientSource;
  readonly #minPhase: number;
  readonly #count: number;
  readonly #stamp: Int32Array;
  readonly #diffStamp: Int32Array;
  /** Per (sampling phase, jitter phase index), the coefficients of the changes (computed once). */
  readonly #diffVec: (Float64Array | undefined)[];
  readonly #joint: Float64Array;
  readonly #pair = new Float64Array(2);
  #serial = 0;
  #box: TapBox | null = null;

  /**
   * @param setup - the channel's bound constants.
   * @param coef - its watched cursors' coefficients per phase.
   * @param minPhase - lowest absolute phase (samples) asked for.
   * @param maxPhase - highest.
   */
  constructor(setup: BoundSetup, coef: CoefficientSource, minPhase: number, maxPhase: number) {
    const F = setup.offsets.length;
    this.#setup = setup;
    this.#coef = coef;
    this.#minPhase = minPhase;
    this.#count = maxPhase - minPhase + 1;
    this.values = new Float64Array(this.#count * (2 * F + 1));
    this.#stamp = new Int32Array(this.#count);
    this.diffs = new Float64Array(this.#count * setup.shifts.length * 2 * F);
    this.#diffStamp = new Int32Array(this.#count * setup.shifts.length);
    this.#diffVec = new Array<Float64Array | undefined>(this.#count * setup.shifts.length);
    this.#joint = new Float64Array(setup.taps);
  }

  /** Starts a new box (its ranges are computed afresh). */
  reset(box: TapBox): void {
    this.#box = box;
    this.#serial++;
  }

  /** Offset in `values` of phase `p`'s numbers. */
  at(p: number): number {
    const slot = p - this.#minPhase;
    if (!(slot >= 0 && slot < this.#count)) {
      throw new RangeError(`phase ${p} is outside the box table's ${this.#minPhase} … ${this.#minPhase + this.#count - 1}`);
    }
    const F = this.#setup.offsets.length;
    const T = this.#setup.taps;
    const o = slot * (2 * F + 1);
    if (this.#stamp[slot] !== this.#serial) {
      const box = this.#box as TapBox;
      const pc = this.#coef(p);
      for (let f = 0; f < F; f++) affineRange(box, pc.v, f * T, T, this.values, o + 2 * f);
      this.values[o + 2 * F] = pc.tail;
      this.#stamp[slot] = this.#serial;
    }
    return o;
  }

  /**
   * Largest values over the box of `gap·g₀(p) − 2·Σ_{i<k} sign_i·r_i` for k = 1 … n, written to
   * `out[k − 1]`, where `r_i` is watched cursor `fs[i]` at phase `p = t + shifts[jj]` (`change[i]`
   * 0) or its change from `t` to `p` (1): affine functions of the taps, so the maxima are exact.
   */
  jointMax(
    t: number,
    jj: number,
    gap: number,
    fs: Int32Array,
    signs: Float64Array,
    change: Uint8Array,
    n: number,
    out: Float64Array,
  ): void {
    const T = this.#setup.taps;
    const v = this.#coef(t + this.#setup.shifts[jj]).v;
    const w = this.#joint;
    for (let j = 0; j < T; j++) w[j] = gap * v[j];
    for (let i = 0; i < n; i++) {
      const d = change[i] === 1 ? this.#changeVec(t, jj) : v;
      const o = fs[i] * T;
      const s = 2 * signs[i];
      for (let j = 0; j < T; j++) w[j] -= s * d[o + j];
      affineRange(this.#box as TapBox, w, 0, T, this.#pair, 0);
      out[i] = this.#pair[1];
    }
  }

  /** Coefficients of every watched cursor's change from `t` to `t + shifts[jj]` (computed once). */
  #changeVec(t: number, jj: number): Float64Array {
    const S = this.#setup.shifts.length;
    const slot = (t - this.#minPhase) * S + jj;
    let v = this.#diffVec[slot];
    if (v === undefined) {
      const F = this.#setup.offsets.length;
      const T = this.#setup.taps;
      const a = this.#coef(t + this.#setup.shifts[jj]).v;
      const b = this.#coef(t).v;
      v = new Float64Array(F * T);
      for (let i = 0; i < F * T; i++) v[i] = a[i] - b[i];
      this.#diffVec[slot] = v;
    }
    return v;
  }

  /** Offset in `diffs` of the changes from phase `t` to `t + shifts[jj]`. */
  diff(t: number, jj: number): number {
    const S = this.#setup.shifts.length;
    const F = this.#setup.offsets.length;
    const T = this.#setup.taps;
    const slot = (t - this.#minPhase) * S + jj;
    const o = slot * 2 * F;
    if (this.#diffStamp[slot] !== this.#serial) {
      const v = this.#changeVec(t, jj);
      const box = this.#box as TapBox;
      // Only the cursors a DFE tap may cancel (offsets 1 … number of DFE limits).
      const offsets = this.#setup.offsets;
      const dfe = this.#setup.limits_V.length;
      for (let f = 1; f < F; f++) {
        if (offsets[f] >= 1 && offsets[f] <= dfe) affineRange(box, v, f * T, T, this.diffs, o + 2 * f);
      }
      this.#diffStamp[slot] = this.#serial;
    }
    return o;
  }
}

/** Largest number of cursors in the joint bound of a box. */
const JOINT_CURSORS = 3;

/**
 * Upper bound on the limiter headroom of every FIR of a box, sampled at phase `t` with `dfeCount`
 * DFE taps. Per jitter phase: each watched cursor is affine in the free side taps, so its range over
 * the box is exact, and the bound of the k largest residuals (see {@link BoundSetup}) is taken two
 * ways — with the largest main cursor and the smallest residuals independently, and, for k ≤ 3,
 * with the main cursor and a fixed set of k residuals together: `L·g₀ − 2·Σ|r_i| ≤ L·g₀ − 2·Σ s_i·r_i`
 * for any signs `s_i`, an affine function whose maximum over the box is exact (the residuals with
 * the largest least magnitudes, signed as their ranges; a DFE residual at a jitter phase when its
 * tap cannot clip, as the cursor's change). The least over the ways and jitter phases counts. The
 * jitter phases are tried from index `first` on (then the others in the setup's order), and the
 * search stops at the first bound at or below `stopAt` (still a valid bound). `scratch` must hold
 * `offsets.length + 4` numbers; `scratch[offsets.length]` receives the index of the jitter phase
 * that gave the bound, `scratch[offsets.length + 1]` the least independent-way bound (a coarser
 * figure that orders boxes better: it does not favour the boxes whose joint bound is loose).
 */
export function boxBound(
  setup: BoundSetup,
  ranges: BoxRanges,
  t: number,
  dfeCount: number,
  scratch: Float64Array,
  stopAt = Number.NEGATIVE_INFINITY,
  first = 0,
): number {
  const F = setup.offsets.length;
  const S = setup.shifts.length;
  const K = setup.offsets.length;
  const vals = ranges.values;
  const own = ranges.at(t);
  const fs = jointCursors;
  const signs = jointSigns;
  const change = jointChange;
  const mags = jointMags;
  let out = Number.POSITIVE_INFINITY;
  let loose = Number.POSITIVE_INFINITY;
  let arg = first;
  for (let n = 0; n < S; n++) {
    const jj = n === 0 ? first : n <= first ? n - 1 : n;
    const shift = setup.shifts[jj];
    const o = ranges.at(t + shift);
    const g0max = vals[o + 1];
    let sum = 0;
    let picked = 0;
    for (let f = 1; f < F; f++) {
      let a = vals[o + 2 * f];
      let b = vals[o + 2 * f + 1];
      const k = setup.offsets[f];
      let m: number;
      let affine = true;
      let isChange = 0;
      if (k > 0 && k <= dfeCount) {
        const lim = setup.limits_V[k - 1];
        if (shift === 0) {
          const big = Math.max(Math.abs(a), Math.abs(b));
          m = minAbs(a, b) - lim;
          if (m < 0) m = 0;
          sum += big > lim ? big - lim : 0;
          affine = false;
        } else {
          const wlo = vals[own + 2 * f];
          const whi = vals[own + 2 * f + 1];
          if (wlo >= -lim && whi <= lim) {
            // The tap never clips in the box: the residual is the cursor's change, an affine function.
            const d = ranges.diff(t, jj);
            a = ranges.diffs[d + 2 * f];
            b = ranges.diffs[d + 2 * f + 1];
            isChange = 1;
          } else {
            const ra = a - clip(whi, lim);
            const rb = b - clip(wlo, lim);
            a = ra;
            b = rb;
            affine = false;
          }
          m = minAbs(a, b);
          sum += Math.max(Math.abs(a), Math.abs(b));
        }
      } else {
        m = minAbs(a, b);
        sum += Math.max(Math.abs(a), Math.abs(b));
      }
      scratch[f - 1] = m;
      // Keep the JOINT_CURSORS affine residuals with the largest least magnitudes.
      if (affine && m > 0 && (picked < JOINT_CURSORS || m > mags[picked - 1])) {
        let i = picked < JOINT_CURSORS ? picked++ : picked - 1;
        while (i > 0 && mags[i - 1] < m) {
          mags[i] = mags[i - 1];
          fs[i] = fs[i - 1];
          signs[i] = signs[i - 1];
          change[i] = change[i - 1];
          i--;
        }
        mags[i] = m;
        fs[i] = f;
        signs[i] = a > 0 ? 1 : -1;
        change[i] = isChange;
      }
    }
    const tail = vals[o + 2 * F];
    let bound = boundFrom(setup, jj, tail, g0max, scratch, F - 1, sum);
    if (bound < loose) loose = bound;
    if (bound > stopAt && picked > 0) {
      const delta = (sum + tail + NOISE_TAIL_SIGMAS * setup.noiseRms_V) / DEFAULT_HALF_BINS;
      ranges.jointMax(t, jj, setup.levelGap, fs, signs, change, picked, jointOut);
      for (let k = 1; k <= picked; k++) {
        const qk = setup.qSigma[jj * K + k];
        if (Number.isNaN(qk)) break;
        const eye = jointOut[k - 1] - 2 * qk + setup.slack[k] * delta;
        const v = (eye > 0 ? eye : 0) - setup.sensitivity_V;
        if (v < bound) bound = v;
      }
    }
    if (bound < out) {
      out = bound;
      arg = jj;
    }
    if (out <= stopAt) break;
  }
  scratch[F] = arg;
  scratch[F + 1] = loose;
  return out;
}

const jointCursors = new Int32Array(JOINT_CURSORS);
const jointSigns = new Float64Array(JOINT_CURSORS);
const jointChange = new Uint8Array(JOINT_CURSORS);
const jointMags = new Float64Array(JOINT_CURSORS);
const jointOut = new Float64Array(JOINT_CURSORS);

/** Range over a box of an affine functional given by its per-tap coefficients `vec` (length T). */
export function boxRange(box: TapBox, vec: Float64Array, T: number, out: Float64Array): void {
  affineRange(box, vec, 0, T, out, 0);
}
