// Shared argument check for FIR tap vectors (transmit FIR and receive FFE).

/**
 * Throws RangeError naming `name` unless `taps` is a non-empty array of finite numbers and
 * `pre` an integer index into it (the main tap is `taps[pre]`).
 */
export function checkTaps(taps: ArrayLike<number>, pre: number, name = "taps"): void {
  if (taps === null || typeof taps !== "object" || typeof taps.length !== "number" || taps.length === 0) {
    throw new RangeError(`${name} must be a non-empty array of numbers`);
  }
  for (let j = 0; j < taps.length; j++) {
    if (typeof taps[j] !== "number" || !Number.isFinite(taps[j])) {
      throw new RangeError(`${name}[${j}] must be a finite number, got ${String(taps[j])}`);
    }
  }
  if (!Number.isInteger(pre) || pre < 0 || pre >= taps.length) {
    throw new RangeError(`pre must be an integer 0…${taps.length - 1} (the main tap's index), got ${String(pre)}`);
  }
}
