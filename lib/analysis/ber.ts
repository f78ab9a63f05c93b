// Conversion between the Q factor of a Gaussian decision and the bit error ratio it gives.
import erfc from "@stdlib/math-base-special-erfc";
import erfcinv from "@stdlib/math-base-special-erfcinv";

/**
 * Bit error ratio of a Gaussian decision with the given Q factor: `BER = ½·erfc(Q/√2)`.
 *
 * @param q - Q factor (signal distance to the threshold over the noise rms), any finite number.
 * @returns BER in (0, 1).
 * @see Standard Gaussian tail probability; e.g. Proakis & Salehi, *Communication Systems Engineering*.
 */
export function berFromQ(q: number): number {
  if (typeof q !== "number" || !Number.isFinite(q)) {
    throw new RangeError(`q must be a finite number, got ${String(q)}`);
  }
  return 0.5 * erfc(q / Math.SQRT2);
}

/**
 * Q factor that gives the bit error ratio `ber`: the inverse of {@link berFromQ},
 * `Q = √2·erfcinv(2·BER)`.
 *
 * @param ber - bit error ratio, 0 < ber < 1.
 * @returns Q factor (positive for ber < 0.5).
 */
export function qFromBer(ber: number): number {
  if (typeof ber !== "number" || !Number.isFinite(ber) || ber <= 0 || ber >= 1) {
    throw new RangeError(`ber must be a number strictly between 0 and 1, got ${String(ber)}`);
  }
  return Math.SQRT2 * erfcinv(2 * ber);
}
