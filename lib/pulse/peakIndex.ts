// Locating the main cursor of a freshly built pulse: the sample of largest magnitude.

/**
 * Index of the sample with the largest absolute value (the first one on ties).
 * @param values - sampled response, non-empty.
 */
export function peakIndex(values: Float64Array): number {
  if (!(values instanceof Float64Array) || values.length === 0) {
    throw new RangeError("values must be a non-empty Float64Array");
  }
  let best = 0;
  let bestAbs = -1;
  for (let i = 0; i < values.length; i++) {
    const a = Math.abs(values[i]);
    if (Number.isNaN(a)) throw new RangeError(`values[${i}] is NaN`);
    if (a > bestAbs) {
      bestAbs = a;
      best = i;
    }
  }
  return best;
}
