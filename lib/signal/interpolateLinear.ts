// Piecewise-linear interpolation of sampled data onto new abscissae.

/** What an interpolant returns outside the data: the edge values, or zero. */
export type Outside = "hold" | "zero";

/**
 * Values of the piecewise-linear interpolant through `(x[i], y[i])` at each `xNew[j]`.
 *
 * @param x - strictly ascending abscissae, length ≥ 1.
 * @param y - ordinates, same length as `x`.
 * @param xNew - points to evaluate (any order).
 * @param outside - `"hold"` repeats the first/last value, `"zero"` gives 0 (default `"hold"`).
 */
export function interpolateLinear(
  x: Float64Array,
  y: Float64Array,
  xNew: Float64Array,
  outside: Outside = "hold",
): Float64Array {
  const n = x.length;
  if (n === 0) throw new RangeError("x must not be empty");
  if (y.length !== n) throw new RangeError(`y must have the length of x (${n}), got ${y.length}`);
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(x[i]) || !Number.isFinite(y[i])) throw new RangeError(`x[${i}] or y[${i}] is not finite`);
    if (i > 0 && !(x[i] > x[i - 1])) throw new RangeError(`x must ascend strictly (x[${i}] ≤ x[${i - 1}])`);
  }
  const out = new Float64Array(xNew.length);
  let seg = 0;
  for (let j = 0; j < xNew.length; j++) {
    const t = xNew[j];
    if (Number.isNaN(t)) throw new RangeError(`xNew[${j}] is NaN`);
    if (t < x[0] || t > x[n - 1]) {
      out[j] = outside === "zero" ? 0 : t < x[0] ? y[0] : y[n - 1];
      continue;
    }
    if (n === 1) {
      out[j] = y[0];
      continue;
    }
    // Ascending queries walk forward; otherwise restart with a binary search.
    if (!(x[seg] <= t && t <= x[seg + 1])) {
      let lo = 0;
      let hi = n - 1;
      while (hi - lo > 1) {
        const mid = (lo + hi) >> 1;
        if (x[mid] <= t) lo = mid;
        else hi = mid;
      }
      seg = lo;
    }
    const w = (t - x[seg]) / (x[seg + 1] - x[seg]);
    out[j] = y[seg] + w * (y[seg + 1] - y[seg]);
  }
  return out;
}
