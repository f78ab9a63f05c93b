// The statistical eye: per sampling phase, the law of the received sample for every transmitted
// level (ISI distribution ⊛ Gaussian noise), mixed over sampling phases by dual-Dirac jitter.
import { assertPulse } from "../pulse/assertPulse.ts";
import { cursorsAt } from "../pulse/cursorsAt.ts";
import type { Modulation, Pulse } from "../types.ts";
import { assertJitter, type Jitter, type JitterKernel, jitterKernel } from "./jitterKernel.ts";
import { nearestLevelsInto } from "./nearestLevelsInto.ts";
import { quantileBound } from "./quantileBound.ts";
import { DEFAULT_HALF_BINS, type SampleDistribution, sampleDistribution } from "./sampleDistribution.ts";

/** Symbol-spaced cursors at one integer sampling phase; `h[main]` is the main cursor (volts). */
export interface PhaseCursors {
  readonly h: Float64Array;
  readonly main: number;
}

/**
 * Where the statistical eye reads its cursors: for every integer phase offset `p` (in samples,
 * relative to the nominal main-cursor sample) the symbol-spaced cursors sampled there.
 */
export interface CursorSource {
  readonly samplesPerUi: number;
  cursorsAt(p: number): PhaseCursors;
}

/** Options of the statistical eye. */
export interface StatisticalEyeOptions {
  /** "nrz" (levels ±1) or "pam4" (levels ±1, ±1/3). */
  readonly modulation: Modulation;
  /** Gaussian noise rms at the sampler, in volts (≥ 0). */
  readonly noiseRms_V: number;
  /** Dual-Dirac sampling jitter (omit for none). */
  readonly jitter?: Jitter;
  /**
   * DFE tap weights in volts: tap `k` (1-based) subtracts `dfeTaps[k−1]·a_{−k}` at every phase,
   * assuming correct past decisions, so post-cursor `k` leaves the residual `h_k − dfeTaps[k−1]`.
   */
  readonly dfeTaps?: ArrayLike<number>;
  /** Grid resolution of the ISI law (see {@link sampleDistribution}). */
  readonly halfBins?: number;
  /**
   * Jitter weights below this are dropped at the ends of the mixing law (default 1e-38). An eye
   * evaluated at one error ratio `b` may use e.g. `b·1e-6`: the mixed probabilities then change by
   * less than a millionth of `b` per dropped weight.
   */
  readonly kernelFloor?: number;
}

/**
 * A statistical eye. Phases `t` are in samples relative to the nominal main-cursor sample and may
 * be fractional (linear interpolation between integer phases, mixed with the jitter law). Levels
 * are indexed in increasing order of symbol value.
 *
 * Conventions (used by every eye measure of Tapwright):
 * - symbols are independent and equiprobable (random data, so the transition density is ½ for NRZ
 *   and ¾ for PAM4);
 * - BER per symbol is conditional on the transmitted level: the error probability of a level
 *   against a threshold is `P(level sample falls on the wrong side)`, not averaged over levels;
 * - the error ratio of a decision threshold `v` ({@link StatisticalEye.ber}) is the sum of those
 *   conditional probabilities of the two levels it separates (nearest above and nearest below);
 * - jitter moves the sampling instant: `τ = ±DJ/2` (½ each) plus Gaussian RJ, the same for all
 *   cursors of one decision.
 */
export interface StatisticalEye {
  readonly modulation: Modulation;
  readonly samplesPerUi: number;
  readonly noiseRms_V: number;
  readonly jitter: Jitter | undefined;
  /** Jitter weights below this were dropped (see {@link StatisticalEyeOptions.kernelFloor}). */
  readonly kernelFloor: number;
  readonly dfeTaps: Float64Array;
  /** Symbol values in increasing order. */
  readonly levels: Float64Array;
  /** Main cursor at phase `t` (linear between integer phases), volts. */
  main(t: number): number;
  /** The law of ISI plus noise at the integer phase `p` (computed once, then kept). */
  distribution(p: number): SampleDistribution;
  /**
   * An upper bound on `distribution(p).quantile(prob)` (volts) that does not build the law when it
   * is not built yet (see {@link quantileBound}; `Infinity` when that gives nothing); the quantile
   * itself when the law is known.
   */
  quantileBound(p: number, prob: number): number;
  /** `P(sample < v | level)` at phase `t`, jitter included. */
  probBelow(level: number, t: number, v_V: number): number;
  /** `P(sample > v | level)` at phase `t`, jitter included. */
  probAbove(level: number, t: number, v_V: number): number;
  /**
   * Edges of every eye at phase `t` and error ratio `ber` (NRZ 1 eye, PAM4 3, bottom first), as
   * `[bottom₀, top₀, bottom₁, top₁, …]` in volts: for the eye between levels `i` and `i+1`, the top
   * edge is the `ber`-quantile of level `i+1` and the bottom edge the `(1 − ber)`-quantile of
   * level `i`. A closed eye has `top < bottom`.
   */
  eyeEdges(t: number, ber: number): Float64Array;
  /** Vertical openings `max(0, top − bottom)` of {@link StatisticalEye.eyeEdges}, one per eye. */
  eyeHeights(t: number, ber: number): Float64Array;
  /** Smallest of {@link StatisticalEye.eyeHeights}. */
  eyeHeight(t: number, ber: number): number;
  /** Error ratio of a decision threshold `v` at phase `t` (sum convention above), at most 1. */
  ber(t: number, v_V: number): number;
}

/**
 * The ISI cursors the law of one phase is built from: the pre-cursors, then the post-cursors less
 * the DFE taps (`h[main + k] − dfeTaps[k − 1]`; a tap beyond the cursors leaves `−dfeTaps[k − 1]`).
 *
 * @param h - symbol-spaced cursors, volts; `h[main]` is the main cursor (excluded).
 * @param main - index of the main cursor.
 * @param dfeTaps - DFE tap weights, volts.
 * @returns `main + max(h.length − 1 − main, dfeTaps.length)` values, volts.
 */
export function residualIsi(h: Float64Array, main: number, dfeTaps: ArrayLike<number>): Float64Array {
  const post = Math.max(h.length - 1 - main, dfeTaps.length);
  const isi = new Float64Array(main + post);
  for (let k = 0; k < main; k++) isi[k] = h[k];
  for (let k = 1; k <= post; k++) {
    const v = main + k < h.length ? h[main + k] : 0;
    isi[main + k - 1] = k <= dfeTaps.length ? v - dfeTaps[k - 1] : v;
  }
  return isi;
}

/** Symbol levels of a modulation, increasing. */
export function symbolLevels(modulation: Modulation): Float64Array {
  if (modulation === "nrz") return Float64Array.of(-1, 1);
  if (modulation === "pam4") return Float64Array.of(-1, -1 / 3, 1 / 3, 1);
  throw new RangeError(`modulation must be "nrz" or "pam4", got ${String(modulation)}`);
}

/**
 * The cursor source of a pulse response: at phase `p`, every sample `mainIndex + p + k·samplesPerUi`
 * inside the record (samples outside it are 0).
 */
export function pulseCursorSource(pulse: Pulse): CursorSource {
  assertPulse(pulse);
  const spu = pulse.samplesPerUi;
  const n = pulse.values_V.length;
  return {
    samplesPerUi: spu,
    cursorsAt(p: number): PhaseCursors {
      const at = pulse.mainIndex + p;
      const pre = at > 0 ? Math.floor(at / spu) : 0;
      const post = at < n - 1 ? Math.floor((n - 1 - at) / spu) : 0;
      return cursorsAt(pulse, at, pre, post);
    },
  };
}

/** Statistical eye of a pulse response (already scaled to volts at the sampler). */
export function statisticalEye(pulse: Pulse, options: StatisticalEyeOptions): StatisticalEye {
  return statisticalEyeOfCursors(pulseCursorSource(pulse), options);
}

/**
 * Statistical eye of any per-phase cursor source (the optimizer passes equalized cursors).
 *
 * @see B. Casper et al., "An accurate and efficient analysis method for multi-Gb/s chip-to-chip
 *   signaling schemes", Symposium on VLSI Circuits, 2002 [memory: recalled, not re-read].
 */
export function statisticalEyeOfCursors(source: CursorSource, options: StatisticalEyeOptions): StatisticalEye {
  if (source === null || typeof source !== "object" || typeof source.cursorsAt !== "function") {
    throw new TypeError("source must provide cursorsAt(p)");
  }
  const spu = source.samplesPerUi;
  if (!Number.isInteger(spu) || spu < 1) throw new RangeError(`samplesPerUi must be an integer ≥ 1, got ${spu}`);
  if (options === null || typeof options !== "object") throw new TypeError("options must be an object");
  const { modulation, noiseRms_V, jitter } = options;
  const levels = symbolLevels(modulation);
  if (!(Number.isFinite(noiseRms_V) && noiseRms_V >= 0)) {
    throw new RangeError(`noiseRms_V must be a finite number ≥ 0, got ${String(noiseRms_V)}`);
  }
  if (jitter !== undefined) assertJitter(jitter);
  const dfe = Float64Array.from(options.dfeTaps ?? []);
  for (let k = 0; k < dfe.length; k++) {
    if (!Number.isFinite(dfe[k])) throw new RangeError(`dfeTaps[${k}] is not finite (${dfe[k]})`);
  }
  const halfBins = options.halfBins ?? DEFAULT_HALF_BINS;
  const kernelFloor = options.kernelFloor ?? 1e-38;

  const mains = new Map<number, number>();
  const laws = new Map<number, SampleDistribution>();
  const kernels = new Map<number, JitterKernel>();

  const load = (p: number): SampleDistribution => {
    let law = laws.get(p);
    if (law !== undefined) return law;
    const { h, main } = source.cursorsAt(p);
    law = sampleDistribution(residualIsi(h, main, dfe), modulation, noiseRms_V, halfBins);
    laws.set(p, law);
    mains.set(p, h[main]);
    return law;
  };
  const mainAt = (p: number): number => {
    let m = mains.get(p);
    if (m === undefined) {
      const { h, main } = source.cursorsAt(p);
      m = h[main];
      mains.set(p, m);
    }
    return m;
  };
  const kernelAt = (t: number): { base: number; kernel: JitterKernel } => {
    if (!Number.isFinite(t)) throw new RangeError(`phase must be a finite number, got ${t}`);
    const base = Math.floor(t);
    const frac = t - base;
    let kernel = kernels.get(frac);
    if (kernel === undefined) {
      kernel = jitterKernel(jitter, spu, frac, kernelFloor);
      kernels.set(frac, kernel);
    }
    return { base, kernel };
  };
  const checkLevel = (level: number) => {
    if (!Number.isInteger(level) || level < 0 || level >= levels.length) {
      throw new RangeError(`level must be an integer 0…${levels.length - 1}, got ${String(level)}`);
    }
  };

  /** Scratch for the levels around a threshold (`ber`). */
  const bounds = new Int32Array(2);
  /** The jitter-weighted mixture of the laws around phase `t`, on one side of `v`. */
  const tailProb = (side: "probBelow" | "probAbove", level: number, t: number, v: number): number => {
    checkLevel(level);
    const { base, kernel } = kernelAt(t);
    let s = 0;
    for (let i = 0; i < kernel.weights.length; i++) {
      const p = base + kernel.first + i;
      s += kernel.weights[i] * load(p)[side](v - levels[level] * mainAt(p));
    }
    return s;
  };
  const probBelow = (level: number, t: number, v: number): number => tailProb("probBelow", level, t, v);
  const probAbove = (level: number, t: number, v: number): number => tailProb("probAbove", level, t, v);

  const main = (t: number): number => {
    const base = Math.floor(t);
    const f = t - base;
    const a = mainAt(base);
    return f === 0 ? a : a + f * (mainAt(base + 1) - a);
  };

  // Edge of a level's band at error ratio ber: where P(wrong side) = ber, found by bisection on a
  // bracket given by the per-phase quantiles (the mixture's quantile lies between them).
  const edge = (level: number, t: number, ber: number, upperEdge: boolean): number => {
    const { base, kernel } = kernelAt(t);
    let lo = Infinity;
    let hi = -Infinity;
    for (let i = 0; i < kernel.weights.length; i++) {
      const p = base + kernel.first + i;
      const q = load(p).quantile(ber);
      const x = levels[level] * mainAt(p) + (upperEdge ? q : -q);
      if (x < lo) lo = x;
      if (x > hi) hi = x;
    }
    if (kernel.weights.length === 1 || hi - lo <= 0) return lo;
    const f = upperEdge
      ? (v: number) => probBelow(level, t, v) - ber // increasing in v
      : (v: number) => ber - probAbove(level, t, v); // increasing in v
    const tol = 1e-12 * Math.max(Math.abs(lo), Math.abs(hi), 1e-9);
    for (let it = 0; it < 200 && hi - lo > tol; it++) {
      const m = 0.5 * (lo + hi);
      if (f(m) < 0) lo = m;
      else hi = m;
    }
    return 0.5 * (lo + hi);
  };

  const eyeEdges = (t: number, ber: number): Float64Array => {
    if (!(Number.isFinite(ber) && ber > 0 && ber < 0.5)) {
      throw new RangeError(`ber must be a number strictly between 0 and 0.5, got ${String(ber)}`);
    }
    const out = new Float64Array(2 * (levels.length - 1));
    for (let i = 0; i + 1 < levels.length; i++) {
      out[2 * i] = edge(i, t, ber, false);
      out[2 * i + 1] = edge(i + 1, t, ber, true);
    }
    return out;
  };
  const eyeHeights = (t: number, ber: number): Float64Array => {
    const e = eyeEdges(t, ber);
    const out = new Float64Array(levels.length - 1);
    for (let i = 0; i < out.length; i++) out[i] = Math.max(0, e[2 * i + 1] - e[2 * i]);
    return out;
  };

  return {
    modulation,
    samplesPerUi: spu,
    noiseRms_V,
    jitter,
    kernelFloor,
    dfeTaps: dfe,
    levels,
    main,
    distribution: (p: number) => {
      if (!Number.isInteger(p)) throw new RangeError(`p must be an integer phase, got ${p}`);
      return load(p);
    },
    quantileBound: (p: number, prob: number) => {
      if (!Number.isInteger(p)) throw new RangeError(`p must be an integer phase, got ${p}`);
      const law = laws.get(p);
      if (law !== undefined) return law.quantile(prob);
      const { h, main } = source.cursorsAt(p);
      if (!mains.has(p)) mains.set(p, h[main]);
      return quantileBound(residualIsi(h, main, dfe), modulation, noiseRms_V, prob, halfBins);
    },
    probBelow,
    probAbove,
    eyeEdges,
    eyeHeights,
    eyeHeight: (t, ber) => {
      const h = eyeHeights(t, ber);
      let m = Infinity;
      for (let i = 0; i < h.length; i++) if (h[i] < m) m = h[i];
      return m;
    },
    ber: (t, v) => {
      const m = main(t);
      nearestLevelsInto(levels, m, v, bounds);
      let s = 0;
      if (bounds[0] >= 0) s += probBelow(bounds[0], t, v);
      if (bounds[1] >= 0) s += probAbove(bounds[1], t, v);
      return s > 1 ? 1 : s;
    },
  };
}
