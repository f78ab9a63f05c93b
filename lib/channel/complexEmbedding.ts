// Complex N×N matrices as real 2N×2N matrices, so ml-matrix (real only) can factor and decompose them.
import { Matrix } from "ml-matrix";

/**
 * The real embedding `[[Re, −Im], [Im, Re]]` of the S-matrix at frequency index `f` of an interleaved
 * network array (`S[f][row][col]` real part at `2·((f·N + row)·N + col)`, imaginary part next). It
 * respects products and inverses, and has each singular value of the complex matrix twice.
 *
 * @param s - interleaved S-matrices (see `NetworkData.s`).
 * @param ports - N.
 * @param f - frequency index.
 */
export function complexEmbedding(s: Float64Array, ports: number, f: number): Matrix {
  const n = ports;
  const m = new Matrix(2 * n, 2 * n);
  for (let r = 0; r < n; r++) {
    for (let c = 0; c < n; c++) {
      const at = 2 * ((f * n + r) * n + c);
      const re = s[at];
      const im = s[at + 1];
      m.set(r, c, re);
      m.set(r + n, c + n, re);
      m.set(r, c + n, -im);
      m.set(r + n, c, im);
    }
  }
  return m;
}
