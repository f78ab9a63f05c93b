// The area of a pulse response, which equals the channel's DC gain times the UI.
import type { Pulse } from "../types.ts";
import { assertPulse } from "./assertPulse.ts";

/**
 * `Σ values_V · dt` in volt-seconds, with `dt = ui_s / samplesPerUi`. For a pulse response this
 * equals `H(0)·ui_s`, the channel's DC gain times the UI.
 */
export function pulseArea(pulse: Pulse): number {
  assertPulse(pulse);
  let s = 0;
  for (let i = 0; i < pulse.values_V.length; i++) s += pulse.values_V[i];
  return (s * pulse.ui_s) / pulse.samplesPerUi;
}
