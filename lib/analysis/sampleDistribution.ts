// The distribution of ISI plus Gaussian noise at one sampling phase: tail probabilities and quantiles
// precise down to the smallest bit error ratios a link budget asks for.
import erfc from "@stdlib/math-base-special-erfc";
import { type IsiDistribution, isiDistribution } from "./isiDistribution.ts";
import { lawStep, NOISE_TAIL_SIGMAS } from "./lawStep.ts";
import { tailTilt } from "./tailTilt.ts";

export { DEFAULT_HALF_BINS, NOISE_TAIL_SIGMAS } from "./lawStep.ts";

/**
 * Law of `Y = X + n` where `X = Σ ±m_i` is the ISI (independent two-point parts, see `isiParts`) and
 * `n ~ N(0, σ²)`. `Y` is symmetric about 0. Probabilities are computed as sums of positive terms, so
 * the tails keep their relative precision far below 10⁻¹⁵.
 */
export interface SampleDistribution {
  /** Gaussian noise rms σ in volts, as given. */
  readonly noiseRms_V: number;
  /** Rms of the Gaussian the law convolves: `√(σ² + lumpedVariance_V2)`, volts. */
  readonly gaussianRms_V: number;
  /** The ISI law on its grid (with σ = 0 and nothing lumped, the whole law). */
  readonly isi: IsiDistribution;
  /** `P(Y < u)`, for a threshold `u` in volts. */
  probBelow(u_V: number): number;
  /** `P(Y > u)` (= `probBelow(−u)` by symmetry). */
  probAbove(u_V: number): number;
  /**
   * The lower `p`-quantile in volts: the `q` with `P(Y < q) = p` (for a law without any Gaussian part,
   * the lowest grid node `q` with `P(Y ≤ q) ≥ p`). Between grid nodes the tail is interpolated
   * linearly in log-probability, exact for an exponential tail and within `Δ²/(8s)` of the Gaussian
   * one (`s` the Gaussian's rms).
   */
  quantile(p: number): number;
}

/** How a law is built: its grid refinement and the tail its split is tuned for. */
export interface LawOptions {
  /** Divides the grid step of {@link lawStep} (≥ 1, default 1; 2 halves it). */
  readonly refine?: number;
  /**
   * The lower-tail probability (0 < p < 0.5) at which the law is made exact to second order: parts
   * are split (and small parts lumped) with their moment generating functions matched at this
   * tail's saddle-point tilt ({@link tailTilt}). Omit for the variance-preserving split.
   */
  readonly designTail?: number;
}

/** The tilt a law's split is matched at (0 without a design tail). */
export function lawTilt(parts: Float64Array, noiseRms_V: number, options: LawOptions): number {
  const p = options.designTail;
  if (p === undefined) return 0;
  if (!(p > 0 && p < 0.5))
    throw new RangeError(`designTail must be a probability strictly between 0 and 0.5, got ${String(p)}`);
  return tailTilt(parts, noiseRms_V, p);
}

/**
 * Builds the law of ISI plus noise at one sampling phase.
 *
 * The parts are placed on the grid of {@link lawStep} by {@link isiDistribution} (mean and variance
 * exact, or moment generating functions exact at the design tail's tilt; parts below one step join
 * the Gaussian). With a Gaussian part of
 * rms `s = √(σ² + lumped) > 0`, `P(Y < u_j) = Σ_i pmf_i·Φ((u_j − u_i)/s)` is evaluated lazily per
 * node (only the nodes a query touches), with the Gaussian CDF from erfc, kept to 13 s.
 *
 * @param parts - two-point magnitudes in volts (see `isiParts`; an aggressor's parts may be appended).
 * @param noiseRms_V - Gaussian noise rms in volts, ≥ 0.
 * @param options - grid refinement and design tail.
 */
export function sampleDistribution(
  parts: Float64Array,
  noiseRms_V: number,
  options: LawOptions = {},
): SampleDistribution {
  if (!(Number.isFinite(noiseRms_V) && noiseRms_V >= 0)) {
    throw new RangeError(`noiseRms_V must be a finite number ≥ 0, got ${noiseRms_V}`);
  }
  if (!(parts instanceof Float64Array))
    throw new TypeError("parts must be a Float64Array of two-point magnitudes in volts");
  const step = lawStep(parts, noiseRms_V, options.refine ?? 1);

  if (step === 0) return pointMass();

  const law = isiDistribution(parts, step, lawTilt(parts, noiseRms_V, options));
  const { pmf, lo, hi, halfBins: H } = law;
  const sigma = Math.sqrt(noiseRms_V * noiseRms_V + law.lumpedVariance_V2);
  const c = H;
  const cum = new Float64Array(pmf.length);
  let acc = 0;
  for (let i = c + lo; i <= c + hi; i++) {
    acc += pmf[i];
    cum[i] = acc;
  }
  for (let i = c + hi + 1; i < cum.length; i++) cum[i] = acc;

  if (sigma === 0) return latticeLaw(law, cum);

  // Φ(−m·step/s) for m = 0 … K; beyond K the Gaussian CDF is 0 (left) or 1 (right) to < 10⁻³⁸.
  const K = Math.ceil((NOISE_TAIL_SIGMAS * sigma) / step);
  const kNeg = new Float64Array(K + 1);
  const scale = step / (sigma * Math.SQRT2);
  for (let m = 0; m <= K; m++) kNeg[m] = 0.5 * erfc(m * scale);

  // Nodes reach K beyond the ISI's support on each side; outside them the probabilities are 0 and 1.
  const reach = hi + K;
  const cache = new Float64Array(2 * reach + 1).fill(Number.NaN); // NaN: not computed yet
  const node = (j: number): number => {
    if (j < -reach) return 0;
    if (j > reach) return 1;
    const idx = reach + j;
    const known = cache[idx];
    if (known === known) return known;
    let s = 0;
    const full = Math.min(hi, j - K - 1);
    if (full >= lo) s += cum[c + full];
    // Nodes at or below j count Φ((j − i)·Δ/s) ≥ ½, nodes above it Φ(−(i − j)·Δ/s).
    const a = Math.max(lo, j - K);
    const b = Math.min(hi, j + K);
    const mid = Math.min(b, j);
    for (let i = a; i <= mid; i++) s += pmf[c + i] * (1 - kNeg[j - i]);
    for (let i = Math.max(a, j + 1); i <= b; i++) s += pmf[c + i] * kNeg[i - j];
    cache[idx] = s;
    return s;
  };

  const below = (u: number): number => {
    const x = u / step;
    const j0 = Math.floor(x);
    if (j0 < -reach) return 0;
    if (j0 >= reach) return node(reach);
    const f = x - j0;
    const b0 = node(j0);
    if (f === 0) return b0;
    const b1 = node(j0 + 1);
    if (b0 > 0) return Math.exp(Math.log(b0) + f * (Math.log(b1) - Math.log(b0)));
    return f * b1;
  };

  return {
    noiseRms_V,
    gaussianRms_V: sigma,
    isi: law,
    probBelow: below,
    probAbove: (u) => below(-u),
    quantile: (p) => {
      checkP(p);
      if (node(-reach) >= p) return -reach * step;
      if (node(reach) < p) return reach * step;
      let a = -reach; // node(a) < p
      let b = reach; // node(b) ≥ p
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

/** No ISI and no noise: a point mass at 0. */
function pointMass(): SampleDistribution {
  return {
    noiseRms_V: 0,
    gaussianRms_V: 0,
    isi: { step_V: 1, halfBins: 0, pmf: Float64Array.of(1), lo: 0, hi: 0, lumpedVariance_V2: 0, gridParts: 0 },
    probBelow: (u) => (u > 0 ? 1 : 0),
    probAbove: (u) => (u < 0 ? 1 : 0),
    quantile: (p) => {
      checkP(p);
      return 0;
    },
  };
}

/** ISI alone (no Gaussian part): the law on its grid nodes, `cum` its cumulative sums by index. */
function latticeLaw(law: IsiDistribution, cum: Float64Array): SampleDistribution {
  const { lo, hi, halfBins: c, step_V: step } = law;
  const below = (u: number): number => {
    const k = Math.ceil(u / step) - 1; // largest node strictly below u
    if (k < lo) return 0;
    if (k >= hi) return 1;
    return cum[c + k];
  };
  return {
    noiseRms_V: 0,
    gaussianRms_V: 0,
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

function checkP(p: number): void {
  if (!(Number.isFinite(p) && p > 0 && p < 1)) {
    throw new RangeError(`p must be a probability strictly between 0 and 1, got ${p}`);
  }
}
