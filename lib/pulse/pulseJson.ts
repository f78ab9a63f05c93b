// Conversion between a Pulse (Float64Array inside) and its plain-JSON form used by the API and the CLI.
import type { Pulse } from "../types.ts";
import { assertPulse } from "./assertPulse.ts";

/** A pulse response as plain JSON: `values_V` is an ordinary array of numbers. */
export interface PulseJson {
  ui_s: number;
  samplesPerUi: number;
  values_V: number[];
  mainIndex: number;
}

/**
 * Builds a validated {@link Pulse} from its JSON form (copies the values).
 * @throws RangeError/TypeError naming the faulty field (non-finite value, index out of range…).
 */
export function pulseFromJson(json: PulseJson): Pulse {
  if (json === null || typeof json !== "object" || !Array.isArray(json.values_V)) {
    throw new TypeError("pulse must be an object with a values_V array");
  }
  const pulse: Pulse = {
    ui_s: json.ui_s,
    samplesPerUi: json.samplesPerUi,
    values_V: Float64Array.from(json.values_V),
    mainIndex: json.mainIndex,
  };
  assertPulse(pulse);
  return pulse;
}

/** Plain-JSON form of a {@link Pulse} (a fresh array of its values). */
export function pulseToJson(pulse: Pulse): PulseJson {
  assertPulse(pulse);
  return {
    ui_s: pulse.ui_s,
    samplesPerUi: pulse.samplesPerUi,
    values_V: Array.from(pulse.values_V),
    mainIndex: pulse.mainIndex,
  };
}
