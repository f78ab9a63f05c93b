// The transmit FIR grid as the joint search walks it: side taps at integer grid positions, and the
// one rule for the main tap (the largest grid value that the peak-swing limit and its range allow).
import { gridIndices } from "../../equalizers/enumerateTxFirs.ts";
import { resolveTapRanges, TAP_TOLERANCE, type TapRange, type TxFirSpec } from "../../equalizers/txFirConstraints.ts";

/** The FIR grid of a search: side taps at `k·step` inside their ranges, the main tap following them. */
export interface FirGrid {
  readonly tapCount: number;
  /** Index of the main tap. */
  readonly mainIndex: number;
  /** Grid step, a fraction of the peak swing. */
  readonly step: number;
  /** Each tap's range, fractions of the peak swing. */
  readonly ranges: readonly TapRange[];
  /** Tap indices of the side taps (every tap but the main one), in order. */
  readonly sides: readonly number[];
  /** Per side tap, its legal grid indices `k` (value `k·step`), ascending. */
  readonly sideSteps: readonly (readonly number[])[];
  readonly mainMin: number;
  readonly mainMax: number;
  /** True when `1/step` and `mainMax/step` are whole: flooring to the grid never lowers an affine main tap. */
  readonly exactGrid: boolean;
  /** True when some side tap has no grid value in its range (the grid holds no setting). */
  readonly empty: boolean;
}

/** The grid of a transmit FIR spec (validated by `resolveTapRanges`). */
export function firGrid(spec: TxFirSpec): FirGrid {
  const ranges = resolveTapRanges(spec);
  const step = spec.step;
  const sides: number[] = [];
  for (let j = 0; j < ranges.length; j++) if (j !== spec.pre) sides.push(j);
  const sideSteps = sides.map((j) => gridIndices(ranges[j][0], ranges[j][1], step));
  const [mainMin, mainMax] = ranges[spec.pre];
  return {
    tapCount: ranges.length,
    mainIndex: spec.pre,
    step,
    ranges,
    sides,
    sideSteps,
    mainMin,
    mainMax,
    exactGrid:
      Math.abs(1 / step - Math.round(1 / step)) < 1e-9 && Math.abs(mainMax / step - Math.round(mainMax / step)) < 1e-9,
    empty: sideSteps.some((g) => g.length === 0),
  };
}

/** `x` floored to a multiple of `step` (tolerant of rounding just below a multiple). */
export function floorToStep(x: number, step: number): number {
  return Math.floor(x / step + 1e-9) * step;
}

/** The largest grid value of the main tap that is at most `limit` and its range's maximum. */
export function mainTapBelow(grid: FirGrid, limit: number): number {
  return floorToStep(Math.min(grid.mainMax, limit), grid.step);
}

/** Whether a main tap value reaches its range's minimum. */
export function isLegalMainTap(grid: FirGrid, main: number): boolean {
  return !(main < grid.mainMin - TAP_TOLERANCE);
}

/**
 * The main tap for side taps whose grid indices sum to `sideSteps` in absolute value — the
 * enumeration's rule: the largest grid value ≤ min(main max, 1 − Σ|side taps|), so the setting uses
 * the whole swing the grid allows; null when that falls below the main tap's minimum.
 */
export function mainTapFor(grid: FirGrid, sideSteps: number): number | null {
  const main = mainTapBelow(grid, 1 - sideSteps * grid.step);
  return isLegalMainTap(grid, main) ? main : null;
}

/**
 * Writes into `taps` the setting whose side taps sit at grid positions `positions` (indices into
 * `sideSteps`), with the main tap of {@link mainTapFor}; false (and the main tap unwritten) when the
 * main tap falls short.
 */
export function settingAt(grid: FirGrid, positions: ArrayLike<number>, taps: Float64Array): boolean {
  let side = 0;
  for (let s = 0; s < grid.sides.length; s++) {
    const k = grid.sideSteps[s][positions[s]];
    taps[grid.sides[s]] = k * grid.step;
    side += Math.abs(k);
  }
  const main = mainTapFor(grid, side);
  if (main === null) return false;
  taps[grid.mainIndex] = main;
  return true;
}
