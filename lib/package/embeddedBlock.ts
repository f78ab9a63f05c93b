// Complex blocks of a network's S-matrix as real matrices, so that ml-matrix (real) can do complex algebra.
import { Matrix } from "ml-matrix";
import type { NetworkData } from "../channel/networkData.ts";

/**
 * The real embedding `[[Re, −Im], [Im, Re]]` (2r × 2c) of the complex block `S[rows][cols]` of `net`
 * at frequency index `f` (ports numbered from 0 here). Sums, products and inverses of embeddings are
 * the embeddings of the complex sums, products and inverses, so complex network algebra runs on
 * ml-matrix unchanged.
 *
 * @see Horn & Johnson, *Matrix Analysis* (realification of complex matrices) [memory: recalled, not re-read].
 */
export function embeddedBlock(net: NetworkData, f: number, rows: readonly number[], cols: readonly number[]): Matrix {
  const n = net.ports;
  const r = rows.length;
  const c = cols.length;
  const m = new Matrix(2 * r, 2 * c);
  for (let i = 0; i < r; i++) {
    for (let j = 0; j < c; j++) {
      const at = 2 * ((f * n + rows[i]) * n + cols[j]);
      const re = net.s[at];
      const im = net.s[at + 1];
      m.set(i, j, re);
      m.set(i + r, j + c, re);
      m.set(i + r, j, im);
      m.set(i, j + c, -im);
    }
  }
  return m;
}

/**
 * Writes the complex block held in the embedding `m` (2r × 2c) into `s` (an S-matrix array of a
 * `ports`-port network, layout of {@link NetworkData}) at frequency index `f`, rows `rows`, columns `cols`.
 */
export function storeEmbeddedBlock(
  m: Matrix,
  s: Float64Array,
  ports: number,
  f: number,
  rows: readonly number[],
  cols: readonly number[],
): void {
  const r = rows.length;
  for (let i = 0; i < r; i++) {
    for (let j = 0; j < cols.length; j++) {
      const at = 2 * ((f * ports + rows[i]) * ports + cols[j]);
      s[at] = m.get(i, j);
      s[at + 1] = m.get(i + r, j);
    }
  }
}
