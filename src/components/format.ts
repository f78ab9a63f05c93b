// How pages and islands write times and quantities for people (SI values in, text out).

/** A date as people read it here: 2026-12-01 14:05. */
export function formatWhen(value: string | Date): string {
  const d = new Date(value);
  const pad = (n: number) => String(n).padStart(2, "0");
  return `${d.getFullYear()}-${pad(d.getMonth() + 1)}-${pad(d.getDate())} ${pad(d.getHours())}:${pad(d.getMinutes())}`;
}

/** Volts as millivolts, with one decimal unless `digits` says otherwise: 0.0123 → "12.3 mV". */
export function formatMillivolts(value_V: number, digits = 1): string {
  return `${(value_V * 1e3).toFixed(digits)} mV`;
}
