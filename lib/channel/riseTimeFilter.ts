// The transmitter's finite edge rate, modelled as a Gaussian filter of a given 10–90 % rise time.

/** `2·Φ⁻¹(0.9)`: a Gaussian step rises from 10 % to 90 % in this many standard deviations. */
const RISE_SIGMAS = 2 * 1.2815515655446004;

/** Standard deviation in seconds of the Gaussian impulse response with 10–90 % rise time `riseTime_s`. */
export function riseTimeSigma(riseTime_s: number): number {
  if (!(riseTime_s >= 0) || !Number.isFinite(riseTime_s)) {
    throw new RangeError(`riseTime_s must be a finite number ≥ 0, got ${String(riseTime_s)}`);
  }
  return riseTime_s / RISE_SIGMAS;
}

/**
 * Magnitude of the rise-time filter at `freq_Hz`: `exp(−2π²σ²f²)` (zero phase, unit DC gain).
 * @param riseTime_s - 10–90 % rise time of the filter's step response in seconds (0 = no filter).
 */
export function riseTimeResponse(freq_Hz: number, riseTime_s: number): number {
  const s = riseTimeSigma(riseTime_s);
  return Math.exp(-2 * Math.PI * Math.PI * s * s * freq_Hz * freq_Hz);
}

/**
 * The same filter as a symmetric sampled kernel of unit sum, spanning ±4σ (at least one sample).
 * @param riseTime_s - 10–90 % rise time in seconds.
 * @param dt_s - sample step in seconds.
 * @returns `{ kernel, half }` where `kernel[half]` is the centre tap.
 */
export function riseTimeKernel(riseTime_s: number, dt_s: number): { kernel: Float64Array; half: number } {
  const s = riseTimeSigma(riseTime_s);
  if (!(dt_s > 0) || !Number.isFinite(dt_s))
    throw new RangeError(`dt_s must be a finite number > 0, got ${String(dt_s)}`);
  const half = Math.ceil((4 * s) / dt_s);
  if (half > 1 << 20) throw new RangeError("riseTime_s is too long for the sample step (kernel over 2^21 samples)");
  const kernel = new Float64Array(2 * half + 1);
  if (half === 0 || s === 0) {
    kernel[half] = 1;
    return { kernel, half };
  }
  let sum = 0;
  for (let i = -half; i <= half; i++) {
    const v = Math.exp(-0.5 * ((i * dt_s) / s) ** 2);
    kernel[i + half] = v;
    sum += v;
  }
  for (let i = 0; i < kernel.length; i++) kernel[i] /= sum;
  return { kernel, half };
}
