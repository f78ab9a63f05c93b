// Decibel conversions for amplitude (voltage) and power ratios.

/** Floor of magnitudes in dB reported for plotting and JSON: an exact zero reads as −400 dB, not −Infinity. */
export const DB_FLOOR = -400;

/** Amplitude ratio for a gain in dB: `10^(gain_dB/20)`. */
export function dbToLinear(gain_dB: number): number {
  if (!Number.isFinite(gain_dB)) throw new RangeError(`gain_dB must be finite, got ${String(gain_dB)}`);
  return 10 ** (gain_dB / 20);
}

/** Gain in dB of an amplitude ratio: `20·log10|ratio|` (−Infinity for 0). */
export function linearToDb(ratio: number): number {
  if (Number.isNaN(ratio)) throw new RangeError("ratio is NaN");
  return 20 * Math.log10(Math.abs(ratio));
}

/** Power ratio for a gain in dB: `10^(gain_dB/10)`. */
export function dbToPowerRatio(gain_dB: number): number {
  if (!Number.isFinite(gain_dB)) throw new RangeError(`gain_dB must be finite, got ${String(gain_dB)}`);
  return 10 ** (gain_dB / 10);
}

/** Gain in dB of a power ratio: `10·log10(ratio)`; `ratio ≥ 0`. */
export function powerRatioToDb(ratio: number): number {
  if (!(ratio >= 0)) throw new RangeError(`ratio must be ≥ 0, got ${String(ratio)}`);
  return 10 * Math.log10(ratio);
}

/**
 * `20·log10|re + i·im|` element-wise: the magnitude in dB of a complex response, floored at
 * {@link DB_FLOOR}.
 */
export function magnitudeDb(re: ArrayLike<number>, im: ArrayLike<number>): Float64Array {
  if (re.length !== im.length) throw new RangeError("re and im must have equal length");
  const out = new Float64Array(re.length);
  for (let i = 0; i < re.length; i++) {
    const p = re[i] * re[i] + im[i] * im[i];
    if (Number.isNaN(p)) throw new RangeError(`re[${i}] or im[${i}] is NaN`);
    out[i] = Math.max(DB_FLOOR, 10 * Math.log10(p));
  }
  return out;
}
