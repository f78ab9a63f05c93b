// Uniform resampling of a uniformly sampled record onto a new time step.
import { interpolateLinear } from "./interpolateLinear.ts";

/**
 * Resamples `values` (step `dtIn_s`, first sample at t = 0) onto step `dtOut_s` by linear
 * interpolation, covering the same span: `floor((n−1)·dtIn/dtOut) + 1` samples from t = 0.
 *
 * @param values - samples, non-empty.
 * @param dtIn_s - input time step in seconds (> 0).
 * @param dtOut_s - output time step in seconds (> 0).
 */
export function resampleLinear(values: Float64Array, dtIn_s: number, dtOut_s: number): Float64Array {
  if (!(dtIn_s > 0) || !Number.isFinite(dtIn_s)) throw new RangeError(`dtIn_s must be > 0, got ${String(dtIn_s)}`);
  if (!(dtOut_s > 0) || !Number.isFinite(dtOut_s)) throw new RangeError(`dtOut_s must be > 0, got ${String(dtOut_s)}`);
  if (values.length === 0) throw new RangeError("values must not be empty");
  const span = (values.length - 1) * dtIn_s;
  const count = Math.floor(span / dtOut_s + 1e-9) + 1;
  const x = new Float64Array(values.length);
  for (let i = 0; i < x.length; i++) x[i] = i * dtIn_s;
  const t = new Float64Array(count);
  for (let j = 0; j < count; j++) t[j] = Math.min(j * dtOut_s, span);
  return interpolateLinear(x, values, t);
}
