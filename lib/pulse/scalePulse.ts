// Scaling a pulse's amplitude (swing, gain), keeping its timing.
import type { Pulse } from "../types.ts";
import { assertPulse } from "./assertPulse.ts";

/**
 * A fresh pulse with every value multiplied by `factor` (e.g. a transmit swing in volts, or a
 * linear gain). Timing and `mainIndex` are unchanged.
 */
export function scalePulse(pulse: Pulse, factor: number): Pulse {
  assertPulse(pulse);
  if (!Number.isFinite(factor)) {
    throw new RangeError(`factor must be a finite number, got ${String(factor)}`);
  }
  const out = new Float64Array(pulse.values_V.length);
  for (let i = 0; i < out.length; i++) out[i] = pulse.values_V[i] * factor;
  return { ui_s: pulse.ui_s, samplesPerUi: pulse.samplesPerUi, values_V: out, mainIndex: pulse.mainIndex };
}
