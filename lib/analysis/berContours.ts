// BER contour lines of a statistical eye map, in physical units, for drawing over a density eye.
import { contours } from "d3-contour";
import type { BerMap } from "./berMap.ts";

/** The contour lines of one error ratio. */
export interface BerContour {
  /** log10 of the error ratio the lines follow. */
  readonly log10Ber: number;
  /** Closed polylines of `[phase, voltage_V]` points (phase in the map's phase unit). */
  readonly paths: Array<Array<[number, number]>>;
}

/**
 * Contour lines of a {@link BerMap} at the given log10 error ratios (marching squares with linear
 * interpolation, d3-contour). Each contour bounds the region where the error ratio is at or below
 * its level — the eye openings (and the outer edges of the level bands). Grid coordinates are
 * mapped linearly to phases and voltages and clamped to the map's extent.
 *
 * @param map - the BER map (at least 2 × 2).
 * @param levels - log10 error ratios, e.g. `[-3, -6, -9, -12]`.
 * @param scalePhase - factor applied to the phases of the output (e.g. `1/samplesPerUi` for UI).
 * @see W. E. Lorensen and H. E. Cline, "Marching cubes", SIGGRAPH 1987 — the 2-D variant
 *   (marching squares) [memory: recalled, not re-read].
 */
export function berContours(map: BerMap, levels: readonly number[], scalePhase = 1): BerContour[] {
  const { width: W, height: H } = map;
  if (W < 2 || H < 2) throw new RangeError(`map must be at least 2 × 2, got ${W} × ${H}`);
  for (const l of levels) {
    if (!Number.isFinite(l)) throw new RangeError(`levels must be finite log10 error ratios, got ${l}`);
  }
  if (!Number.isFinite(scalePhase)) throw new RangeError(`scalePhase must be finite, got ${scalePhase}`);
  // d3-contour keeps values ≥ threshold; negate so that "≥ −level" means "BER ≤ 10^level".
  const neg = new Array<number>(W * H);
  for (let i = 0; i < W * H; i++) neg[i] = -map.values[i];
  const gen = contours()
    .size([W, H])
    .thresholds(levels.map((l) => -l));
  const polys = gen(neg);
  // Grid coordinate x ↔ column x − 0.5 (d3-contour puts value i at ⟨i + 0.5, j + 0.5⟩).
  const axis = (a: Float64Array, x: number): number => {
    const g = Math.min(a.length - 1, Math.max(0, x - 0.5));
    const i = Math.min(a.length - 2, Math.floor(g));
    return a[i] + (g - i) * (a[i + 1] - a[i]);
  };
  return polys.map((mp, idx) => ({
    log10Ber: levels[idx],
    paths: mp.coordinates.flatMap((poly) =>
      poly.map((ring) =>
        ring.map(([x, y]) => [axis(map.phases, x) * scalePhase, axis(map.voltage_V, y)] as [number, number]),
      ),
    ),
  }));
}
