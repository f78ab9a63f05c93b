// Every legal transmit FIR setting on the step grid, for exhaustive searches.
import { resolveTapRanges, TAP_TOLERANCE, type TxFirSpec } from "./txFirConstraints.ts";

/** Integer grid indices k with k·step inside [min, max] (tolerant of rounding at the ends). */
export function gridIndices(min: number, max: number, step: number): number[] {
  const lo = Math.ceil(min / step - 1e-9);
  const hi = Math.floor(max / step + 1e-9);
  const out: number[] = [];
  for (let k = lo; k <= hi; k++) out.push(k);
  return out;
}

/**
 * Yields every setting with the side taps on the step grid inside their ranges and the main
 * tap as large as the peak-swing limit allows: the largest grid value ≤ min(main max,
 * 1 − Σ|side taps|), skipped when below the main tap's minimum. So each yielded vector has
 * `Σ|c| ≤ 1` and uses the full swing when the grid allows. Side taps vary fastest from the
 * last post-cursor tap. Each yield is a fresh array of `pre + 1 + post` taps.
 *
 * @param spec - tap counts, step and optional per-tap ranges.
 */
export function* enumerateTxFirs(spec: TxFirSpec): Generator<Float64Array> {
  const ranges = resolveTapRanges(spec);
  const { pre, step } = spec;
  const count = ranges.length;
  const sides: number[] = [];
  for (let j = 0; j < count; j++) if (j !== pre) sides.push(j);
  const grids = sides.map((j) => gridIndices(ranges[j][0], ranges[j][1], step));
  if (grids.some((g) => g.length === 0)) return;
  const [mainMin, mainMax] = ranges[pre];
  const pos = new Array<number>(sides.length).fill(0);
  for (;;) {
    let sumAbs = 0;
    for (let s = 0; s < sides.length; s++) sumAbs += Math.abs(grids[s][pos[s]]);
    const limit = Math.min(mainMax, 1 - sumAbs * step);
    const k = Math.floor(limit / step + 1e-9);
    const main = k * step;
    if (main >= mainMin - TAP_TOLERANCE) {
      const taps = new Float64Array(count);
      for (let s = 0; s < sides.length; s++) taps[sides[s]] = grids[s][pos[s]] * step;
      taps[pre] = main;
      yield taps;
    }
    let s = sides.length - 1;
    while (s >= 0) {
      pos[s]++;
      if (pos[s] < grids[s].length) break;
      pos[s] = 0;
      s--;
    }
    if (s < 0) return;
  }
}

/** Number of settings {@link enumerateTxFirs} yields for `spec`. */
export function countTxFirs(spec: TxFirSpec): number {
  let n = 0;
  for (const _ of enumerateTxFirs(spec)) n++;
  return n;
}
