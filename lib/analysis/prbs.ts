// Pseudo-random binary sequences from linear feedback recurrences (ITU-T O.150 and PAM4 test patterns).

/** Orders with a built-in polynomial. */
export type PrbsOrder = 7 | 9 | 11 | 13 | 15 | 23 | 31;

/**
 * Feedback taps per order: the exponents of the polynomial other than 0. For
 * `x^a + x^b + 1` the taps are `[a, b]`, and the bits obey `b[n] = b[n−a] XOR b[n−b]`.
 * Orders 7, 9, 11, 15, 23 and 31 are the ITU-T O.150 polynomials; order 13 is
 * `x^13 + x^12 + x^2 + x + 1`, the PRBS13 used for PAM4 test patterns, with the same
 * convention `b[n] = b[n−13] ⊕ b[n−12] ⊕ b[n−2] ⊕ b[n−1]`.
 */
export const PRBS_TAPS: Readonly<Record<PrbsOrder, readonly number[]>> = {
  7: [7, 6],
  9: [9, 5],
  11: [11, 9],
  13: [13, 12, 2, 1],
  15: [15, 14],
  23: [23, 18],
  31: [31, 28],
};

/** Largest sequence length accepted, to keep a single allocation reasonable (2^28 bits). */
export const PRBS_MAX_LENGTH = 2 ** 28;

/**
 * Bits of the sequence with feedback taps `taps` from the all-ones seed:
 * `b[0] … b[a−1] = 1` with `a = max(taps)`, then `b[n] = XOR over t in taps of b[n−t]`.
 *
 * @param taps - feedback exponents, distinct integers ≥ 1 (e.g. `[7, 6]` for x^7 + x^6 + 1).
 * @param length - number of bits, integer 0 … {@link PRBS_MAX_LENGTH}.
 * @param invert - when true, every bit is complemented (the inverted pattern of O.150).
 * @returns fresh array of 0/1 values, starting at `b[0]`.
 * @see ITU-T Recommendation O.150, clause 5 (pseudo-random test patterns).
 */
export function prbsFromTaps(taps: readonly number[], length: number, invert = false): Uint8Array {
  if (!Array.isArray(taps) || taps.length === 0) {
    throw new TypeError("taps must be a non-empty array of integers");
  }
  for (const t of taps) {
    if (!Number.isInteger(t) || t < 1 || t > 64) {
      throw new RangeError(`taps must hold integers 1…64, got ${String(t)}`);
    }
  }
  if (new Set(taps).size !== taps.length) {
    throw new RangeError("taps must be distinct");
  }
  if (!Number.isInteger(length) || length < 0 || length > PRBS_MAX_LENGTH) {
    throw new RangeError(`length must be an integer 0…${PRBS_MAX_LENGTH}, got ${String(length)}`);
  }
  const order = Math.max(...taps);
  const bits = new Uint8Array(length);
  const seed = Math.min(order, length);
  bits.fill(1, 0, seed);
  const k = taps.length;
  const offs = Int32Array.from(taps);
  for (let n = order; n < length; n++) {
    let b = 0;
    for (let i = 0; i < k; i++) b ^= bits[n - offs[i]];
    bits[n] = b;
  }
  if (invert) {
    for (let n = 0; n < length; n++) bits[n] ^= 1;
  }
  return bits;
}

/**
 * Bits of the built-in sequence of the given order (see {@link PRBS_TAPS}), all-ones seed.
 *
 * @param order - 7, 9, 11, 13, 15, 23 or 31.
 * @param length - number of bits.
 * @param invert - complement every bit.
 * @see ITU-T Recommendation O.150 (orders 7 … 31).
 */
export function prbs(order: PrbsOrder, length: number, invert = false): Uint8Array {
  const taps = PRBS_TAPS[order];
  if (taps === undefined) {
    throw new RangeError(`order must be one of ${Object.keys(PRBS_TAPS).join(", ")}, got ${String(order)}`);
  }
  return prbsFromTaps(taps, length, invert);
}

/** Period of a maximal-length sequence of the given order: `2^order − 1`. */
export function prbsPeriod(order: number): number {
  if (!Number.isInteger(order) || order < 1 || order > 52) {
    throw new RangeError(`order must be an integer 1…52, got ${String(order)}`);
  }
  return 2 ** order - 1;
}
