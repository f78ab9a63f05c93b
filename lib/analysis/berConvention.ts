// Tapwright's one BER convention: the target is a bit error ratio, and every eye figure (height,
// width, bathtub, contours, headroom, verdict) converts between it and a level's conditional tail
// the same way.
import type { Modulation } from "../types.ts";

/**
 * The bit error ratio caused at a decision threshold per unit of conditional tail probability:
 * `BER = f · Σ_levels P(the level's sample falls across the threshold | level)` over the two levels
 * the threshold separates, symbols equiprobable and independent.
 *
 * - NRZ: a symbol is a bit and each level is sent half the time, so `f = ½` (the average of the two
 *   levels' conditional error probabilities).
 * - PAM4 with Gray coding: each level is sent a quarter of the time, an error to the adjacent level
 *   flips one of the symbol's two bits, so `f = ¼ · ½ = ⅛` (BER ≈ SER/2, adjacent-level errors
 *   only).
 *
 * @param modulation - "nrz" or "pam4".
 * @see J. G. Proakis, *Digital Communications* — Gray-coded PAM, bit error probability ≈ symbol
 *   error probability / log2 M for adjacent-symbol errors [memory: recalled, not re-read].
 */
export function berPerLevelTail(modulation: Modulation): number {
  if (modulation === "nrz") return 0.5;
  if (modulation === "pam4") return 0.125;
  throw new RangeError(`modulation must be "nrz" or "pam4", got ${String(modulation)}`);
}

/**
 * The conditional tail one eye edge carries at a target bit error ratio: at the edge only the level
 * on that side errs, so its tail is `ber / f` ({@link berPerLevelTail}): `2·ber` for NRZ, `8·ber`
 * for PAM4. The eye height at `ber` is the distance between the two edges where the levels'
 * conditional tails reach it.
 *
 * @param modulation - "nrz" or "pam4".
 * @param ber - target bit error ratio, 0 < ber and `ber / f < 0.5`.
 */
export function edgeTail(modulation: Modulation, ber: number): number {
  const tail = ber / berPerLevelTail(modulation);
  if (!(Number.isFinite(ber) && ber > 0 && tail < 0.5)) {
    throw new RangeError(
      `ber must be a number in (0, ${0.5 * berPerLevelTail(modulation)}) for ${modulation}, got ${String(ber)}`,
    );
  }
  return tail;
}
