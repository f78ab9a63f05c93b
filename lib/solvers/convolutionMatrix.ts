// The convolution matrix of a channel: the FIR's taps in, the combined cursors out.
import { Matrix } from "ml-matrix";

/**
 * `H` with `H[i][j] = h[i − j]` (zero outside), shape `(h.length + taps − 1) × taps`, so that the
 * combined cursors of cursors `h` and an FIR `c` are `g = H·c`.
 *
 * @param h - symbol-spaced cursors.
 * @param taps - number of FIR taps (integer ≥ 1).
 */
export function convolutionMatrix(h: Float64Array, taps: number): Matrix {
  if (!Number.isInteger(taps) || taps < 1) throw new RangeError(`taps must be an integer ≥ 1, got ${String(taps)}`);
  const rows = h.length + taps - 1;
  const m = new Matrix(rows, taps);
  for (let j = 0; j < taps; j++) for (let i = 0; i < h.length; i++) m.set(i + j, j, h[i]);
  return m;
}
