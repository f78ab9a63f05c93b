// How much of the link's jitter reaches the sampling decision, given how the clock is obtained.
import { assertJitter, type Jitter } from "../analysis/jitterKernel.ts";

/** How the receiver gets its sampling clock. */
export type ClockingScheme = "forwarded" | "recovered";

/** The clocking schemes, for validation and forms. */
export const CLOCKING_SCHEMES: readonly ClockingScheme[] = ["forwarded", "recovered"];

/** Jitter of the transmitted data: RJ and DJ in UI, optionally the frequency of the DJ. */
export interface LinkJitter extends Jitter {
  /**
   * Frequency of the deterministic jitter in Hz when it is periodic (e.g. supply or spread-spectrum
   * tones); omit for data-dependent DJ, which no clock follows.
   */
  readonly djFreq_Hz?: number;
}

/** The jitter left at the sampler and how it was obtained. */
export interface SamplerJitter extends Jitter {
  readonly scheme: ClockingScheme;
  /** Tracking bandwidth used, Hz. */
  readonly bandwidth_Hz: number;
  /** Fraction of the RJ rms left after tracking. */
  readonly rjFactor: number;
  /** Fraction of the DJ left after tracking. */
  readonly djFactor: number;
}

/**
 * Default tracking bandwidth of a scheme at a baud rate: a recovered clock's loop bandwidth of
 * baud/1667 (the corner of common jitter-tolerance masks) and a forwarded clock tracking up to
 * baud/10 (limited by the skew between the clock and data paths) [practice].
 */
export function defaultTrackingBandwidth(scheme: ClockingScheme, baud_Hz: number): number {
  if (!(Number.isFinite(baud_Hz) && baud_Hz > 0))
    throw new RangeError(`baud_Hz must be a finite number > 0, got ${baud_Hz}`);
  if (scheme === "recovered") return baud_Hz / 1667;
  if (scheme === "forwarded") return baud_Hz / 10;
  throw new RangeError(`scheme must be one of ${CLOCKING_SCHEMES.join(", ")}, got ${String(scheme)}`);
}

/**
 * Jitter at the sampler. Both schemes follow the data's jitter through a first-order tracking
 * response `H(f) = 1/(1 + j·f/B)`: a forwarded clock carries the transmitter's (correlated) jitter
 * along, and the receiver's clock path passes it up to its tracking bandwidth `B`; a recovered clock
 * (CDR) follows the data inside its loop bandwidth `B`. What the sampler sees is the difference,
 * `|1 − H(f)|² = (f/B)² / (1 + (f/B)²)`:
 *
 * - RJ, taken as white up to Nyquist `fN = baud/2`: `rj·√(1 − (B/fN)·atan(fN/B))`;
 * - periodic DJ at `djFreq_Hz`: `dj·(f/B)/√(1 + (f/B)²)`;
 * - data-dependent DJ (no `djFreq_Hz`): untouched.
 *
 * @param jitter - the link's jitter in UI (undefined: none).
 * @param scheme - "forwarded" or "recovered".
 * @param bandwidth_Hz - tracking bandwidth in Hz (> 0; default {@link defaultTrackingBandwidth}).
 * @param baud_Hz - symbol rate in Hz (> 0).
 * @see F. M. Gardner, *Phaselock Techniques*, 3rd ed., Wiley 2005 — the error transfer 1 − H(f)
 *   of a tracking loop [memory: recalled, not re-read].
 */
export function samplerJitter(
  jitter: LinkJitter | undefined,
  scheme: ClockingScheme,
  bandwidth_Hz: number | undefined,
  baud_Hz: number,
): SamplerJitter {
  const B = bandwidth_Hz ?? defaultTrackingBandwidth(scheme, baud_Hz);
  if (!CLOCKING_SCHEMES.includes(scheme)) {
    throw new RangeError(`scheme must be one of ${CLOCKING_SCHEMES.join(", ")}, got ${String(scheme)}`);
  }
  if (!(Number.isFinite(B) && B > 0))
    throw new RangeError(`bandwidth_Hz must be a finite number > 0, got ${String(B)}`);
  if (!(Number.isFinite(baud_Hz) && baud_Hz > 0))
    throw new RangeError(`baud_Hz must be a finite number > 0, got ${baud_Hz}`);
  const fN = baud_Hz / 2;
  const rjFactor = Math.sqrt(Math.max(0, 1 - (B / fN) * Math.atan(fN / B)));
  let djFactor = 1;
  if (jitter?.djFreq_Hz !== undefined) {
    if (!(Number.isFinite(jitter.djFreq_Hz) && jitter.djFreq_Hz > 0)) {
      throw new RangeError(`jitter.djFreq_Hz must be a finite number > 0, got ${String(jitter.djFreq_Hz)}`);
    }
    const x = jitter.djFreq_Hz / B;
    djFactor = x / Math.sqrt(1 + x * x);
  }
  if (jitter !== undefined) assertJitter(jitter);
  return {
    rjRms_UI: (jitter?.rjRms_UI ?? 0) * rjFactor,
    djPp_UI: (jitter?.djPp_UI ?? 0) * djFactor,
    scheme,
    bandwidth_Hz: B,
    rjFactor,
    djFactor,
  };
}
