// The feed-forward filter of a finite-length MMSE decision-feedback equalizer, for noise of any
// spectrum at its input (a CTLE and a front end colour it).
import { Matrix } from "ml-matrix";
import { convolveCursors } from "../equalizers/convolveCursors.ts";
import type { Cursors } from "../pulse/cursorsAt.ts";
import { checkCursorWindow } from "./checkCursors.ts";
import { convolutionMatrix } from "./convolutionMatrix.ts";
import { wienerSolve } from "./wienerSolve.ts";

/** Options of {@link mmseDfe}. */
export interface MmseDfeOptions {
  /** Pre- and post-cursor taps of the feed-forward filter. */
  readonly pre: number;
  readonly post: number;
  /** Feedback taps (0: a linear MMSE equalizer). */
  readonly feedbackTaps: number;
  /**
   * Which of the first `feedbackTaps` post-cursors the feedback cancels (default all); a post-cursor
   * left out counts as ISI in the error (e.g. one a tap limit keeps the DFE from cancelling).
   */
  readonly cancelled?: ArrayLike<boolean>;
  /**
   * Autocorrelation of the noise at the filter's input at symbol spacing, `r[m] = E[n_k·n_{k+m}]`
   * (V²) for m = 0, 1, …; lags beyond the array are 0. White noise is `[σ²]`.
   */
  readonly noiseCorrelation_V2: ArrayLike<number>;
  /** Mean square of a symbol (1 for NRZ ±1, 5/9 for PAM4), default 1. */
  readonly symbolPower?: number;
}

/** The MMSE-DFE's filters and figures. */
export interface MmseDfeResult {
  /** Feed-forward taps `c`, main tap `c[pre]`. */
  readonly taps: Float64Array;
  /** Feedback taps `b_k = g[main + pre + k]` (they cancel the first post-cursors exactly; 0 where not cancelled). */
  readonly feedback: Float64Array;
  /** Minimum mean-square error `E_s·(1 − g[main + pre])`, V². */
  readonly mse: number;
  /** Noise variance after the filter, `cᵀ·R_n·c` (V²). */
  readonly noiseVariance_V2: number;
  /** Combined cursors `g = h * c`, main cursor at `main + pre`. */
  readonly equalized: Cursors;
}

/**
 * Finite-length MMSE-DFE with decision delay at the main cursor and correct past decisions: the
 * feed-forward filter `c` minimizes `E_s·Σ_{i ∉ F}(g_i − δ_{i,d})² + cᵀ·R_n·c`, where `g = H·c`,
 * `d = main + pre` and `F = {d + 1 … d + feedbackTaps}` (the cursors the feedback taps cancel, less
 * those `cancelled` leaves out), so
 * `c = (E_s·H̃ᵀH̃ + R_n)⁻¹·E_s·H̃ᵀ·e_d` with `H̃` the convolution matrix without the rows of `F` and
 * `R_n` the Toeplitz noise correlation. The noise spectrum enters through `R_n`, not as white noise
 * scaled by `‖c‖²`.
 *
 * @param cursors - symbol-spaced cursors `{ h, main }` at the filter's input, volts per unit symbol.
 * @param options - filter sizes, noise correlation, symbol power.
 * @see N. Al-Dhahir and J. M. Cioffi, "MMSE decision-feedback equalizers: finite-length results",
 *   IEEE Trans. Inform. Theory 41(4), 1995 [memory: recalled, not re-read].
 */
export function mmseDfe(cursors: Cursors, options: MmseDfeOptions): MmseDfeResult {
  const { pre, post, feedbackTaps } = options;
  checkCursorWindow(cursors, pre, post);
  if (!Number.isInteger(feedbackTaps) || feedbackTaps < 0)
    throw new RangeError(`feedbackTaps must be an integer ≥ 0, got ${String(feedbackTaps)}`);
  const cancelled = options.cancelled;
  if (cancelled !== undefined && cancelled.length !== feedbackTaps)
    throw new RangeError(`cancelled must hold ${feedbackTaps} flags, one per feedback tap`);
  const es = options.symbolPower ?? 1;
  if (!(Number.isFinite(es) && es > 0))
    throw new RangeError(`symbolPower must be a finite number > 0, got ${String(es)}`);
  const r = options.noiseCorrelation_V2;
  if (r.length === 0) throw new RangeError("noiseCorrelation_V2 must hold at least r[0]");
  for (let m = 0; m < r.length; m++)
    if (!Number.isFinite(r[m])) throw new RangeError(`noiseCorrelation_V2[${m}] is not finite`);
  if (!(r[0] >= 0)) throw new RangeError(`noiseCorrelation_V2[0] is a variance and must be ≥ 0, got ${r[0]}`);
  const n = pre + 1 + post;
  const H = convolutionMatrix(cursors.h, n);
  const d = cursors.main + pre;
  const kept: number[] = [];
  for (let i = 0; i < H.rows; i++)
    if (i <= d || i > d + feedbackTaps || (cancelled !== undefined && !cancelled[i - d - 1])) kept.push(i);
  const Ht = H.selection(
    kept,
    Array.from({ length: n }, (_, j) => j),
  );
  const Rn = noiseToeplitz(r, n);
  const R = Ht.transpose().mmul(Ht).mul(es).add(Rn);
  const row = kept.indexOf(d);
  const p = Float64Array.from({ length: n }, (_, j) => es * Ht.get(row, j));
  let taps: Float64Array;
  try {
    taps = wienerSolve(R, p, es).w;
  } catch {
    throw new RangeError("cursors and noise give a singular MMSE-DFE system (all-zero cursors and no noise)");
  }
  const equalized = convolveCursors(cursors, taps, pre);
  const feedback = Float64Array.from({ length: feedbackTaps }, (_, k) => {
    const i = equalized.main + 1 + k;
    return i < equalized.h.length && (cancelled === undefined || cancelled[k]) ? equalized.h[i] : 0;
  });
  const noiseVariance_V2 = quadraticForm(Rn, taps);
  return { taps, feedback, mse: es * (1 - equalized.h[equalized.main]), noiseVariance_V2, equalized };
}

/** The n × n Toeplitz matrix `R[i][j] = r[|i − j|]` (0 beyond the given lags). */
export function noiseToeplitz(r: ArrayLike<number>, n: number): Matrix {
  const m = new Matrix(n, n);
  for (let i = 0; i < n; i++)
    for (let j = 0; j < n; j++) m.set(i, j, Math.abs(i - j) < r.length ? r[Math.abs(i - j)] : 0);
  return m;
}

/** `cᵀ·R·c`. */
function quadraticForm(R: Matrix, c: Float64Array): number {
  let s = 0;
  for (let i = 0; i < c.length; i++) for (let j = 0; j < c.length; j++) s += c[i] * R.get(i, j) * c[j];
  return s;
}
