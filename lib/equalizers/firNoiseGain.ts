// Noise power gain of a receive FFE for white noise sampled at the symbol rate.
import { checkTaps } from "./checkTaps.ts";

/**
 * `Σ c[j]²`: the factor by which a symbol-spaced receive FFE multiplies the variance of white
 * noise at its input (a transmit FIR does not see receiver noise).
 */
export function firNoiseGain(taps: ArrayLike<number>): number {
  checkTaps(taps, 0);
  let s = 0;
  for (let j = 0; j < taps.length; j++) s += taps[j] * taps[j];
  return s;
}
