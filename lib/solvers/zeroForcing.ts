// Zero-forcing equalizer: taps that null the ISI over a window of cursors.
import { LuDecomposition, Matrix, QrDecomposition } from "ml-matrix";
import type { Cursors } from "../pulse/cursorsAt.ts";
import { convolveCursors } from "../equalizers/convolveCursors.ts";
import { checkCursorWindow } from "./checkCursors.ts";

/** How the zero-forcing taps are scaled. */
export type ZfNormalization = "unit-cursor" | "peak-swing";

/** Options of {@link zeroForcing}. */
export interface ZeroForcingOptions {
  /**
   * The cursors to force, relative to the combined main cursor: `n = −window.pre … window.post`.
   * Default `{ pre, post }` (the square system). A wider window gives the least-squares solution.
   */
  readonly window?: { readonly pre: number; readonly post: number };
  /** `"unit-cursor"` (default): combined main cursor 1; `"peak-swing"`: scaled so `Σ|c| = 1`. */
  readonly normalize?: ZfNormalization;
}

/** Zero-forcing taps and the combined cursors they give. */
export interface ZeroForcingResult {
  /** `pre + 1 + post` taps from the earliest pre-cursor tap. */
  readonly taps: Float64Array;
  /** Combined cursors `g = h * c`; the main cursor at `equalized.main = main + pre`. */
  readonly equalized: Cursors;
}

/**
 * Zero-forcing FIR: solves `g[main + pre + n] = δ(n)` for `n = −pre … post` (a square Toeplitz
 * system, `A[n][j] = h[main + pre + n − j]`), or in the least-squares sense over a wider window.
 *
 * @param cursors - symbol-spaced channel cursors `{ h, main }`.
 * @param pre - pre-cursor taps.
 * @param post - post-cursor taps.
 * @param options - window and normalization.
 * @throws RangeError when the system is singular (e.g. all-zero cursors in the window).
 * @see Lucky, "Automatic equalization for digital communication", Bell Syst. Tech. J. 44 (1965);
 *   Sklar, *Digital Communications*, 2nd ed., ch. 3 (the three-tap example).
 */
export function zeroForcing(
  cursors: Cursors,
  pre: number,
  post: number,
  options: ZeroForcingOptions = {},
): ZeroForcingResult {
  checkCursorWindow(cursors, pre, post);
  const win = options.window ?? { pre, post };
  if (!Number.isInteger(win.pre) || !Number.isInteger(win.post) || win.pre < pre || win.post < post) {
    throw new RangeError(`window must hold integers with window.pre ≥ pre (${pre}) and window.post ≥ post (${post})`);
  }
  if (win.pre + win.post > 4096) throw new RangeError("window must span at most 4096 cursors");
  const normalize = options.normalize ?? "unit-cursor";
  if (normalize !== "unit-cursor" && normalize !== "peak-swing") {
    throw new RangeError(`normalize must be "unit-cursor" or "peak-swing", got ${String(normalize)}`);
  }
  const { h, main } = cursors;
  const n = pre + 1 + post;
  const rows = win.pre + 1 + win.post;
  const a = new Matrix(rows, n);
  const b = new Matrix(rows, 1);
  for (let r = 0; r < rows; r++) {
    const k = r - win.pre; // cursor offset from the combined main cursor
    for (let j = 0; j < n; j++) {
      const i = main + pre + k - j;
      a.set(r, j, i >= 0 && i < h.length ? h[i] : 0);
    }
    b.set(r, 0, k === 0 ? 1 : 0);
  }
  let x: Matrix;
  if (rows === n) {
    const lu = new LuDecomposition(a);
    if (lu.isSingular()) throw new RangeError("cursors give a singular zero-forcing system (no taps can force it)");
    x = lu.solve(b);
  } else {
    const qr = new QrDecomposition(a);
    if (!qr.isFullRank()) throw new RangeError("cursors give a rank-deficient least-squares zero-forcing system");
    x = qr.solve(b);
  }
  let taps = Float64Array.from(x.getColumn(0));
  let equalized = convolveCursors(cursors, taps, pre);
  const scale =
    normalize === "peak-swing"
      ? 1 / taps.reduce((s, c) => s + Math.abs(c), 0)
      : rows === n
        ? 1
        : 1 / equalized.h[equalized.main];
  if (!Number.isFinite(scale))
    throw new RangeError("zero-forcing taps cannot be normalized (zero main cursor or taps)");
  if (scale !== 1) {
    taps = taps.map((c) => c * scale);
    equalized = convolveCursors(cursors, taps, pre);
  }
  for (const v of taps)
    if (!Number.isFinite(v)) throw new RangeError("cursors give an ill-conditioned zero-forcing system");
  return { taps, equalized };
}
