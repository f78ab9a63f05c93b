// Strict decimal number parsing for file readers: refuses NaN, Infinity, hex and empty text.

const DECIMAL = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

/**
 * The value of a plain decimal token (`-1.5`, `.5`, `2e-12`), or `null` for anything else
 * (`NaN`, `Infinity`, `0x10`, `1,5`, empty) and for values that overflow to ±Infinity.
 */
export function parseDecimal(token: string): number | null {
  if (!DECIMAL.test(token)) return null;
  const v = Number(token);
  return Number.isFinite(v) ? v : null;
}
