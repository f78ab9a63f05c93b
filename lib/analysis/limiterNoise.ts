// The Gaussian noise rms at the limiter input from the two noise sources of a budget.

/**
 * Total noise rms at the limiter input: `√(noiseRms_V² + inputNoiseRms_V²·ctleNoisePowerGain)`.
 * `noiseRms_V` is already at the limiter input (after the CTLE, not shaped by it); `inputNoiseRms_V`
 * is front-end noise before the CTLE, whose power the CTLE scales by its noise-power gain
 * (the mean of |H(f)|² over the noise bandwidth). The two are independent, so powers add.
 *
 * @param noiseRms_V - noise at the limiter input, volts rms (≥ 0).
 * @param inputNoiseRms_V - front-end noise before the CTLE, volts rms (≥ 0).
 * @param ctleNoisePowerGain - the CTLE's noise-power gain (linear, ≥ 0).
 */
export function limiterNoise(noiseRms_V: number, inputNoiseRms_V: number, ctleNoisePowerGain: number): number {
  if (!(Number.isFinite(noiseRms_V) && noiseRms_V >= 0)) {
    throw new RangeError(`noiseRms_V must be a finite number ≥ 0, got ${noiseRms_V}`);
  }
  if (!(Number.isFinite(inputNoiseRms_V) && inputNoiseRms_V >= 0)) {
    throw new RangeError(`inputNoiseRms_V must be a finite number ≥ 0, got ${inputNoiseRms_V}`);
  }
  if (!(Number.isFinite(ctleNoisePowerGain) && ctleNoisePowerGain >= 0)) {
    throw new RangeError(`ctleNoisePowerGain must be a finite number ≥ 0, got ${ctleNoisePowerGain}`);
  }
  return Math.sqrt(noiseRms_V * noiseRms_V + inputNoiseRms_V * inputNoiseRms_V * ctleNoisePowerGain);
}
