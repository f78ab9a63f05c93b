// Entry-point check of a Pulse: every engine function that takes one validates it the same way.
import type { Pulse } from "../types.ts";

/**
 * Throws TypeError/RangeError naming `name` unless `pulse` is a well-formed {@link Pulse}:
 * finite `ui_s > 0`, integer `samplesPerUi ≥ 1`, a non-empty Float64Array of finite values,
 * and an integer `mainIndex` inside it.
 *
 * @param pulse - the value to check.
 * @param name - the parameter name used in messages.
 */
export function assertPulse(pulse: Pulse, name = "pulse"): void {
  if (pulse === null || typeof pulse !== "object") {
    throw new TypeError(`${name} must be a pulse object`);
  }
  if (!(typeof pulse.ui_s === "number" && Number.isFinite(pulse.ui_s) && pulse.ui_s > 0)) {
    throw new RangeError(`${name}.ui_s must be a finite number > 0, got ${String(pulse.ui_s)}`);
  }
  if (!Number.isInteger(pulse.samplesPerUi) || pulse.samplesPerUi < 1) {
    throw new RangeError(`${name}.samplesPerUi must be an integer ≥ 1, got ${String(pulse.samplesPerUi)}`);
  }
  if (!(pulse.values_V instanceof Float64Array)) {
    throw new TypeError(`${name}.values_V must be a Float64Array`);
  }
  if (pulse.values_V.length === 0) {
    throw new RangeError(`${name}.values_V must not be empty`);
  }
  for (let i = 0; i < pulse.values_V.length; i++) {
    if (!Number.isFinite(pulse.values_V[i])) {
      throw new RangeError(`${name}.values_V[${i}] is not finite (${pulse.values_V[i]})`);
    }
  }
  if (!Number.isInteger(pulse.mainIndex) || pulse.mainIndex < 0 || pulse.mainIndex >= pulse.values_V.length) {
    throw new RangeError(
      `${name}.mainIndex must be an integer 0…${pulse.values_V.length - 1}, got ${String(pulse.mainIndex)}`,
    );
  }
}
