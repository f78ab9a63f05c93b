// The per-phase laws of a statistical eye: for every integer sampling phase, the main cursor and the
// law of the residual ISI (after the DFE) plus any independent extra parts, plus the noise.
import type { Modulation } from "../types.ts";
import { isiParts } from "./isiParts.ts";
import { quantileBound } from "./quantileBound.ts";
import { type LawOptions, type SampleDistribution, sampleDistribution } from "./sampleDistribution.ts";

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

/** What every phase's law is made of, besides its cursors. */
export interface PhaseLawSpec {
  readonly modulation: Modulation;
  /** PAM4 inner level relative to the outer one (⅓ ideal). */
  readonly innerLevel: number;
  /** Gaussian noise rms at the sampler, volts. */
  readonly noiseRms_V: number;
  /** DFE taps (volts); tap k cancels post-cursor k at every phase, decisions assumed correct. */
  readonly dfeTaps: Float64Array;
  /** Independent two-point parts (volts) added at every phase and never cancelled by the DFE. */
  readonly extraParts_V: Float64Array;
  /** How every law is built: grid refinement and design tail. */
  readonly law: LawOptions;
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

/** Per-phase main cursors and laws of one statistical eye, each computed once on first use. */
export class PhaseLaws {
  readonly #source: CursorSource;
  readonly #spec: PhaseLawSpec;
  readonly #mains = new Map<number, number>();
  readonly #laws = new Map<number, SampleDistribution>();

  constructor(source: CursorSource, spec: PhaseLawSpec) {
    this.#source = source;
    this.#spec = spec;
  }

  /** The main cursor at the integer phase `p`, volts. */
  main(p: number): number {
    let m = this.#mains.get(p);
    if (m === undefined) {
      const { h, main } = this.#source.cursorsAt(p);
      m = h[main];
      this.#mains.set(p, m);
    }
    return m;
  }

  /** The two-point parts of phase `p`: the residual ISI's, then the extra parts. */
  parts(p: number): Float64Array {
    const { h, main } = this.#source.cursorsAt(p);
    if (!this.#mains.has(p)) this.#mains.set(p, h[main]);
    const s = this.#spec;
    const own = isiParts(residualIsi(h, main, s.dfeTaps), s.modulation, s.innerLevel);
    if (s.extraParts_V.length === 0) return own;
    const all = new Float64Array(own.length + s.extraParts_V.length);
    all.set(own);
    all.set(s.extraParts_V, own.length);
    return all;
  }

  /** The law of ISI plus noise at the integer phase `p`. */
  law(p: number): SampleDistribution {
    let law = this.#laws.get(p);
    if (law === undefined) {
      law = sampleDistribution(this.parts(p), this.#spec.noiseRms_V, this.#spec.law);
      this.#laws.set(p, law);
    }
    return law;
  }

  /** An upper bound on `law(p).quantile(prob)` without building the law (the quantile when it is built). */
  quantileBound(p: number, prob: number): number {
    const law = this.#laws.get(p);
    if (law !== undefined) return law.quantile(prob);
    return quantileBound(this.parts(p), this.#spec.noiseRms_V, prob, this.#spec.law);
  }
}
