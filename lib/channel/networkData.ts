// Network parameters read from a Touchstone file: frequencies and an S-matrix per frequency.
import type { ComplexArray } from "../signal/fftPlan.ts";

/** S-parameters of an N-port over frequency. */
export interface NetworkData {
  /** Number of ports N. */
  readonly ports: number;
  /** Frequencies in Hz, ascending. */
  readonly freqs_Hz: Float64Array;
  /**
   * S-matrices, real and imaginary parts interleaved: `S[f][row][col]` (0-based) is at
   * `2·((f·N + row)·N + col)` (real) and the next index (imaginary).
   */
  readonly s: Float64Array;
  /** Reference impedance per port in ohms. */
  readonly referenceOhms: Float64Array;
}

/**
 * `S[outPort][inPort]` over frequency, ports numbered from 1 (S21 is `sParameter(net, 2, 1)`).
 */
export function sParameter(net: NetworkData, outPort: number, inPort: number): ComplexArray {
  const n = net.ports;
  for (const [name, p] of [
    ["outPort", outPort],
    ["inPort", inPort],
  ] as const) {
    if (!Number.isInteger(p) || p < 1 || p > n) throw new RangeError(`${name} must be a port 1…${n}, got ${String(p)}`);
  }
  const count = net.freqs_Hz.length;
  const re = new Float64Array(count);
  const im = new Float64Array(count);
  for (let f = 0; f < count; f++) {
    const at = 2 * ((f * n + (outPort - 1)) * n + (inPort - 1));
    re[f] = net.s[at];
    im[f] = net.s[at + 1];
  }
  return { re, im };
}
