// The distribution of ISI plus Gaussian noise at one sampling phase: tail probabilities and quantiles
// precise down to the smallest bit error ratios a link budget asks for.
import erfc from "@stdlib/math-base-special-erfc";
import type { Modulation } from "../types.ts";
import { type IsiDistribution, isiDistribution, peakDistortion } from "./isiDistribution.ts";

/** Noise tails are kept to this many standard deviations (Φ(−13) ≈ 6·10⁻³⁹). */
export const NOISE_TAIL_SIGMAS = 13;

/** Default grid resolution: nodes between 0 and the largest ISI-plus-noise magnitude. */
export const DEFAULT_HALF_BINS = 256;

/**
 * Law of `Y = X + n` where `X` is the ISI (see {@link isiDistribution}) and `n ~ N(0, σ²)`.
 * `Y` is symmetric about 0. Probabilities are computed as sums of positive terms, so the tails
 * keep their relative precision far below 10⁻¹⁵.
 */
export interface SampleDistribution {
  /** Gaussian noise rms σ in volts. */
  readonly noiseRms_V: number;
  /** The ISI law on its grid (for σ = 0 this is the whole law). */
  readonly isi: IsiDistribution;
  /** `P(Y < u)`, for a threshold `u` in volts. */
  probBelow(u_V: number): number;
  /** `P(Y > u)` (= `probBelow(−u)` by symmetry). */
  probAbove(u_V: number): number;
  /**
   * The lower `p`-quantile in volts: the `q` with `P(Y < q) = p` (for σ = 0, the lowest grid node
   * `q` with `P(Y ≤ q) ≥ p`). Between grid nodes the tail is interpolated linearly in log-probability,
   * which is exact for an exponential tail and within 10⁻³·σ for the Gaussian one at the default grid.
   */
  quantile(p: number): number;
}

/**
 * Builds the law of ISI plus noise at one sampling phase.
 *
 * The grid spans `±(Σ|r| + 13σ)` with `halfBins` nodes on each side (plus one spare node per
 * two-point component for the linear binning). With σ > 0, `P(Y < u_j) = Σ_i pmf_i·Φ((u_j − u_i)/σ)`
 * is evaluated lazily per node (only the nodes a query touches), with the Gaussian CDF from erfc.
 *
 * @param isi - ISI cursors in volts, main cursor excluded (residuals after any DFE).
 * @param modulation - "nrz" or "pam4".
 * @param noiseRms_V - Gaussian noise rms in volts, ≥ 0.
 * @param halfBins - grid resolution (integer ≥ 8), default {@link DEFAULT_HALF_BINS}.
 */
export function sampleDistribution(
  isi: Float64Array,
  modulation: Modulation,
  noiseRms_V: number,
  halfBins: number = DEFAULT_HALF_BINS,
): SampleDistribution {
  if (!(Number.isFinite(noiseRms_V) && noiseRms_V >= 0)) {
    throw new RangeError(`noiseRms_V must be a finite number ≥ 0, got ${noiseRms_V}`);
  }
  if (!Number.isInteger(halfBins) || halfBins < 8) {
    throw new RangeError(`halfBins must be an integer ≥ 8, got ${String(halfBins)}`);
  }
  if (!(isi instanceof Float64Array)) throw new TypeError("isi must be a Float64Array of cursor values in volts");
  const sigma = noiseRms_V;
  const peak = peakDistortion(isi);
  if (!Number.isFinite(peak)) throw new RangeError("isi holds a value that is not finite");
  const width = peak + NOISE_TAIL_SIGMAS * sigma;
  const parts = modulation === "pam4" ? 2 * isi.length : isi.length;

  if (width === 0) {
    // No ISI and no noise: a point mass at 0.
    const law = isiDistribution(new Float64Array(0), modulation, 1, 0);
    return {
      noiseRms_V: 0,
      isi: law,
      probBelow: (u) => (u > 0 ? 1 : 0),
      probAbove: (u) => (u < 0 ? 1 : 0),
      quantile: (p) => {
        checkP(p);
        return 0;
      },
    };
  }

  const step = width / halfBins;
  const H = halfBins + parts + 1;
  const law = isiDistribution(isi, modulation, step, H);
  const { pmf, lo, hi } = law;
  const c = H;
  const cum = new Float64Array(pmf.length);
  let acc = 0;
  for (let i = c + lo; i <= c + hi; i++) {
    acc += pmf[i];
    cum[i] = acc;
  }
  for (let i = c + hi + 1; i < cum.length; i++) cum[i] = acc;

  if (sigma === 0) {
    const below = (u: number): number => {
      const k = Math.ceil(u / step) - 1; // largest node strictly below u
      if (k < lo) return 0;
      if (k >= hi) return 1;
      return cum[c + k];
    };
    return {
      noiseRms_V: 0,
      isi: law,
      probBelow: below,
      probAbove: (u) => below(-u),
      quantile: (p) => {
        checkP(p);
        let a = lo;
        let b = hi; // cum at hi is 1 ≥ p
        while (a < b) {
          const m = (a + b) >> 1;
          if (cum[c + m] >= p) b = m;
          else a = m + 1;
        }
        return a * step;
      },
    };
  }

  // Φ(−m·step/σ) for m = 0 … K; beyond K the Gaussian CDF is 0 (left) or 1 (right) to < 10⁻³⁸.
  const K = Math.ceil((NOISE_TAIL_SIGMAS * sigma) / step);
  const kNeg = new Float64Array(K + 1);
  const scale = step / (sigma * Math.SQRT2);
  for (let m = 0; m <= K; m++) kNeg[m] = 0.5 * erfc(m * scale);

  const cache = new Float64Array(2 * H + 1);
  const known = new Uint8Array(2 * H + 1);
  const node = (j: number): number => {
    const idx = c + j;
    if (known[idx] === 1) return cache[idx];
    let s = 0;
    const full = Math.min(hi, j - K - 1);
    if (full >= lo) s += cum[c + full];
    const a = Math.max(lo, j - K);
    const b = Math.min(hi, j + K);
    for (let i = a; i <= b; i++) {
      const d = j - i;
      s += pmf[c + i] * (d >= 0 ? 1 - kNeg[d] : kNeg[-d]);
    }
    cache[idx] = s;
    known[idx] = 1;
    return s;
  };

  const below = (u: number): number => {
    const x = u / step;
    const j0 = Math.floor(x);
    if (j0 < -H) return 0;
    if (j0 >= H) return node(H);
    const f = x - j0;
    const b0 = node(j0);
    if (f === 0) return b0;
    const b1 = node(j0 + 1);
    if (b0 > 0) return Math.exp(Math.log(b0) + f * (Math.log(b1) - Math.log(b0)));
    return f * b1;
  };

  return {
    noiseRms_V: sigma,
    isi: law,
    probBelow: below,
    probAbove: (u) => below(-u),
    quantile: (p) => {
      checkP(p);
      if (node(-H) >= p) return -H * step;
      if (node(H) < p) return H * step;
      let a = -H; // node(a) < p
      let b = H; // node(b) ≥ p
      while (b - a > 1) {
        const m = Math.floor((a + b) / 2);
        if (node(m) >= p) b = m;
        else a = m;
      }
      const b0 = node(a);
      const b1 = node(b);
      const f = b0 > 0 ? (Math.log(p) - Math.log(b0)) / (Math.log(b1) - Math.log(b0)) : p / b1;
      return (a + f) * step;
    },
  };
}

function checkP(p: number): void {
  if (!(Number.isFinite(p) && p > 0 && p < 1)) {
    throw new RangeError(`p must be a probability strictly between 0 and 1, got ${p}`);
  }
}
