// The statistical eye: per sampling phase, the law of the received sample for every transmitted
// level (ISI distribution ⊛ Gaussian noise), mixed over sampling phases by dual-Dirac jitter.
import { assertPulse } from "../pulse/assertPulse.ts";
import { cursorsAt } from "../pulse/cursorsAt.ts";
import type { Modulation, Pulse } from "../types.ts";
import { berPerLevelTail, edgeTail } from "./berConvention.ts";
import { PAM4_INNER_LEVEL } from "./isiParts.ts";
import { assertJitter, type Jitter } from "./jitterKernel.ts";
import { JitterMixture } from "./jitterMixture.ts";
import { nearestLevelsInto } from "./nearestLevelsInto.ts";
import { type CursorSource, type PhaseCursors, PhaseLaws } from "./phaseLaws.ts";
import type { SampleDistribution } from "./sampleDistribution.ts";

/** Options of the statistical eye. */
export interface StatisticalEyeOptions {
  /** "nrz" (levels ±1) or "pam4" (levels ±1, ±x; x = ⅓ unless `pam4InnerLevel` says otherwise). */
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
  /**
   * PAM4 inner level relative to the outer one (0 < x < 1, default ⅓): a transmitter with level
   * mismatch. With symmetric levels `±1, ±x`, `RLM = min(3x, 2 − 3x)` (IEEE 802.3 Clause 120D level
   * separation mismatch ratio, [memory: recalled, not re-read]).
   */
  readonly pam4InnerLevel?: number;
  /**
   * Independent symmetric two-point parts (volts) added to the law of every phase and never cancelled
   * by the DFE — e.g. an asynchronous aggressor's crosstalk cursors through `isiParts`.
   */
  readonly extraParts_V?: Float64Array;
  /** Divides every law's grid step (≥ 1, default 1; see `lawStep`): 2 halves it, for convergence checks. */
  readonly refine?: number;
  /**
   * The bit error ratio the eye is asked at most (default 1e-12): every law is made exact to second
   * order at the edge tail it implies (`edgeTail`; see `sampleDistribution`'s `designTail`). Other
   * ratios (bathtub, contours) come from the same laws, with the grid errors measured in the README.
   */
  readonly targetBer?: number;
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
 * - `probBelow` / `probAbove` are conditional on the transmitted level: `P(the level's sample falls
 *   on that side of v | level)`;
 * - every error ratio is a bit error ratio (see `berPerLevelTail`): a decision threshold `v` between
 *   two levels causes `BER = f·(P(upper level below v) + P(lower level above v))`, `f = ½` for NRZ
 *   and `⅛` for Gray-coded PAM4 ({@link StatisticalEye.ber}); an eye's edges at a target BER are where
 *   one level's conditional tail reaches `BER/f` (`edgeTail`: 2·BER NRZ, 8·BER PAM4), so the eye
 *   height at BER is the vertical extent of the BER contour at that phase wherever only one level
 *   errs at each edge;
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
   * is not built yet (see `quantileBound`; `Infinity` when that gives nothing); the quantile
   * itself when the law is known.
   */
  quantileBound(p: number, prob: number): number;
  /** `P(sample < v | level)` at phase `t`, jitter included. */
  probBelow(level: number, t: number, v_V: number): number;
  /** `P(sample > v | level)` at phase `t`, jitter included. */
  probAbove(level: number, t: number, v_V: number): number;
  /**
   * Edges of every eye at phase `t` where each level's conditional tail is `tail` (NRZ 1 eye, PAM4
   * 3, bottom first), as `[bottom₀, top₀, bottom₁, top₁, …]` in volts: for the eye between levels
   * `i` and `i+1`, the top edge is the `tail`-quantile of level `i+1` and the bottom edge the
   * `(1 − tail)`-quantile of level `i`. A closed eye has `top < bottom`.
   */
  levelEdges(t: number, tail: number): Float64Array;
  /** {@link StatisticalEye.levelEdges} at the bit error ratio `ber` (tail `edgeTail(ber)`). */
  eyeEdges(t: number, ber: number): Float64Array;
  /** Vertical openings `max(0, top − bottom)` of {@link StatisticalEye.eyeEdges}, one per eye. */
  eyeHeights(t: number, ber: number): Float64Array;
  /** Smallest of {@link StatisticalEye.eyeHeights}. */
  eyeHeight(t: number, ber: number): number;
  /** Bit error ratio of a decision threshold `v` at phase `t` (convention above), at most 1. */
  ber(t: number, v_V: number): number;
}

/** The error ratio a statistical eye's laws are tuned for unless told otherwise. */
export const DEFAULT_TARGET_BER = 1e-12;

/**
 * Symbol levels of a modulation, increasing.
 *
 * @param modulation - "nrz" (±1) or "pam4" (±1, ±innerLevel).
 * @param innerLevel - PAM4 inner level, 0 < x < 1 (default ⅓).
 */
export function symbolLevels(modulation: Modulation, innerLevel = PAM4_INNER_LEVEL): Float64Array {
  if (modulation === "nrz") return Float64Array.of(-1, 1);
  if (modulation === "pam4") {
    if (!(innerLevel > 0 && innerLevel < 1))
      throw new RangeError(`pam4InnerLevel must be a number in (0, 1), got ${String(innerLevel)}`);
    return Float64Array.of(-1, -innerLevel, innerLevel, 1);
  }
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

/** Validated options with their defaults. */
function resolveOptions(source: CursorSource, options: StatisticalEyeOptions) {
  if (source === null || typeof source !== "object" || typeof source.cursorsAt !== "function") {
    throw new TypeError("source must provide cursorsAt(p)");
  }
  const spu = source.samplesPerUi;
  if (!Number.isInteger(spu) || spu < 1) throw new RangeError(`samplesPerUi must be an integer ≥ 1, got ${spu}`);
  if (options === null || typeof options !== "object") throw new TypeError("options must be an object");
  const { modulation, noiseRms_V, jitter } = options;
  const innerLevel = options.pam4InnerLevel ?? PAM4_INNER_LEVEL;
  const levels = symbolLevels(modulation, innerLevel);
  if (!(Number.isFinite(noiseRms_V) && noiseRms_V >= 0)) {
    throw new RangeError(`noiseRms_V must be a finite number ≥ 0, got ${String(noiseRms_V)}`);
  }
  if (jitter !== undefined) assertJitter(jitter);
  const dfeTaps = Float64Array.from(options.dfeTaps ?? []);
  for (let k = 0; k < dfeTaps.length; k++) {
    if (!Number.isFinite(dfeTaps[k])) throw new RangeError(`dfeTaps[${k}] is not finite (${dfeTaps[k]})`);
  }
  const extraParts_V = options.extraParts_V ?? new Float64Array(0);
  if (!(extraParts_V instanceof Float64Array))
    throw new TypeError("extraParts_V must be a Float64Array of magnitudes in volts");
  for (let i = 0; i < extraParts_V.length; i++) {
    if (!(Number.isFinite(extraParts_V[i]) && extraParts_V[i] >= 0)) {
      throw new RangeError(`extraParts_V[${i}] must be a finite number ≥ 0, got ${extraParts_V[i]}`);
    }
  }
  const refine = options.refine ?? 1;
  if (!(Number.isFinite(refine) && refine >= 1))
    throw new RangeError(`refine must be a finite number ≥ 1, got ${String(refine)}`);
  const kernelFloor = options.kernelFloor ?? 1e-38;
  const targetBer = options.targetBer ?? DEFAULT_TARGET_BER;
  if (!(Number.isFinite(targetBer) && targetBer > 0 && targetBer / berPerLevelTail(modulation) < 0.5)) {
    throw new RangeError(
      `targetBer must be a bit error ratio in (0, ${0.5 * berPerLevelTail(modulation)}), got ${String(targetBer)}`,
    );
  }
  const law = { refine, designTail: edgeTail(modulation, targetBer) };
  return { spu, modulation, noiseRms_V, jitter, innerLevel, levels, dfeTaps, extraParts_V, law, kernelFloor };
}

/**
 * Statistical eye of any per-phase cursor source (the optimizer passes equalized cursors).
 *
 * @see B. Casper et al., "An accurate and efficient analysis method for multi-Gb/s chip-to-chip
 *   signaling schemes", Symposium on VLSI Circuits, 2002 [memory: recalled, not re-read].
 */
export function statisticalEyeOfCursors(source: CursorSource, options: StatisticalEyeOptions): StatisticalEye {
  const o = resolveOptions(source, options);
  const { levels, spu } = o;
  const laws = new PhaseLaws(source, o);
  const mixture = new JitterMixture(laws, levels, o.jitter, spu, o.kernelFloor);
  const checkLevel = (level: number) => {
    if (!Number.isInteger(level) || level < 0 || level >= levels.length) {
      throw new RangeError(`level must be an integer 0…${levels.length - 1}, got ${String(level)}`);
    }
  };
  const checkPhase = (p: number) => {
    if (!Number.isInteger(p)) throw new RangeError(`p must be an integer phase, got ${p}`);
  };
  const main = (t: number): number => {
    const base = Math.floor(t);
    const f = t - base;
    const a = laws.main(base);
    return f === 0 ? a : a + f * (laws.main(base + 1) - a);
  };
  const probBelow = (level: number, t: number, v: number): number => {
    checkLevel(level);
    return mixture.tail(true, level, t, v);
  };
  const probAbove = (level: number, t: number, v: number): number => {
    checkLevel(level);
    return mixture.tail(false, level, t, v);
  };
  const perTail = berPerLevelTail(o.modulation);
  const levelEdges = (t: number, tail: number): Float64Array => {
    if (!(Number.isFinite(tail) && tail > 0 && tail < 0.5)) {
      throw new RangeError(`tail must be a number strictly between 0 and 0.5, got ${String(tail)}`);
    }
    const out = new Float64Array(2 * (levels.length - 1));
    for (let i = 0; i + 1 < levels.length; i++) {
      out[2 * i] = mixture.edge(i, t, tail, false);
      out[2 * i + 1] = mixture.edge(i + 1, t, tail, true);
    }
    return out;
  };
  const eyeEdges = (t: number, ber: number): Float64Array => {
    if (!(Number.isFinite(ber) && ber > 0 && ber / perTail < 0.5)) {
      throw new RangeError(
        `ber must be a bit error ratio in (0, ${0.5 * perTail}) for ${o.modulation}, got ${String(ber)}`,
      );
    }
    return levelEdges(t, ber / perTail);
  };
  const eyeHeights = (t: number, ber: number): Float64Array => {
    const e = eyeEdges(t, ber);
    const out = new Float64Array(levels.length - 1);
    for (let i = 0; i < out.length; i++) out[i] = Math.max(0, e[2 * i + 1] - e[2 * i]);
    return out;
  };
  /** Scratch for the levels around a threshold (`ber`). */
  const bounds = new Int32Array(2);

  return {
    modulation: o.modulation,
    samplesPerUi: spu,
    noiseRms_V: o.noiseRms_V,
    jitter: o.jitter,
    kernelFloor: o.kernelFloor,
    dfeTaps: o.dfeTaps,
    levels,
    main,
    distribution: (p: number) => {
      checkPhase(p);
      return laws.law(p);
    },
    quantileBound: (p: number, prob: number) => {
      checkPhase(p);
      return laws.quantileBound(p, prob);
    },
    probBelow,
    probAbove,
    levelEdges,
    eyeEdges,
    eyeHeights,
    eyeHeight: (t, ber) => {
      const h = eyeHeights(t, ber);
      let m = Infinity;
      for (let i = 0; i < h.length; i++) if (h[i] < m) m = h[i];
      return m;
    },
    ber: (t, v) => {
      nearestLevelsInto(levels, main(t), v, bounds);
      let s = 0;
      if (bounds[0] >= 0) s += probBelow(bounds[0], t, v);
      if (bounds[1] >= 0) s += probAbove(bounds[1], t, v);
      s *= perTail;
      return s > 1 ? 1 : s;
    },
  };
}
