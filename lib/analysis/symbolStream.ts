// Symbol streams for time-domain eyes: a PRBS or a seeded random sequence, NRZ or Gray-coded PAM4.
import { seededRandom } from "../signal/seededRandom.ts";
import type { Modulation } from "../types.ts";
import { type PrbsOrder, PRBS_TAPS, prbs, prbsPeriod } from "./prbs.ts";

/** Where the symbols come from. */
export type SymbolSource =
  | { readonly kind: "prbs"; readonly order: PrbsOrder; readonly length?: number }
  | { readonly kind: "random"; readonly seed: number; readonly length: number };

/** Longest stream accepted (symbols). */
export const MAX_SYMBOLS = 1 << 20;

/** Gray map of a PAM4 bit pair (first bit most significant): 00 → −1, 01 → −1/3, 11 → +1/3, 10 → +1. */
export function grayPam4(msb: number, lsb: number): number {
  const code = ((msb & 1) << 1) | (lsb & 1);
  return code === 0 ? -1 : code === 1 ? -1 / 3 : code === 3 ? 1 / 3 : 1;
}

/**
 * Symbols of a stream. NRZ maps bit 1 → +1 and 0 → −1. PAM4 takes bits in pairs (first bit most
 * significant) through the Gray map {@link grayPam4}.
 *
 * A PRBS source without `length` gives one full period of symbols: `2^n − 1` for NRZ; for PAM4 two
 * periods of bits, i.e. `2^n − 1` symbols (as PAM4 test patterns such as PRBS13 are built). A random
 * source draws bits from the engine's seeded generator, reproducible from `seed`.
 *
 * @param modulation - "nrz" or "pam4".
 * @param source - PRBS order (O.150 polynomials, PRBS13 for PAM4) or a seed and a length.
 * @returns fresh Float64Array of symbol values.
 * @see ITU-T O.150 (PRBS); Gray coding of PAM4 as in IEEE 802.3 Clause 120 [memory: recalled, not re-read].
 */
export function symbolStream(modulation: Modulation, source: SymbolSource): Float64Array {
  if (modulation !== "nrz" && modulation !== "pam4") {
    throw new RangeError(`modulation must be "nrz" or "pam4", got ${String(modulation)}`);
  }
  if (source === null || typeof source !== "object") throw new TypeError("source must be an object");
  const perSymbol = modulation === "nrz" ? 1 : 2;
  let bits: Uint8Array;
  if (source.kind === "prbs") {
    if (PRBS_TAPS[source.order] === undefined) {
      throw new RangeError(
        `source.order must be one of ${Object.keys(PRBS_TAPS).join(", ")}, got ${String(source.order)}`,
      );
    }
    const period = prbsPeriod(source.order);
    const length = source.length ?? Math.min(period, MAX_SYMBOLS);
    checkLength(length);
    bits = prbs(source.order, length * perSymbol);
  } else if (source.kind === "random") {
    if (!Number.isInteger(source.seed))
      throw new RangeError(`source.seed must be an integer, got ${String(source.seed)}`);
    checkLength(source.length);
    bits = randomBits(source.seed, source.length * perSymbol);
  } else {
    throw new RangeError(`source.kind must be "prbs" or "random", got ${String((source as { kind: unknown }).kind)}`);
  }
  const n = bits.length / perSymbol;
  const out = new Float64Array(n);
  if (modulation === "nrz") for (let i = 0; i < n; i++) out[i] = bits[i] === 1 ? 1 : -1;
  else for (let i = 0; i < n; i++) out[i] = grayPam4(bits[2 * i], bits[2 * i + 1]);
  return out;
}

function checkLength(length: number): void {
  if (!Number.isInteger(length) || length < 1 || length > MAX_SYMBOLS) {
    throw new RangeError(`source.length must be an integer 1…${MAX_SYMBOLS}, got ${String(length)}`);
  }
}

/** Equiprobable bits from the engine's seeded generator. */
function randomBits(seed: number, n: number): Uint8Array {
  const rng = seededRandom(seed);
  const out = new Uint8Array(n);
  for (let i = 0; i < n; i++) out[i] = rng.uniform() < 0.5 ? 0 : 1;
  return out;
}
