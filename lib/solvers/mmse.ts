// Linear MMSE (Wiener) equalizer for independent unit-power symbols and white noise.
import type { Cursors } from "../pulse/cursorsAt.ts";
import { convolveCursors } from "../equalizers/convolveCursors.ts";
import { checkCursorWindow } from "./checkCursors.ts";
import { convolutionMatrix } from "./convolutionMatrix.ts";
import { wienerSolve } from "./wienerSolve.ts";

/** MMSE taps, their mean-square error and the combined cursors. */
export interface MmseResult {
  readonly taps: Float64Array;
  /** Minimum MSE for unit-power symbols: `1 − g[main + pre]`. */
  readonly mse: number;
  /** Combined cursors `g = h * c`, main cursor at `main + pre`. */
  readonly equalized: Cursors;
}

/**
 * Mean-square error of an equalizer `c` on cursors `h` with white noise σ² before it and
 * independent unit-power symbols: `‖H·c − e‖² + σ²‖c‖²`, `e` selecting `g[main + pre]`.
 */
export function equalizerMse(cursors: Cursors, taps: ArrayLike<number>, pre: number, noiseRms_V: number): number {
  const post = taps.length - 1 - pre;
  checkCursorWindow(cursors, pre, Math.max(post, 0));
  if (!(noiseRms_V >= 0) || !Number.isFinite(noiseRms_V)) {
    throw new RangeError(`noiseRms_V must be a finite number ≥ 0, got ${String(noiseRms_V)}`);
  }
  const g = convolveCursors(cursors, taps, pre);
  let isi = 0;
  for (let i = 0; i < g.h.length; i++) {
    const d = g.h[i] - (i === g.main ? 1 : 0);
    isi += d * d;
  }
  let c2 = 0;
  for (let j = 0; j < taps.length; j++) c2 += taps[j] * taps[j];
  return isi + noiseRms_V * noiseRms_V * c2;
}

/**
 * Linear MMSE equalizer `c = (HᵀH + σ²I)⁻¹·Hᵀe` with `H` the convolution matrix (`g = H·c`) and
 * `e` selecting `g[main + pre]`.
 *
 * @param cursors - symbol-spaced cursors `{ h, main }` in volts.
 * @param pre - pre-cursor taps.
 * @param post - post-cursor taps.
 * @param noiseRms_V - rms of white noise added before the equalizer, volts (≥ 0).
 * @see Haykin, *Adaptive Filter Theory*, 4th ed., ch. 2; Proakis, *Digital Communications*, linear MMSE equalizer.
 */
export function mmseEqualizer(cursors: Cursors, pre: number, post: number, noiseRms_V: number): MmseResult {
  checkCursorWindow(cursors, pre, post);
  if (!(noiseRms_V >= 0) || !Number.isFinite(noiseRms_V)) {
    throw new RangeError(`noiseRms_V must be a finite number ≥ 0, got ${String(noiseRms_V)}`);
  }
  const n = pre + 1 + post;
  const H = convolutionMatrix(cursors.h, n);
  const R = H.transpose().mmul(H);
  const s2 = noiseRms_V * noiseRms_V;
  for (let j = 0; j < n; j++) R.set(j, j, R.get(j, j) + s2);
  const row = cursors.main + pre;
  const p = new Float64Array(n);
  for (let j = 0; j < n; j++) p[j] = H.get(row, j);
  let taps: Float64Array;
  let mse: number;
  try {
    ({ w: taps, jMin: mse } = wienerSolve(R, p, 1));
  } catch {
    throw new RangeError("cursors give a singular MMSE system (all-zero cursors and no noise)");
  }
  const equalized = convolveCursors(cursors, taps, pre);
  return { taps, mse, equalized };
}
