// The probability mass of the inter-symbol interference at one sampling phase: the sum of
// independent random symbols times their cursors, accumulated on a uniform voltage grid.
import type { Modulation } from "../types.ts";

/**
 * Discrete distribution of `X = Σ_k a_k·r_k` on the grid `u_j = j·step_V`, `j = −halfBins … halfBins`.
 * `pmf[halfBins + j]` is the mass at `u_j`. The distribution is exactly symmetric about 0.
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
}

/** `Σ|r_k|`: the largest ISI magnitude the cursors can produce (symbols at most 1 in magnitude). */
export function peakDistortion(isi: Float64Array): number {
  let s = 0;
  for (let k = 0; k < isi.length; k++) s += Math.abs(isi[k]);
  return s;
}

/**
 * The ISI distribution of independent, equiprobable symbols through the cursors `isi`.
 *
 * NRZ symbols are ±1, so each cursor adds the two-point law `±r` (½ each). PAM4 symbols are
 * −1, −1/3, +1/3, +1 (¼ each); each cursor adds that four-point law, computed as the sum of two
 * independent two-point laws `±2r/3` and `±r/3` (the same distribution). The laws are convolved
 * one cursor at a time, smallest first; a point that falls between grid nodes is split between
 * the two nearest nodes in proportion to its distance (linear binning), which keeps every mean
 * and the symmetry exact and moves any point by less than one `step_V`.
 *
 * @param isi - ISI cursor values in volts (the main cursor excluded; residuals after a DFE).
 * @param modulation - "nrz" or "pam4".
 * @param step_V - grid spacing in volts, > 0.
 * @param halfBins - grid half-size (integer ≥ 0); must cover `Σ|r|/step_V` plus one node per cursor.
 * @see B. Casper et al., "An accurate and efficient analysis method for multi-Gb/s chip-to-chip
 *   signaling schemes", Symposium on VLSI Circuits, 2002 — statistical ISI analysis by convolving
 *   per-cursor distributions [memory: recalled, not re-read].
 */
export function isiDistribution(
  isi: Float64Array,
  modulation: Modulation,
  step_V: number,
  halfBins: number,
): IsiDistribution {
  if (!(isi instanceof Float64Array)) throw new TypeError("isi must be a Float64Array of cursor values in volts");
  for (let k = 0; k < isi.length; k++) {
    if (!Number.isFinite(isi[k])) throw new RangeError(`isi[${k}] is not finite (${isi[k]})`);
  }
  if (modulation !== "nrz" && modulation !== "pam4") {
    throw new RangeError(`modulation must be "nrz" or "pam4", got ${String(modulation)}`);
  }
  if (!(Number.isFinite(step_V) && step_V > 0)) throw new RangeError(`step_V must be a finite number > 0, got ${step_V}`);
  if (!Number.isInteger(halfBins) || halfBins < 0) {
    throw new RangeError(`halfBins must be an integer ≥ 0, got ${String(halfBins)}`);
  }

  // Two-point components ±m (the magnitudes are all that matters: the laws are symmetric).
  const parts = modulation === "nrz" ? isi.length : 2 * isi.length;
  const mags = new Float64Array(parts);
  for (let k = 0; k < isi.length; k++) {
    const m = Math.abs(isi[k]) / step_V;
    if (modulation === "nrz") mags[k] = m;
    else {
      mags[2 * k] = (2 * m) / 3;
      mags[2 * k + 1] = m / 3;
    }
  }
  mags.sort();

  let need = 0;
  for (let k = 0; k < parts; k++) need += Math.ceil(mags[k]);
  if (need > halfBins) {
    throw new RangeError(`halfBins ${halfBins} is too small for these cursors (needs ${need} at step_V ${step_V})`);
  }

  // Gather form over buffers with a margin of one largest shift on each side: every new node
  // reads its mirror's operands in swapped order, so symmetry holds bit for bit.
  const margin = mags.length > 0 ? Math.ceil(mags[mags.length - 1]) + 1 : 1;
  const c = halfBins + margin;
  const size = 2 * c + 1;
  let cur = new Float64Array(size);
  let nxt = new Float64Array(size);
  cur[c] = 1;
  let lo = 0;
  let hi = 0;
  for (let k = 0; k < parts; k++) {
    const m = mags[k];
    if (m === 0) continue; // a zero cursor convolves with δ(0): nothing changes
    const s0 = Math.floor(m);
    const f = m - s0;
    const s1 = f > 0 ? s0 + 1 : s0;
    const nlo = lo - s1;
    const nhi = hi + s1;
    const wa = 0.5 * (1 - f);
    const wb = 0.5 * f;
    for (let i = c + nlo; i <= c + nhi; i++) {
      nxt[i] = wa * (cur[i - s0] + cur[i + s0]) + wb * (cur[i - s1] + cur[i + s1]);
    }
    const t = cur;
    cur = nxt;
    nxt = t;
    lo = nlo;
    hi = nhi;
  }
  const pmf = cur.slice(margin, margin + 2 * halfBins + 1);
  return { step_V, halfBins, pmf, lo, hi };
}
