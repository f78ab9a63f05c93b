// Margin at the limiting amplifier: what the eye leaves above the limiter's sensitivity.

/**
 * Limiter headroom: `eyeHeight_V − limiterSensitivity_V`, both at the limiter input and at the
 * target BER. Negative when the eye is smaller than the limiter can resolve.
 *
 * @param eyeHeight_V - vertical eye opening at the target BER, volts (≥ 0).
 * @param limiterSensitivity_V - smallest differential input the limiter resolves, volts (≥ 0).
 * @see slicer sensitivity after offset calibration, typically 5–20 mV [practice].
 */
export function limiterHeadroom(eyeHeight_V: number, limiterSensitivity_V: number): number {
  if (!(Number.isFinite(eyeHeight_V) && eyeHeight_V >= 0)) {
    throw new RangeError(`eyeHeight_V must be a finite number ≥ 0, got ${eyeHeight_V}`);
  }
  if (!(Number.isFinite(limiterSensitivity_V) && limiterSensitivity_V >= 0)) {
    throw new RangeError(`limiterSensitivity_V must be a finite number ≥ 0, got ${limiterSensitivity_V}`);
  }
  return eyeHeight_V - limiterSensitivity_V;
}
