// The probability mass of the inter-symbol interference at one sampling phase: independent
// symmetric two-point parts accumulated on a uniform voltage grid, the smallest ones set aside as
// a Gaussian.
import { logCosh, logSinh } from "./tailTilt.ts";

/**
 * Discrete distribution of the grid part of `X = Σ_i ±m_i` on the nodes `u_j = j·step_V`,
 * `j = −halfBins … halfBins` (`pmf[halfBins + j]` is the mass at `u_j`), plus the variance of the
 * parts smaller than one step, which the law carries as a Gaussian. Exactly symmetric about 0.
 */
export interface IsiDistribution {
  /** Grid spacing in volts (> 0). */
  readonly step_V: number;
  /** Number of grid points on each side of 0; `pmf.length = 2·halfBins + 1`. */
  readonly halfBins: number;
  /** Probability mass per grid point (sums to 1). */
  readonly pmf: Float64Array;
  /** Lowest and highest grid offsets `j` that may hold mass (outside them `pmf` is 0). */
  readonly lo: number;
  readonly hi: number;
  /** Variance of the Gaussian that stands for the parts below one step, left off the grid (V²). */
  readonly lumpedVariance_V2: number;
  /** Number of parts placed on the grid. */
  readonly gridParts: number;
}

/** `Σ|r_k|`: the largest ISI magnitude the cursors can produce (symbols at most 1 in magnitude). */
export function peakDistortion(isi: Float64Array): number {
  let s = 0;
  for (let k = 0; k < isi.length; k++) s += Math.abs(isi[k]);
  return s;
}

/**
 * The weight on `±(s + 1)` of a part `±m` (grid units, `s = ⌊m⌋ ≥ 1`) split between the nodes `±s`
 * and `±(s + 1)` so that its moment generating function at the tilt `x` (grid units) is exact:
 * `(1 − w)·cosh(xs) + w·cosh(x(s + 1)) = cosh(xm)`; at `x = 0` the limit
 * `w = (m² − s²)/(2s + 1)`, which keeps the variance exact.
 */
export function splitWeight(m: number, s: number, x: number): number {
  if (m === s) return 0;
  if (x === 0) return (m * m - s * s) / (2 * s + 1);
  // cosh a − cosh b = 2·sinh((a + b)/2)·sinh((a − b)/2), in logs against overflow.
  const w = Math.exp(
    logSinh((x * (m + s)) / 2) + logSinh((x * (m - s)) / 2) - logSinh((x * (2 * s + 1)) / 2) - logSinh(x / 2),
  );
  // A weight, whatever rounding does at large tilts (NaN counts as none).
  return w >= 0 ? (w <= 1 ? w : 1) : 0;
}

/**
 * Variance of the Gaussian that replaces a part `±m` left off the grid: `m²` at tilt 0, and at a tilt
 * `λ > 0` the one whose moment generating function matches the part's there,
 * `2·log cosh(λm)/λ²` (≤ m²).
 */
export function lumpedVariance(m: number, tilt: number): number {
  return tilt === 0 ? m * m : (2 * logCosh(tilt * m)) / (tilt * tilt);
}

/**
 * The law of a sum of independent two-point parts `±m_i` (½ each), on a grid of step `step_V`.
 *
 * A part of at least one step, `m = (s + f)·Δ` (s ≥ 1 an integer, 0 ≤ f < 1), is split between the
 * nodes `±s` and `±(s + 1)` ({@link splitWeight}); a part below one step is left off the grid and
 * stands in the Gaussian `lumpedVariance_V2` ({@link lumpedVariance}), which the caller adds to the
 * noise — the central limit theorem for many small independent parts.
 *
 * With `tilt_perV = 0` both keep every part's mean and variance exact; only fourth and higher
 * cumulants move (by at most `m²Δ²` for a split part, `2m⁴` for a lumped one), and always towards a
 * heavier tail (`cosh x ≤ e^{x²/2}`, and a split spreads the part), so the error lowers the eye.
 * Deep in a tail, though, what sets the probability is the moment generating function `E e^{−λX}` at
 * the tail's saddle-point tilt λ (see `tailTilt`): a split that keeps only the variance overstates it
 * by about `λ²w(1 − w)Δ²/2` per part, which moves the edge by `λw(1 − w)Δ²/2`. With the tilt given,
 * every part's moment generating function is made exact there instead, so the tail at that
 * probability is right to second order in the tilt's mismatch, and tails elsewhere keep errors
 * between those of the variance-preserving split (measured in the README). The parts are convolved
 * one at a time, smallest first (gather form: each node reads its mirror's operands in swapped order,
 * so symmetry holds bit for bit).
 *
 * @param parts - two-point magnitudes in volts (finite, ≥ 0; see `isiParts`).
 * @param step_V - grid spacing in volts, > 0 (see `lawStep`).
 * @param tilt_perV - the tilt λ (1/V, ≥ 0) the split is exact at (default 0: mean and variance).
 * @see B. Casper et al., "An accurate and efficient analysis method for multi-Gb/s chip-to-chip
 *   signaling schemes", Symposium on VLSI Circuits, 2002 — statistical ISI analysis by convolving
 *   per-cursor distributions [memory: recalled, not re-read].
 */
export function isiDistribution(parts: Float64Array, step_V: number, tilt_perV = 0): IsiDistribution {
  if (!(parts instanceof Float64Array))
    throw new TypeError("parts must be a Float64Array of two-point magnitudes in volts");
  if (!(Number.isFinite(step_V) && step_V > 0))
    throw new RangeError(`step_V must be a finite number > 0, got ${step_V}`);
  if (!(Number.isFinite(tilt_perV) && tilt_perV >= 0))
    throw new RangeError(`tilt_perV must be a finite number ≥ 0, got ${tilt_perV}`);
  let lumped = 0;
  let count = 0;
  const onGrid = new Float64Array(parts.length);
  for (let i = 0; i < parts.length; i++) {
    const m = parts[i];
    if (!(Number.isFinite(m) && m >= 0)) throw new RangeError(`parts[${i}] must be a finite number ≥ 0, got ${m}`);
    if (m < step_V) lumped += lumpedVariance(m, tilt_perV);
    else onGrid[count++] = m / step_V;
  }
  const mags = onGrid.subarray(0, count).sort();
  const x = tilt_perV * step_V;
  let halfBins = 0;
  for (let k = 0; k < count; k++) halfBins += Math.floor(mags[k]) + 1;

  const margin = count > 0 ? Math.floor(mags[count - 1]) + 2 : 1;
  const c = halfBins + margin;
  let cur = new Float64Array(2 * c + 1);
  let nxt = new Float64Array(2 * c + 1);
  cur[c] = 1;
  let lo = 0;
  let hi = 0;
  for (let k = 0; k < count; k++) {
    const m = mags[k];
    const s0 = Math.floor(m);
    const s1 = s0 + 1;
    const w = splitWeight(m, s0, x);
    const wa = 0.5 * (1 - w);
    const wb = 0.5 * w;
    const nlo = lo - (w > 0 ? s1 : s0);
    const nhi = -nlo;
    for (let i = c + nlo; i <= c + nhi; i++) {
      nxt[i] = wa * (cur[i - s0] + cur[i + s0]) + wb * (cur[i - s1] + cur[i + s1]);
    }
    const t = cur;
    cur = nxt;
    nxt = t;
    lo = nlo;
    hi = nhi;
  }
  const pmf = cur.subarray(margin, margin + 2 * halfBins + 1);
  return { step_V, halfBins, pmf, lo, hi, lumpedVariance_V2: lumped, gridParts: count };
}
