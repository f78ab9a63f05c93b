// An invented backplane lane as a Touchstone file: the synthetic loss model's line on both wires
// of a differential pair (ports 1/2 in, 3/4 out), with small reflections and a weak coupling
// between the wires. Written with the engine's Touchstone writer; used by the demo seed and tests.
import { formatTouchstone, lossModelS21, type LossModel, type NetworkData } from "@lib/channel";

export interface BackplaneFileOptions {
  /** The line (loss at Nyquist, delay, skin share). */
  model: LossModel;
  /** Nyquist frequency in Hz at which the model's loss is stated. */
  nyquist_Hz: number;
  /** Frequency grid: `step_Hz, 2·step_Hz, …, stop_Hz`. */
  step_Hz: number;
  stop_Hz: number;
  /** Return loss of every port as a reflection magnitude (default 0.05, about −26 dB). */
  reflection?: number;
  /** Coupling from one wire to the other as a fraction of the thru (default 0.02). */
  coupling?: number;
  /** 2 for a single-ended 2-port (S21 = the line), 4 for the differential 4-port (default). */
  ports?: 2 | 4;
  comments?: string[];
}

/**
 * Touchstone text for the lane. 4-port: S31 = S42 = H, S32 = S41 = k·H, Sii = r, reciprocal
 * (S13 = S31, …), so SDD21 with pairs (1,2) → (3,4) is (1 − k)·H; k is `coupling` and r is
 * `reflection` wherever the line's loss leaves room for them in a passive file (each column's
 * magnitudes summing to at most 1), less at the lowest frequencies.
 */
export function backplaneTouchstone(o: BackplaneFileOptions): string {
  const count = Math.floor(o.stop_Hz / o.step_Hz + 1e-9);
  const freqs_Hz = Float64Array.from({ length: count }, (_, k) => (k + 1) * o.step_Hz);
  const h = lossModelS21(freqs_Hz, o.model, o.nyquist_Hz);
  const n = o.ports ?? 4;
  const refl = o.reflection ?? 0.05;
  const coupling = o.coupling ?? 0.02;
  const s = new Float64Array(count * n * n * 2);
  const put = (f: number, row: number, col: number, re: number, im: number) => {
    const at = 2 * ((f * n + (row - 1)) * n + (col - 1));
    s[at] = re;
    s[at + 1] = im;
  };
  for (let f = 0; f < count; f++) {
    const [re, im] = [h.re[f], h.im[f]];
    // Passive by construction: every column's magnitudes sum to at most 1 (so no singular value of
    // the symmetric S exceeds 1); where the line is nearly lossless, coupling and reflection shrink.
    const mag = Math.hypot(re, im);
    const kc = n === 2 ? 0 : Math.min(coupling, Math.max(0, (1 - mag) / mag));
    const r = Math.min(refl, Math.max(0, 1 - mag * (1 + kc)));
    for (let p = 1; p <= n; p++) put(f, p, p, r, 0);
    if (n === 2) {
      put(f, 2, 1, re, im);
      put(f, 1, 2, re, im);
      continue;
    }
    for (const [a, b, k] of [
      [3, 1, 1],
      [4, 2, 1],
      [3, 2, kc],
      [4, 1, kc],
    ] as const) {
      put(f, a, b, k * re, k * im);
      put(f, b, a, k * re, k * im);
    }
  }
  const net: NetworkData = { ports: n, freqs_Hz, s, referenceOhms: new Float64Array(n).fill(50) };
  return formatTouchstone(net, { version: n === 4 ? 2 : 1, format: "RI", unit: "GHz", comments: o.comments });
}
