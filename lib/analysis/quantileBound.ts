// An upper bound on a quantile of the law of ISI plus noise that sampleDistribution would compute,
// found without convolving the law (microseconds instead of the convolution's tens of microseconds).
import erfc from "@stdlib/math-base-special-erfc";
import type { Modulation } from "../types.ts";
import { qFromBer } from "./ber.ts";
import { DEFAULT_HALF_BINS, NOISE_TAIL_SIGMAS } from "./sampleDistribution.ts";

/** Relative and absolute slack on the probability: rounding in the law and its 13 σ noise cut. */
const REL_SLACK = 1e-6;
const ABS_SLACK = 1e-36;
/** Largest number of components held at their adverse extreme. */
const MAX_ADVERSE = 8;

/**
 * Upper bound on `sampleDistribution(isi, modulation, noiseRms_V, halfBins).quantile(p)` in volts,
 * or `Infinity` when the bound says nothing (no noise, or ISI far above the noise).
 *
 * The computed law is that of `Y = Δ·Σ_i B_i + n`: `Δ` is the law's grid step, `n ~ N(0, σ²)`, and
 * `B_i` are the linearly binned two-point components (NRZ one per cursor, PAM4 two, of `2|r|/3` and
 * `|r|/3`): for `m = |r|/Δ = s + f` (s integer, 0 ≤ f < 1) the component is `±s` with probability
 * `(1 − f)/2` each and `±(s + 1)` with `f/2` each. The quantile at `p` is at most `J·Δ` for every
 * grid node `J` with `P(Y < J·Δ) ≥ p`, and such a `J` is found from a lower bound on that
 * probability: the `k` largest components (k = 0 … 8) are held at or below `−s_i` (probability
 * `2^−k`), and for the rest `R` the Gibbs variational inequality with the exponentially tilted law
 * `Q ∝ e^{θR}·P` (θ < 0) gives
 * `P(R + n < y) = E_Q[(dP/dQ)·Φ((y − R)/σ)] ≥ exp(−KL(Q‖P) + E_Q log Φ((y − R)/σ))`, where
 * `E_Q log Φ((y − R)/σ) ≥ log Φ((y − μ_Q)/σ) − Var_Q(R)/(2σ²)` because `(log Φ)'' ≥ −1` (it is
 * minus one plus the variance of a standard normal truncated from above). The best `k` for three
 * tilts counts (the Gaussian estimate, then twice the tilt `−λ(z)/σ` that makes the bound stationary,
 * λ the inverse Mills ratio).
 *
 * @param isi - ISI cursors in volts, as given to `sampleDistribution`.
 * @param modulation - "nrz" or "pam4".
 * @param noiseRms_V - Gaussian noise rms, volts (≥ 0; 0 gives `Infinity`).
 * @param p - probability, 0 < p < 0.5.
 * @param halfBins - the law's grid resolution (default {@link DEFAULT_HALF_BINS}).
 * @see M. D. Donsker and S. R. S. Varadhan, "Asymptotic evaluation of certain Markov process
 *   expectations for large time", Comm. Pure Appl. Math. 28, 1975 — the variational inequality
 *   `log E_P e^g ≥ E_Q g − KL(Q‖P)` [memory: recalled, not re-read].
 */
export function quantileBound(
  isi: Float64Array,
  modulation: Modulation,
  noiseRms_V: number,
  p: number,
  halfBins: number = DEFAULT_HALF_BINS,
): number {
  if (!(isi instanceof Float64Array)) throw new TypeError("isi must be a Float64Array of cursor values in volts");
  if (modulation !== "nrz" && modulation !== "pam4") {
    throw new RangeError(`modulation must be "nrz" or "pam4", got ${String(modulation)}`);
  }
  if (!(Number.isFinite(noiseRms_V) && noiseRms_V >= 0)) {
    throw new RangeError(`noiseRms_V must be a finite number ≥ 0, got ${noiseRms_V}`);
  }
  if (!(p > 0 && p < 0.5)) throw new RangeError(`p must be a probability strictly between 0 and 0.5, got ${p}`);
  if (!Number.isInteger(halfBins) || halfBins < 8) throw new RangeError(`halfBins must be an integer ≥ 8, got ${String(halfBins)}`);
  const sigma = noiseRms_V;
  if (sigma === 0) return Number.POSITIVE_INFINITY;
  // The law's grid, computed exactly as sampleDistribution computes it.
  let peak = 0;
  for (let k = 0; k < isi.length; k++) peak += Math.abs(isi[k]);
  if (!Number.isFinite(peak)) throw new RangeError("isi holds a value that is not finite");
  const step = (peak + NOISE_TAIL_SIGMAS * sigma) / halfBins;
  const pam4 = modulation === "pam4";
  const n = pam4 ? 2 * isi.length : isi.length;
  const H = halfBins + n + 1;
  const sn = sigma / step;
  const sn2 = sn * sn;

  const mags = new Float64Array(n);
  for (let k = 0; k < isi.length; k++) {
    const m = Math.abs(isi[k]) / step;
    if (pam4) {
      mags[2 * k] = (2 * m) / 3;
      mags[2 * k + 1] = m / 3;
    } else mags[k] = m;
  }
  // The largest components (at least one grid step each), largest first, and each one's rank.
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
  // Second moment of the components not held adverse (for the first tilt).
  let rest = 0;
  for (let i = 0; i < n; i++) {
    if (rank[i] >= 0) continue;
    const s = Math.floor(mags[i]);
    const f = mags[i] - s;
    rest += (1 - f) * s * s + f * (s + 1) * (s + 1);
  }

  const logTarget = Math.log(p * (1 + REL_SLACK) + ABS_SLACK);
  const tLogM = new Float64Array(MAX_ADVERSE);
  const tMu = new Float64Array(MAX_ADVERSE);
  const tVar = new Float64Array(MAX_ADVERSE);
  let bestJ = Number.POSITIVE_INFINITY;
  let bestZ = Number.NaN;

  // The bound for the tilt θ = −a (a > 0), for every number k of adverse components.
  const evaluate = (a: number): void => {
    const e1 = Math.exp(-a);
    const e2 = e1 * e1;
    const c1 = 0.5 * (1 + e2);
    const sh1 = 0.5 * (1 - e2);
    let logM = 0;
    let prod = 1;
    let mu = 0;
    let vSum = 0;
    for (let i = 0; i < n; i++) {
      const m = mags[i];
      if (m === 0) continue;
      const s = Math.floor(m);
      const f = m - s;
      // M_i(θ) = (1 − f)·cosh(a·s) + f·cosh(a·(s + 1)) = e^{lead}·inner; μ_i and E_Q[B²] likewise.
      let lead: number;
      let inner: number;
      let mi: number;
      let ex2: number;
      if (s === 0) {
        lead = a;
        inner = (1 - f) * e1 + f * c1;
        mi = -(f * sh1) / inner;
        ex2 = (f * c1) / inner;
      } else if (f === 0) {
        const es = Math.exp(-2 * a * s);
        lead = a * s;
        inner = 0.5 * (1 + es);
        mi = -(s * 0.5 * (1 - es)) / inner;
        ex2 = s * s;
      } else {
        const es = Math.exp(-2 * a * s);
        const es1 = es * e2;
        const w0 = (1 - f) * e1;
        const c0 = 0.5 * (1 + es);
        const cc = 0.5 * (1 + es1);
        const s1 = s + 1;
        lead = a * s1;
        inner = w0 * c0 + f * cc;
        mi = -(w0 * s * 0.5 * (1 - es) + f * s1 * 0.5 * (1 - es1)) / inner;
        ex2 = (w0 * s * s * c0 + f * s1 * s1 * cc) / inner;
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
      // log P(R + n < y) ≥ log M − θ·μ − V/(2σ²) + log Φ((y − μ)/σ), θ = −a.
      const need = logTarget - logPs - (logM + a * mu - (vSum > 0 ? vSum : 0) / (2 * sn2));
      if (!(need < 0)) continue;
      const x = Math.exp(need);
      const z = x < 0.5 ? -qFromBer(x) : qFromBer(1 - x);
      const J = Math.ceil(mu + sn * z - shift);
      if (J < bestJ) {
        bestJ = J;
        bestZ = z;
      }
    }
  };

  const spread2 = sn2 + rest;
  evaluate(qFromBer(Math.min(0.25, 2 * p)) / Math.sqrt(spread2));
  for (let it = 0; it < 2 && Number.isFinite(bestZ); it++) {
    const z = bestZ;
    const lambda = Math.exp(-0.5 * z * z) / Math.sqrt(2 * Math.PI) / (0.5 * erfc(-z / Math.SQRT2));
    evaluate(lambda / sn);
  }
  if (!Number.isFinite(bestJ)) return Number.POSITIVE_INFINITY;
  return (bestJ < -H ? -H : bestJ > H ? H : bestJ) * step;
}
