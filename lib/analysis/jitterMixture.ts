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

  constructor(laws: PhaseLaws, levels: Float64Array, jitter: Jitter | undefined, samplesPerUi: number, kernelFloor: number) {
    this.#laws = laws;
    this.#levels = levels;
    this.#jitter = jitter;
    this.#samplesPerUi = samplesPerUi;
    this.#floor = kernelFloor;
  }

  /** The integer phase below `t` and the mixing weights around it. */
  kernelAt(t: number): { base: number; kernel: JitterKernel } {
    if (!Number.isFinite(t)) throw new RangeError(`phase must be a finite number, got ${t}`);
    const base = Math.floor(t);
    const frac = t - base;
    let kernel = this.#kernels.get(frac);
    if (kernel === undefined) {
      kernel = jitterKernel(this.#jitter, this.#samplesPerUi, frac, this.#floor);
      this.#kernels.set(frac, kernel);
    }
    return { base, kernel };
  }

  /** `P(sample < v | level)` (`below`) or `P(sample > v | level)` at phase `t`, jitter included. */
  tail(below: boolean, level: number, t: number, v: number): number {
    const { base, kernel } = this.kernelAt(t);
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
   * (`P(sample < v | level) = tail`) or the lower one (`P(sample > v | level) = tail`). Bisection on a
   * bracket given by the per-phase quantiles (the mixture's quantile lies between them).
   */
  edge(level: number, t: number, tail: number, upperEdge: boolean): number {
    const { base, kernel } = this.kernelAt(t);
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
    const f = upperEdge
      ? (v: number) => this.tail(true, level, t, v) - tail // increasing in v
      : (v: number) => tail - this.tail(false, level, t, v); // increasing in v
    const tol = 1e-12 * Math.max(Math.abs(lo), Math.abs(hi), 1e-9);
    for (let it = 0; it < 200 && hi - lo > tol; it++) {
      const m = 0.5 * (lo + hi);
      if (f(m) < 0) lo = m;
      else hi = m;
    }
    return 0.5 * (lo + hi);
  }
}
