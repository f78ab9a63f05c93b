// Windows and tapers: smooth weights that limit truncation ringing.

/**
 * Hann window of length `n`: `w[i] = ½·(1 − cos(2πi/(n−1)))` (symmetric; `[1]` for n = 1).
 * @see Harris, "On the use of windows for harmonic analysis with the DFT", Proc. IEEE 66(1), 1978.
 */
export function hannWindow(n: number): Float64Array {
  if (!Number.isInteger(n) || n < 1) throw new RangeError(`n must be an integer ≥ 1, got ${String(n)}`);
  const w = new Float64Array(n);
  if (n === 1) {
    w[0] = 1;
    return w;
  }
  for (let i = 0; i < n; i++) w[i] = 0.5 * (1 - Math.cos((2 * Math.PI * i) / (n - 1)));
  return w;
}

/**
 * Raised-cosine roll-off: 1 below `start`, 0 above `stop`, `½·(1 + cos(π·(x − start)/(stop − start)))`
 * between (the half-cosine edge of a Tukey window).
 *
 * @param x - abscissa (e.g. a frequency in Hz).
 * @param start - where the roll-off begins.
 * @param stop - where it reaches zero (`stop ≥ start`; equal values give a hard cut).
 */
export function raisedCosineRolloff(x: number, start: number, stop: number): number {
  if (!(stop >= start)) throw new RangeError(`stop must be ≥ start (${String(stop)} < ${String(start)})`);
  if (x <= start) return 1;
  if (x >= stop) return 0;
  return 0.5 * (1 + Math.cos((Math.PI * (x - start)) / (stop - start)));
}
