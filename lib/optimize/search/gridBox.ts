// A box of grid settings as a TapBox: the settings whose side taps lie within given ranges of grid
// positions, with the main tap written as an affine function of them (widened where it is not).
import { isLegalMainTap, mainTapBelow } from "./firGrid.ts";
import type { SearchState } from "./searchState.ts";

/**
 * Writes into `state.box` the box of every setting whose side taps take grid positions within
 * `[lo[s], hi[s]]` (indices into `grid.sideSteps[s]`); false when no setting of it is legal.
 * Fixed side taps go into the base; the main tap is `1 − Σ|side|`, affine where each free side tap
 * keeps its sign, and an interval `[mainLo, 0]` covers a sign change, grid flooring and its cap.
 */
export function setGridBox(state: SearchState, lo: Int32Array, hi: Int32Array): boolean {
  const { grid, box } = state;
  const step = grid.step;
  box.base.fill(0);
  let count = 0;
  let fixedSteps = 0;
  let mainLo = 0;
  let freeMin = 0;
  for (let s = 0; s < grid.sides.length; s++) {
    const j = grid.sides[s];
    const ka = grid.sideSteps[s][lo[s]];
    const kb = grid.sideSteps[s][hi[s]];
    if (ka === kb) {
      box.base[j] = ka * step;
      fixedSteps += Math.abs(ka);
      continue;
    }
    const a = ka * step;
    const b = kb * step;
    box.free[count] = j;
    box.lo[count] = a;
    box.hi[count] = b;
    if (a >= 0) box.mainSlope[count] = -1;
    else if (b <= 0) box.mainSlope[count] = 1;
    else {
      // The main tap is not affine across a sign change: widen its interval instead.
      box.mainSlope[count] = 0;
      mainLo -= Math.max(-a, b);
    }
    count++;
    freeMin += a >= 0 ? a : b <= 0 ? -b : 0;
  }
  const affineMain = 1 - fixedSteps * step;
  if (!isLegalMainTap(grid, mainTapBelow(grid, affineMain - freeMin))) return false;
  // Flooring to the grid and the main tap's cap can only lower the main tap.
  if (!grid.exactGrid) mainLo -= step;
  const over = affineMain - freeMin - grid.mainMax;
  if (over > 0) mainLo -= over;
  box.base[grid.mainIndex] = affineMain;
  box.count = count;
  box.mainLo = mainLo;
  return true;
}
