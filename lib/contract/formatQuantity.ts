// Numbers in messages for people: three significant digits with an SI prefix and the unit.

const PREFIXES: readonly [number, string][] = [
  [1e12, "T"],
  [1e9, "G"],
  [1e6, "M"],
  [1e3, "k"],
  [1, ""],
  [1e-3, "m"],
  [1e-6, "µ"],
  [1e-9, "n"],
  [1e-12, "p"],
  [1e-15, "f"],
];

/**
 * A quantity in SI units as people read it: `formatQuantity(53.125e9, "b/s")` → "53.1 Gb/s",
 * `formatQuantity(3.5714e-11, "s")` → "35.7 ps" (three significant digits, engineering prefix).
 * Non-finite values are written as they are ("NaN s").
 * @param value - the quantity in the unit's SI base (b/s, s, Hz, V).
 * @param unit - the unit's symbol.
 */
export function formatQuantity(value: number, unit: string): string {
  if (!Number.isFinite(value)) return `${value} ${unit}`;
  if (value === 0) return `0 ${unit}`;
  const magnitude = Math.abs(value);
  const [scale, prefix] = PREFIXES.find(([s]) => magnitude >= s * 0.9995) ?? PREFIXES[PREFIXES.length - 1];
  return `${(value / scale).toPrecision(3)} ${prefix}${unit}`;
}
