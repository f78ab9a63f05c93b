// The front-end noise of a budget (before the CTLE) at the CTLE's output: its variance and its
// correlation between symbol-spaced samples, shaped by the CTLE and the receiver's package and
// bandwidth filter.
import { noiseCorrelation } from "../analysis/noiseCorrelation.ts";
import { ctleNoiseGain } from "../equalizers/ctleNoiseGain.ts";
import { ctleAt, type CtleParams } from "../equalizers/ctleResponse.ts";
import type { SearchSpace } from "./searchSpace.ts";

/**
 * `r[m] = E[n_k·n_{k+m}]` (V²), m = 0 … lags, of the budget's front-end noise (`inputNoiseRms_V`,
 * white over [0, baud/2]) after the receiver's package and bandwidth filter and the CTLE `params`:
 * `S(f) = (σ²/f_N)·|H_rx(f)·H_ctle(f)|²` on [0, f_N]. `r[0]/σ²` is the noise-power gain; with no
 * receiver front end and no lag it is `ctleNoiseGain` itself.
 *
 * @param space - the resolved budget.
 * @param params - the CTLE setting.
 * @param lags - largest lag (0 for the variance alone).
 */
export function receiverNoiseCorrelation(space: SearchSpace, params: CtleParams, lags: number): Float64Array {
  const sigma = space.budget.inputNoiseRms_V;
  const r = new Float64Array(lags + 1);
  if (sigma === 0) return r;
  const fN = space.baud_Hz / 2;
  const shaping = space.rxNoiseShaping;
  if (lags === 0 && shaping === null) {
    r[0] = sigma * sigma * ctleNoiseGain(params, fN);
    return r;
  }
  const g1 = 10 ** (params.gDc_dB / 20);
  const g2 = 10 ** ((params.gDc2_dB ?? 0) / 20);
  const h = new Float64Array(2);
  const density = (sigma * sigma) / fN;
  return noiseCorrelation(
    (f) => {
      ctleAt(params, g1, g2, f, h);
      return density * (h[0] * h[0] + h[1] * h[1]) * (shaping === null ? 1 : shaping(f));
    },
    fN,
    1 / space.baud_Hz,
    lags,
  );
}
