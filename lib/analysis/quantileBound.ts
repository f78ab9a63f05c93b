// An upper bound on a quantile of the law of ISI plus noise that sampleDistribution would compute,
// found without convolving the law (microseconds instead of the convolution's tens of microseconds).
import erfc from "@stdlib/math-base-special-erfc";
import { qFromBer } from "./ber.ts";
import { lumpedVariance, splitWeight } from "./isiDistribution.ts";
import { lawStep, NOISE_TAIL_SIGMAS } from "./lawStep.ts";
import { type LawOptions, lawTilt } from "./sampleDistribution.ts";

/** Relative and absolute slack on the probability: rounding in the law and its 13 σ noise cut. */
const REL_SLACK = 1e-6;
const ABS_SLACK = 1e-36;
/** Largest number of parts held at their adverse extreme. */
const MAX_ADVERSE = 8;

/**
 * Upper bound on `sampleDistribution(parts, noiseRms_V, options).quantile(p)` in volts, or `Infinity`
 * when the bound says nothing (no noise, or ISI far above the noise).
 *
 * The computed law is that of `Y = Δ·Σ_i B_i + g`: `Δ` is the law's grid step ({@link lawStep}),
 * `g ~ N(0, s²)` with `s² = σ²` plus the lumped variance of the parts below one step, and `B_i` the
 * split grid parts: for `m = |m_i|/Δ = s + f` (s ≥ 1 an integer, 0 ≤ f < 1) the part is `±s` with
 * probability `(1 − w)/2` each and `±(s + 1)` with `w/2` each (`splitWeight`). The quantile
 * at `p` is at most `J·Δ` for every grid node `J` with `P(Y < J·Δ) ≥ p`, and such a `J` is found from
 * a lower bound on that probability: the `k` largest parts (k = 0 … 8) are held at or below `−s_i`
 * (probability `2^−k`), and for the rest `R` the Gibbs variational inequality with the exponentially
 * tilted law `Q ∝ e^{θR}·P` (θ < 0) gives
 * `P(R + g < y) = E_Q[(dP/dQ)·Φ((y − R)/s)] ≥ exp(−KL(Q‖P) + E_Q log Φ((y − R)/s))`, where
 * `E_Q log Φ((y − R)/s) ≥ log Φ((y − μ_Q)/s) − Var_Q(R)/(2s²)` because `(log Φ)'' ≥ −1` (it is
 * minus one plus the variance of a standard normal truncated from above). The best `k` for three
 * tilts counts (the Gaussian estimate, then twice the tilt `−λ(z)/s` that makes the bound stationary,
 * λ the inverse Mills ratio).
 *
 * @param parts - two-point magnitudes in volts, as given to `sampleDistribution`.
 * @param noiseRms_V - Gaussian noise rms, volts (≥ 0; 0 with nothing lumped gives `Infinity`).
 * @param p - probability, 0 < p < 0.5.
 * @param options - the law's grid refinement and design tail, as given to `sampleDistribution`.
 * @see M. D. Donsker and S. R. S. Varadhan, "Asymptotic evaluation of certain Markov process
 *   expectations for large time", Comm. Pure Appl. Math. 28, 1975 — the variational inequality
 *   `log E_P e^g ≥ E_Q g − KL(Q‖P)` [memory: recalled, not re-read].
 */
export function quantileBound(parts: Float64Array, noiseRms_V: number, p: number, options: LawOptions = {}): number {
  if (!(parts instanceof Float64Array))
    throw new TypeError("parts must be a Float64Array of two-point magnitudes in volts");
  if (!(Number.isFinite(noiseRms_V) && noiseRms_V >= 0)) {
    throw new RangeError(`noiseRms_V must be a finite number ≥ 0, got ${noiseRms_V}`);
  }
  if (!(p > 0 && p < 0.5)) throw new RangeError(`p must be a probability strictly between 0 and 0.5, got ${p}`);
  for (let i = 0; i < parts.length; i++) {
    if (!(Number.isFinite(parts[i]) && parts[i] >= 0))
      throw new RangeError(`parts[${i}] must be a finite number ≥ 0, got ${parts[i]}`);
  }
  // The law's grid and Gaussian, computed exactly as sampleDistribution computes them.
  const step = lawStep(parts, noiseRms_V, options.refine ?? 1);
  if (step === 0) return Number.POSITIVE_INFINITY;
  const tilt = lawTilt(parts, noiseRms_V, options);
  const x = tilt * step;
  const n = parts.length;
  const mags = new Float64Array(n);
  const weights = new Float64Array(n);
  let lumped = 0;
  let hiNode = 0;
  for (let i = 0; i < n; i++) {
    if (parts[i] < step) {
      lumped += lumpedVariance(parts[i], tilt);
      continue;
    }
    const m = parts[i] / step;
    mags[i] = m;
    weights[i] = splitWeight(m, Math.floor(m), x);
    hiNode += weights[i] > 0 ? Math.floor(m) + 1 : Math.floor(m);
  }
  const sigma = Math.sqrt(noiseRms_V * noiseRms_V + lumped);
  if (sigma === 0) return Number.POSITIVE_INFINITY;
  const H = hiNode + Math.ceil((NOISE_TAIL_SIGMAS * sigma) / step);
  const sn = sigma / step;
  const sn2 = sn * sn;

  const { top, tops, rank } = largestParts(mags);
  // Second moment of the parts not held adverse (for the first tilt).
  let rest = 0;
  for (let i = 0; i < n; i++) {
    if (rank[i] >= 0 || mags[i] === 0) continue;
    const s = Math.floor(mags[i]);
    rest += (1 - weights[i]) * s * s + weights[i] * (s + 1) * (s + 1);
  }
  const ctx: TiltContext = {
    mags,
    weights,
    rank,
    top,
    tops,
    sn,
    sn2,
    logTarget: Math.log(p * (1 + REL_SLACK) + ABS_SLACK),
    tLogM: new Float64Array(MAX_ADVERSE),
    tMu: new Float64Array(MAX_ADVERSE),
    tVar: new Float64Array(MAX_ADVERSE),
    bestJ: Number.POSITIVE_INFINITY,
    bestZ: Number.NaN,
  };

  const spread2 = sn2 + rest;
  evaluateTilt(ctx, qFromBer(Math.min(0.25, 2 * p)) / Math.sqrt(spread2));
  for (let it = 0; it < 2 && Number.isFinite(ctx.bestZ); it++) {
    const z = ctx.bestZ;
    const lambda = Math.exp(-0.5 * z * z) / Math.sqrt(2 * Math.PI) / (0.5 * erfc(-z / Math.SQRT2));
    evaluateTilt(ctx, lambda / sn);
  }
  const bestJ = ctx.bestJ;
  if (!Number.isFinite(bestJ)) return Number.POSITIVE_INFINITY;
  return (bestJ < -H ? -H : bestJ > H ? H : bestJ) * step;
}

/** The largest grid parts (magnitudes in steps, at least one), largest first, and each part's rank (−1: not among them). */
function largestParts(mags: Float64Array): { top: Int32Array; tops: number; rank: Int8Array } {
  const n = mags.length;
  const top = new Int32Array(MAX_ADVERSE).fill(-1);
  let tops = 0;
  for (let i = 0; i < n; i++) {
    const m = mags[i];
    if (m < 1) continue;
    if (tops === MAX_ADVERSE && mags[top[tops - 1]] >= m) continue;
    let j = tops < MAX_ADVERSE ? tops++ : tops - 1;
    while (j > 0 && mags[top[j - 1]] < m) {
      top[j] = top[j - 1];
      j--;
    }
    top[j] = i;
  }
  const rank = new Int8Array(n).fill(-1);
  for (let t = 0; t < tops; t++) rank[top[t]] = t;
  return { top, tops, rank };
}

/** The split grid parts, the Gaussian in steps, the target, scratch per held part, and the best node so far. */
interface TiltContext {
  readonly mags: Float64Array;
  readonly weights: Float64Array;
  readonly rank: Int8Array;
  readonly top: Int32Array;
  readonly tops: number;
  readonly sn: number;
  readonly sn2: number;
  readonly logTarget: number;
  readonly tLogM: Float64Array;
  readonly tMu: Float64Array;
  readonly tVar: Float64Array;
  bestJ: number;
  bestZ: number;
}

/** The bound for the tilt θ = −a (a > 0), for every number k of adverse parts; improves `ctx.bestJ`. */
function evaluateTilt(ctx: TiltContext, a: number): void {
  const { mags, weights, rank, top, tops, sn, sn2, logTarget, tLogM, tMu, tVar } = ctx;
  const n = mags.length;
  const e1 = Math.exp(-a);
  const e2 = e1 * e1;
  let logM = 0;
  let prod = 1;
  let mu = 0;
  let vSum = 0;
  for (let i = 0; i < n; i++) {
    const m = mags[i];
    if (m === 0) continue;
    const s = Math.floor(m);
    const w = weights[i];
    // M_i(θ) = (1 − w)·cosh(a·s) + w·cosh(a·(s + 1)) = e^{lead}·inner; μ_i and E_Q[B²] likewise.
    let lead: number;
    let inner: number;
    let mi: number;
    let ex2: number;
    if (w === 0) {
      const es = Math.exp(-2 * a * s);
      lead = a * s;
      inner = 0.5 * (1 + es);
      mi = -(s * 0.5 * (1 - es)) / inner;
      ex2 = s * s;
    } else {
      const es = Math.exp(-2 * a * s);
      const es1 = es * e2;
      const w0 = (1 - w) * e1;
      const c0 = 0.5 * (1 + es);
      const cc = 0.5 * (1 + es1);
      const s1 = s + 1;
      lead = a * s1;
      inner = w0 * c0 + w * cc;
      mi = -(w0 * s * 0.5 * (1 - es) + w * s1 * 0.5 * (1 - es1)) / inner;
      ex2 = (w0 * s * s * c0 + w * s1 * s1 * cc) / inner;
    }
    const vi = ex2 - mi * mi > 0 ? ex2 - mi * mi : 0;
    const r = rank[i];
    if (r >= 0) {
      tLogM[r] = lead + Math.log(inner);
      tMu[r] = mi;
      tVar[r] = vi;
    }
    prod *= inner;
    if (prod < 1e-200) {
      logM += Math.log(prod);
      prod = 1;
    }
    logM += lead;
    mu += mi;
    vSum += vi;
  }
  logM += Math.log(prod);
  let logPs = 0;
  let shift = 0;
  for (let k = 0; k <= tops; k++) {
    if (k > 0) {
      logM -= tLogM[k - 1];
      mu -= tMu[k - 1];
      vSum -= tVar[k - 1];
      logPs -= Math.LN2;
      shift += Math.floor(mags[top[k - 1]]);
    }
    // log P(R + g < y) ≥ log M − θ·μ − V/(2s²) + log Φ((y − μ)/s), θ = −a.
    const need = logTarget - logPs - (logM + a * mu - (vSum > 0 ? vSum : 0) / (2 * sn2));
    if (!(need < 0)) continue;
    const x = Math.exp(need);
    const z = x < 0.5 ? -qFromBer(x) : qFromBer(1 - x);
    const J = Math.ceil(mu + sn * z - shift);
    if (J < ctx.bestJ) {
      ctx.bestJ = J;
      ctx.bestZ = z;
    }
  }
}
