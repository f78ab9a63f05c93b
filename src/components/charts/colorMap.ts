// The density colour map of eyes and heat maps: from the card's white through copper to near-black,
// with logarithmic compression so that rare trajectories stay visible beside dense ones.

const STOPS: ReadonlyArray<readonly [number, number, number, number]> = [
  // t, r, g, b
  [0, 255, 255, 255],
  [0.12, 246, 231, 222],
  [0.35, 226, 160, 118],
  [0.6, 176, 82, 42],
  [0.82, 110, 44, 22],
  [1, 36, 22, 18],
];

/** RGB of the colour map at `t` in 0…1 (clamped). */
export function densityColor(t: number): [number, number, number] {
  const x = Math.min(1, Math.max(0, Number.isFinite(t) ? t : 0));
  for (let i = 1; i < STOPS.length; i++) {
    const [t1, r1, g1, b1] = STOPS[i];
    if (x <= t1) {
      const [t0, r0, g0, b0] = STOPS[i - 1];
      const f = (x - t0) / (t1 - t0);
      return [Math.round(r0 + f * (r1 - r0)), Math.round(g0 + f * (g1 - g0)), Math.round(b0 + f * (b1 - b0))];
    }
  }
  const last = STOPS[STOPS.length - 1];
  return [last[1], last[2], last[3]];
}

/** The colour-map position of a count: `log(1 + c) / log(1 + max)`; 0 for empty cells. */
export function densityLevel(count: number, max: number): number {
  if (!(count > 0) || !(max > 0)) return 0;
  return Math.log1p(count) / Math.log1p(max);
}

/** The count at colour-map position `t` (the inverse of {@link densityLevel}), for scale-bar labels. */
export function countAtLevel(t: number, max: number): number {
  return Math.expm1(t * Math.log1p(max));
}

/**
 * RGBA pixels of a `width × height` count image (row-major, row 0 first): empty cells are
 * transparent, the rest coloured by {@link densityLevel}.
 */
export function densityPixels(counts: readonly number[], width: number, height: number): Uint8ClampedArray {
  const out = new Uint8ClampedArray(width * height * 4);
  let max = 0;
  for (let i = 0; i < width * height; i++) if (counts[i] > max) max = counts[i];
  for (let i = 0; i < width * height; i++) {
    const c = counts[i];
    if (!(c > 0)) continue;
    const [r, g, b] = densityColor(0.12 + 0.88 * densityLevel(c, max));
    out[4 * i] = r;
    out[4 * i + 1] = g;
    out[4 * i + 2] = b;
    out[4 * i + 3] = 255;
  }
  return out;
}
