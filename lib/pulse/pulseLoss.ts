// A channel's loss at one frequency read from its pulse response: the pulse is the channel's impulse
// response convolved with a one-UI rectangle, so dividing out the rectangle's spectrum leaves |H(f)|.
import type { Pulse } from "../types.ts";
import { assertPulse } from "./assertPulse.ts";

/**
 * The channel's loss at `freq_Hz` relative to DC, dB: `−20·log10(|P(f)| / (|P(0)|·|R(f)|))` with
 * `P` the sampled pulse's transform (a direct sum over its samples) and `R(f) = sin(πfT)/(S·sin(πfT/S))`
 * the transform of a one-UI rectangle of `S` samples, normalized to 1 at DC (`T` the UI, `S` samples
 * per UI) [practice: the pulse response is the impulse response convolved with the symbol's
 * rectangle].
 *
 * @param pulse - a pulse response whose area (DC gain) is positive.
 * @param freq_Hz - frequency in Hz, 0 ≤ f < 1/UI (the rectangle has a zero at 1/UI).
 */
export function pulseLoss_dB(pulse: Pulse, freq_Hz: number): number {
  assertPulse(pulse);
  if (!(Number.isFinite(freq_Hz) && freq_Hz >= 0 && freq_Hz * pulse.ui_s < 1)) {
    throw new RangeError(`freq_Hz must be a finite number in [0, 1/UI), got ${String(freq_Hz)}`);
  }
  const v = pulse.values_V;
  const w = (2 * Math.PI * freq_Hz * pulse.ui_s) / pulse.samplesPerUi;
  let dc = 0;
  let re = 0;
  let im = 0;
  for (let n = 0; n < v.length; n++) {
    dc += v[n];
    re += v[n] * Math.cos(w * n);
    im -= v[n] * Math.sin(w * n);
  }
  if (!(dc > 0)) throw new RangeError("pulse must have a positive area (DC gain) for a loss relative to DC");
  const x = Math.PI * freq_Hz * pulse.ui_s;
  const rect = x === 0 ? 1 : Math.sin(x) / (pulse.samplesPerUi * Math.sin(x / pulse.samplesPerUi));
  return -20 * Math.log10(Math.hypot(re, im) / (dc * rect));
}
