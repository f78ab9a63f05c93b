// How much a CTLE multiplies white front-end noise: its mean power gain over a band.
import { checkCtleParams, ctleAt, type CtleParams } from "./ctleResponse.ts";

/**
 * Mean power gain of the CTLE over `[0, band_Hz]`: `(1/B)·∫₀^B |H(f)|² df`, the factor applied to
 * the variance of white noise band-limited to `B` at the CTLE's input. Integrated by composite
 * Simpson's rule on `intervals` (even) sub-intervals.
 *
 * @param params - CTLE settings.
 * @param band_Hz - noise bandwidth in Hz (> 0).
 * @param intervals - Simpson sub-intervals, even, default 4096.
 */
export function ctleNoiseGain(params: CtleParams, band_Hz: number, intervals = 4096): number {
  checkCtleParams(params);
  if (!(band_Hz > 0) || !Number.isFinite(band_Hz)) {
    throw new RangeError(`band_Hz must be a finite number > 0, got ${String(band_Hz)}`);
  }
  if (!Number.isInteger(intervals) || intervals < 2 || intervals % 2 !== 0) {
    throw new RangeError(`intervals must be an even integer ≥ 2, got ${String(intervals)}`);
  }
  const g1 = 10 ** (params.gDc_dB / 20);
  const g2 = 10 ** ((params.gDc2_dB ?? 0) / 20);
  const h = new Float64Array(2);
  const step = band_Hz / intervals;
  let sum = 0;
  for (let i = 0; i <= intervals; i++) {
    ctleAt(params, g1, g2, i * step, h);
    const w = i === 0 || i === intervals ? 1 : i % 2 === 1 ? 4 : 2;
    sum += w * (h[0] * h[0] + h[1] * h[1]);
  }
  return (sum * step) / 3 / band_Hz;
}
