// A small Touchstone writer: used to generate demo channel files and by round-trip tests.
import type { NetworkData } from "./networkData.ts";

/** Layout choices of {@link formatTouchstone}. */
export interface TouchstoneWriteOptions {
  /** File version: 1 (default) or 2. */
  readonly version?: 1 | 2;
  /** Data format (default `"RI"`). */
  readonly format?: "RI" | "MA" | "DB";
  /** Frequency unit (default `"GHz"`). */
  readonly unit?: "Hz" | "kHz" | "MHz" | "GHz";
  /** Version 2 two-port order (default `"12_21"`); version 1 always writes `21_12`. */
  readonly twoPortOrder?: "12_21" | "21_12";
  /** Comment lines written at the top, each prefixed with `!`. */
  readonly comments?: readonly string[];
}

const SCALE = { Hz: 1, kHz: 1e3, MHz: 1e6, GHz: 1e9 } as const;

/**
 * Touchstone text for `net` (full matrices). Version 1 writes 2-ports as `f N11 N21 N12 N22`
 * and larger networks one matrix row per line, wrapping at four pairs; version 2 adds the
 * keywords `[Version] 2.0`, `[Number of Ports]`, `[Two-Port Data Order]`, `[Number of Frequencies]`,
 * `[Reference]`, `[Network Data]` and `[End]`. Numbers are written in their shortest exact form.
 *
 * @see IBIS Open Forum, *Touchstone File Format Specification*, version 2.0.
 */
export function formatTouchstone(net: NetworkData, options: TouchstoneWriteOptions = {}): string {
  const version = options.version ?? 1;
  const format = options.format ?? "RI";
  const unit = options.unit ?? "GHz";
  const order = version === 1 ? "21_12" : (options.twoPortOrder ?? "12_21");
  const n = net.ports;
  if (!Number.isInteger(n) || n < 1) throw new RangeError(`net.ports must be an integer ≥ 1, got ${String(n)}`);
  const count = net.freqs_Hz.length;
  if (net.s.length !== count * n * n * 2) throw new RangeError(`net.s must hold ${count * n * n * 2} numbers`);
  const r0 = net.referenceOhms[0];
  const out: string[] = [];
  for (const c of options.comments ?? []) out.push(`! ${c.replace(/[\r\n]+/g, " ")}`);
  if (version === 2) out.push("[Version] 2.0");
  out.push(`# ${unit} S ${format} R ${r0}`);
  if (version === 2) {
    out.push(`[Number of Ports] ${n}`);
    if (n === 2) out.push(`[Two-Port Data Order] ${order}`);
    out.push(`[Number of Frequencies] ${count}`);
    out.push(`[Reference] ${Array.from(net.referenceOhms).join(" ")}`);
    out.push("[Network Data]");
  }
  const pair = (f: number, row: number, col: number): string => {
    const at = 2 * ((f * n + row) * n + col);
    const re = net.s[at];
    const im = net.s[at + 1];
    if (format === "RI") return `${re} ${im}`;
    const mag = Math.hypot(re, im);
    const deg = (Math.atan2(im, re) * 180) / Math.PI;
    return format === "MA" ? `${mag} ${deg}` : `${20 * Math.log10(mag)} ${deg}`;
  };
  for (let f = 0; f < count; f++) {
    const freq = `${net.freqs_Hz[f] / SCALE[unit]}`;
    if (n === 2) {
      const cells: [number, number][] =
        order === "21_12"
          ? [
              [0, 0],
              [1, 0],
              [0, 1],
              [1, 1],
            ]
          : [
              [0, 0],
              [0, 1],
              [1, 0],
              [1, 1],
            ];
      out.push([freq, ...cells.map(([r, c]) => pair(f, r, c))].join(" "));
      continue;
    }
    for (let row = 0; row < n; row++) {
      for (let c0 = 0; c0 < n; c0 += 4) {
        const chunk: string[] = [];
        for (let col = c0; col < Math.min(n, c0 + 4); col++) chunk.push(pair(f, row, col));
        out.push((row === 0 && c0 === 0 ? `${freq} ` : "  ") + chunk.join(" "));
      }
    }
  }
  if (version === 2) out.push("[End]");
  return `${out.join("\n")}\n`;
}
