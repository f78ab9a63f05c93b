// A symbol-spaced FIR applied to symbol-spaced cursors.
import type { Cursors } from "../pulse/cursorsAt.ts";
import { checkTaps } from "./checkTaps.ts";

/**
 * Combined cursors `g[i] = Σ_j c[j]·h[i − j]` (length `h.length + taps.length − 1`), whose main
 * cursor sits at `g[main + pre]` — the convention of the engine's command line.
 *
 * @param cursors - `{ h, main }` symbol-spaced cursors.
 * @param taps - FIR coefficients, main tap `taps[pre]`.
 * @param pre - number of pre-cursor taps.
 */
export function convolveCursors(cursors: Cursors, taps: ArrayLike<number>, pre: number): Cursors {
  const { h, main } = cursors;
  if (!(h instanceof Float64Array) || h.length === 0)
    throw new RangeError("cursors.h must be a non-empty Float64Array");
  if (!Number.isInteger(main) || main < 0 || main >= h.length) {
    throw new RangeError(`cursors.main must be an integer 0…${h.length - 1}, got ${String(main)}`);
  }
  checkTaps(taps, pre);
  const g = new Float64Array(h.length + taps.length - 1);
  for (let j = 0; j < taps.length; j++) {
    const c = taps[j];
    for (let i = 0; i < h.length; i++) g[i + j] += c * h[i];
  }
  return { h: g, main: main + pre };
}
