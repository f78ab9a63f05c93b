// Sampling jitter in a statistical eye: a level's tail at a (fractional) phase is the jitter-weighted
// mixture of the per-phase tails, and an eye edge is where that mixture meets the target.
import { type JitterKernel, jitterKernel, type Jitter } from "./jitterKernel.ts";
import type { PhaseLaws } from "./phaseLaws.ts";

/** The jitter mixture of one eye: kernels per fractional phase, computed once. */
export class JitterMixture {
  readonly #laws: PhaseLaws;
  readonly #levels: Float64Array;
  readonly #jitter: Jitter | undefined;
  readonly #samplesPerUi: number;
  readonly #floor: number;
  readonly #kernels = new Map<number, JitterKernel>();

  constructor(
    laws: PhaseLaws,
    levels: Float64Array,
    jitter: Jitter | undefined,
    samplesPerUi: number,
    kernelFloor: number,
  ) {
    this.#laws = laws;
    this.#levels = levels;
    this.#jitter = jitter;
    this.#samplesPerUi = samplesPerUi;
    this.#floor = kernelFloor;
  }

  /** The mixing weights around `t`, relative to the integer phase `⌊t⌋` (computed once per fraction). */
  kernelAt(t: number): JitterKernel {
    if (!Number.isFinite(t)) throw new RangeError(`phase must be a finite number, got ${t}`);
    const frac = t - Math.floor(t);
    let kernel = this.#kernels.get(frac);
    if (kernel === undefined) {
      kernel = jitterKernel(this.#jitter, this.#samplesPerUi, frac, this.#floor);
      this.#kernels.set(frac, kernel);
    }
    return kernel;
  }

  /** `P(sample < v | level)` (`below`) or `P(sample > v | level)` at phase `t`, jitter included. */
  tail(below: boolean, level: number, t: number, v: number): number {
    const kernel = this.kernelAt(t);
    const base = Math.floor(t);
    const l = this.#levels[level];
    let s = 0;
    for (let i = 0; i < kernel.weights.length; i++) {
      const p = base + kernel.first + i;
      const law = this.#laws.law(p);
      const u = v - l * this.#laws.main(p);
      s += kernel.weights[i] * (below ? law.probBelow(u) : law.probAbove(u));
    }
    return s;
  }

  /**
   * The edge of a level's band at phase `t` where its conditional tail equals `tail`: the upper edge
   * (`P(sample < v | level) = tail`) or the lower one (`P(sample > v | level) = tail`). The per-phase
   * quantiles bracket it (the mixture's quantile lies between them); inside the bracket the root of
   * `log(mixture tail) − log(tail)`, smooth and monotone, is found by the Illinois variant of regula
   * falsi to 1e-12 of the edge's size.
   */
  edge(level: number, t: number, tail: number, upperEdge: boolean): number {
    const kernel = this.kernelAt(t);
    const base = Math.floor(t);
    const l = this.#levels[level];
    let lo = Infinity;
    let hi = -Infinity;
    for (let i = 0; i < kernel.weights.length; i++) {
      const p = base + kernel.first + i;
      const q = this.#laws.law(p).quantile(tail);
      const x = l * this.#laws.main(p) + (upperEdge ? q : -q);
      if (x < lo) lo = x;
      if (x > hi) hi = x;
    }
    if (kernel.weights.length === 1 || hi - lo <= 0) return lo;
    const logTail = Math.log(tail);
    // Increasing in v: the lower level's tail above v falls as v rises, the upper level's below v grows.
    const g = (v: number): number => {
      const m = upperEdge ? this.tail(true, level, t, v) : this.tail(false, level, t, v);
      const d = (m > 0 ? Math.log(m) : -745) - logTail;
      return upperEdge ? d : -d;
    };
    const tol = 1e-12 * Math.max(Math.abs(lo), Math.abs(hi), 1e-9);
    let glo = g(lo);
    let ghi = g(hi);
    if (glo >= 0) return lo;
    if (ghi <= 0) return hi;
    let side = 0;
    for (let it = 0; it < 100 && hi - lo > tol; it++) {
      let m = (lo * ghi - hi * glo) / (ghi - glo);
      if (!(m > lo && m < hi)) m = 0.5 * (lo + hi);
      const gm = g(m);
      if (gm === 0) return m;
      if (gm < 0) {
        lo = m;
        glo = gm;
        if (side === -1) ghi /= 2;
        side = -1;
      } else {
        hi = m;
        ghi = gm;
        if (side === 1) glo /= 2;
        side = 1;
      }
      if (Math.abs(gm) < 1e-13) return m;
    }
    return 0.5 * (lo + hi);
  }
}
