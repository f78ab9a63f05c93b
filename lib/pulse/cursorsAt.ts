// Symbol-spaced cursors: the pulse sampled once per UI at a sampling phase.
import type { Pulse } from "../types.ts";
import { assertPulse } from "./assertPulse.ts";

/** Symbol-spaced cursors and the index of the main cursor among them. */
export interface Cursors {
  /** Cursor values in volts, `h[main]` is the main cursor. */
  readonly h: Float64Array;
  /** Index of the main cursor in `h` (equals the requested pre-cursor count). */
  readonly main: number;
}

/**
 * Samples the pulse once per UI: `h[k] = p(phase + (k − preCount)·samplesPerUi)` for
 * `k = 0 … preCount + postCount`, so the main cursor is taken at sample `phase_samples`.
 * A fractional phase is linearly interpolated; samples outside the pulse are 0.
 *
 * @param pulse - the pulse response.
 * @param phase_samples - sampling instant of the main cursor, as a (possibly fractional) index
 *   into `pulse.values_V`; `pulse.mainIndex` samples at the pulse's own main cursor.
 * @param preCount - number of pre-cursors (integer ≥ 0).
 * @param postCount - number of post-cursors (integer ≥ 0).
 * @returns `{ h, main }` with `h.length = preCount + 1 + postCount` and `main = preCount`.
 */
export function cursorsAt(pulse: Pulse, phase_samples: number, preCount: number, postCount: number): Cursors {
  assertPulse(pulse);
  if (!Number.isFinite(phase_samples)) {
    throw new RangeError(`phase_samples must be a finite number, got ${String(phase_samples)}`);
  }
  if (!Number.isInteger(preCount) || preCount < 0) {
    throw new RangeError(`preCount must be an integer ≥ 0, got ${String(preCount)}`);
  }
  if (!Number.isInteger(postCount) || postCount < 0) {
    throw new RangeError(`postCount must be an integer ≥ 0, got ${String(postCount)}`);
  }
  const v = pulse.values_V;
  const n = v.length;
  const spu = pulse.samplesPerUi;
  const h = new Float64Array(preCount + 1 + postCount);
  for (let k = 0; k < h.length; k++) {
    const x = phase_samples + (k - preCount) * spu;
    const i0 = Math.floor(x);
    const frac = x - i0;
    const a = i0 >= 0 && i0 < n ? v[i0] : 0;
    const b = frac > 0 && i0 + 1 >= 0 && i0 + 1 < n ? v[i0 + 1] : 0;
    h[k] = frac > 0 ? a + frac * (b - a) : a;
  }
  return { h, main: preCount };
}
