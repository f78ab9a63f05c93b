// The register map firmware writes equalizer settings through: per field a bit width, signedness, an
// LSB in physical units and a range; values become codes and codes become values.

/** Physical units of a field: FIR/FFE taps as a fraction of the peak swing, CTLE gains in dB, DFE taps in volts. */
export const fieldUnits = ["fraction", "dB", "V"] as const;

/** Physical unit of a field (one of {@link fieldUnits}). */
export type FieldUnit = (typeof fieldUnits)[number];

/**
 * One register field. `parameter` names the equalizer quantity it holds: `tx[k]` (transmit FIR tap at
 * offset k from the main tap, k < 0 for pre-cursor taps), `ctle.gDc_dB`, `ctle.gDc2_dB`, `dfe[n]`
 * (n = 1, 2, …) or `ffe[k]` (receive FFE tap at offset k).
 */
export interface RegisterField {
  /** C identifier of the field. */
  readonly name: string;
  readonly parameter: string;
  /** Width in bits (1 … 32). */
  readonly bits: number;
  /** Two's complement when true, else unsigned. */
  readonly signed: boolean;
  /** Value of one code step in the field's unit (> 0). */
  readonly lsb: number;
  readonly unit: FieldUnit;
  /** Physical range the field may hold, in its unit. */
  readonly min: number;
  readonly max: number;
}

/** Pattern of a field's `parameter`. */
export const PARAMETER_PATTERN = /^(tx\[-?\d+\]|ctle\.gDc_dB|ctle\.gDc2_dB|dfe\[\d+\]|ffe\[-?\d+\])$/;

/**
 * Codes a field may hold: the representable codes of its width and signedness that decode inside
 * its physical range, `[lo, hi]`.
 * @throws RangeError naming the field when no code lies inside its range.
 */
export function codeRange(field: RegisterField): { lo: number; hi: number } {
  assertField(field);
  const repLo = field.signed ? -(2 ** (field.bits - 1)) : 0;
  const repHi = field.signed ? 2 ** (field.bits - 1) - 1 : 2 ** field.bits - 1;
  const lo = Math.max(repLo, Math.ceil(field.min / field.lsb - 1e-9));
  const hi = Math.min(repHi, Math.floor(field.max / field.lsb + 1e-9));
  if (lo > hi) {
    throw new RangeError(
      `field ${field.name}: no ${field.bits}-bit code at LSB ${field.lsb} lies in [${field.min}, ${field.max}]`,
    );
  }
  return { lo, hi };
}

/**
 * Code of a value: `round(value / lsb)`, limited to the field's codes ({@link codeRange}). A value
 * outside the range by more than half an LSB is refused (a setting the hardware cannot hold is a bug
 * upstream, not something to clip silently).
 *
 * @throws RangeError naming the field when the value is not finite or lies outside its range.
 */
export function encodeField(field: RegisterField, value: number): number {
  const { lo, hi } = codeRange(field);
  if (!Number.isFinite(value)) throw new RangeError(`field ${field.name}: value must be finite, got ${value}`);
  const half = field.lsb / 2;
  if (value < lo * field.lsb - half - 1e-12 || value > hi * field.lsb + half + 1e-12) {
    throw new RangeError(
      `field ${field.name}: ${value} ${field.unit} is outside [${lo * field.lsb}, ${hi * field.lsb}]`,
    );
  }
  return Math.min(hi, Math.max(lo, Math.round(value / field.lsb)));
}

/**
 * Value of a code: `code · lsb`.
 * @throws RangeError naming the field when the code is not an integer of the field's codes.
 */
export function decodeField(field: RegisterField, code: number): number {
  const { lo, hi } = codeRange(field);
  if (!Number.isInteger(code) || code < lo || code > hi) {
    throw new RangeError(`field ${field.name}: code ${String(code)} is not an integer ${lo}…${hi}`);
  }
  return code * field.lsb;
}

/**
 * The bit pattern firmware writes: the code in `bits` bits (two's complement for signed fields), as an
 * unsigned integer.
 */
export function codeBits(field: RegisterField, code: number): number {
  decodeField(field, code);
  return code < 0 ? 2 ** field.bits + code : code;
}

/** Checks a field and throws a RangeError naming it and the faulty property. */
export function assertField(field: RegisterField): void {
  if (field === null || typeof field !== "object") throw new TypeError("a register field must be an object");
  const name = typeof field.name === "string" ? field.name : "?";
  if (!/^[A-Za-z_][A-Za-z0-9_]*$/.test(name)) throw new RangeError(`field ${name}: name must be a C identifier`);
  if (typeof field.parameter !== "string" || !PARAMETER_PATTERN.test(field.parameter)) {
    throw new RangeError(
      `field ${name}: parameter must be tx[k], ctle.gDc_dB, ctle.gDc2_dB, dfe[n] or ffe[k], got ${String(field.parameter)}`,
    );
  }
  if (!Number.isInteger(field.bits) || field.bits < 1 || field.bits > 32) {
    throw new RangeError(`field ${name}: bits must be an integer 1…32, got ${String(field.bits)}`);
  }
  if (!(Number.isFinite(field.lsb) && field.lsb > 0))
    throw new RangeError(`field ${name}: lsb must be a finite number > 0`);
  if (!(Number.isFinite(field.min) && Number.isFinite(field.max) && field.min <= field.max)) {
    throw new RangeError(`field ${name}: min and max must be finite with min ≤ max`);
  }
  if (typeof field.signed !== "boolean") throw new RangeError(`field ${name}: signed must be true or false`);
}
