// Which symbol levels bound a slicer threshold: the decision regions a BER at (t, v) depends on.

/**
 * Writes into `out` the index of the nearest level at or above `v_V` (`out[0]`) and the nearest
 * level below it (`out[1]`), by their nominal positions `levels[l]·main_V`; −1 where there is none.
 *
 * @param levels - symbol levels (NRZ ±1, PAM4 ±1, ±⅓).
 * @param main_V - the main cursor at the phase, volts.
 * @param v_V - the threshold, volts.
 * @param out - caller-owned buffer of length ≥ 2.
 */
export function nearestLevelsInto(levels: ArrayLike<number>, main_V: number, v_V: number, out: Int32Array): void {
  let above = -1;
  let below = -1;
  let aPos = Infinity;
  let bPos = -Infinity;
  for (let l = 0; l < levels.length; l++) {
    const pos = levels[l] * main_V;
    if (pos >= v_V && pos < aPos) {
      aPos = pos;
      above = l;
    }
    if (pos < v_V && pos > bPos) {
      bPos = pos;
      below = l;
    }
  }
  out[0] = above;
  out[1] = below;
}
