// The inter-symbol interference of one sampling phase as a sum of independent symmetric two-point
// laws: the form every statistical-eye law is built from (and to which other independent sources,
// such as an aggressor's crosstalk cursors, add their own parts).
import type { Modulation } from "../types.ts";

/** The inner PAM4 level of an ideal transmitter (levels −1, −⅓, +⅓, +1). */
export const PAM4_INNER_LEVEL = 1 / 3;

/**
 * Magnitudes `m_i` (volts) of independent two-point laws `±m_i` (½ each) whose sum has the law of the
 * ISI `X = Σ_k a_k·r_k` of independent, equiprobable symbols `a_k`.
 *
 * NRZ (`a = ±1`): one part `|r|` per cursor. PAM4 with levels `±1, ±x` (x = `innerLevel`, ⅓ for an
 * ideal transmitter): the four equiprobable levels are exactly the sums `±(1 + x)/2 ± (1 − x)/2`, so
 * each cursor gives the two parts `|r|·(1 + x)/2` and `|r|·(1 − x)/2` (`2|r|/3` and `|r|/3` at x = ⅓).
 * Zero parts are kept (they change nothing).
 *
 * @param isi - ISI cursors in volts (main cursor excluded; residuals after a DFE).
 * @param modulation - "nrz" or "pam4".
 * @param innerLevel - PAM4 inner level `x` relative to the outer level, 0 < x < 1 (default ⅓).
 * @returns `isi.length` (NRZ) or `2·isi.length` (PAM4) magnitudes, volts.
 */
export function isiParts(isi: Float64Array, modulation: Modulation, innerLevel = PAM4_INNER_LEVEL): Float64Array {
  if (!(isi instanceof Float64Array)) throw new TypeError("isi must be a Float64Array of cursor values in volts");
  if (modulation !== "nrz" && modulation !== "pam4") {
    throw new RangeError(`modulation must be "nrz" or "pam4", got ${String(modulation)}`);
  }
  if (!(innerLevel > 0 && innerLevel < 1))
    throw new RangeError(`innerLevel must be a number in (0, 1), got ${String(innerLevel)}`);
  for (let k = 0; k < isi.length; k++) {
    if (!Number.isFinite(isi[k])) throw new RangeError(`isi[${k}] is not finite (${isi[k]})`);
  }
  if (modulation === "nrz") return Float64Array.from(isi, Math.abs);
  const a = (1 + innerLevel) / 2;
  const b = (1 - innerLevel) / 2;
  const out = new Float64Array(2 * isi.length);
  for (let k = 0; k < isi.length; k++) {
    const r = Math.abs(isi[k]);
    out[2 * k] = a * r;
    out[2 * k + 1] = b * r;
  }
  return out;
}
