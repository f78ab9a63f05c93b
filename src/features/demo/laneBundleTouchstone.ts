// An invented bundle of backplane lanes as one multi-port Touchstone file: lane 0 (the victim) and
// its neighbours, each a differential pair on the synthetic loss model's line, with near-end and
// far-end coupling between the victim and each neighbour from the engine's coupling model. Used by
// the demo seed and the tests (a lane with its aggressors in one file).
import { formatTouchstone, lossModelS21, type LossModel, type NetworkData } from "@lib/channel";
import { couplingTransfer } from "@lib/crosstalk";

/** The coupling between the victim (lane 0) and one neighbour. */
export interface NeighbourCoupling {
  /** Backward coupling K_b over a section of this one-way loss and delay (NEXT at either end). */
  next: { backwardCoefficient: number; line: LossModel };
  /** Forward coupling K_f·T_D in seconds along a line of this loss and delay (FEXT). */
  fext: { forwardCoupling_s: number; line: LossModel };
}

export interface LaneBundleOptions {
  /** Every lane's line. */
  model: LossModel;
  /** Nyquist frequency in Hz at which the losses are stated. */
  nyquist_Hz: number;
  /** Frequency grid: `step_Hz, 2·step_Hz, …, stop_Hz`. */
  step_Hz: number;
  stop_Hz: number;
  /** Lanes 1, 2, … and their coupling to lane 0 (one to three neighbours: an .s8p, .s12p or .s16p). */
  neighbours: NeighbourCoupling[];
  /** Largest return loss of a port as a reflection magnitude (default 0.05). */
  reflection?: number;
  comments?: string[];
}

/**
 * Touchstone text of `1 + neighbours.length` lanes. With L lanes, lane i's left pair is ports
 * (2i + 1, 2i + 2) and its right pair ports (2L + 2i + 1, 2L + 2i + 2); each lane runs left to right
 * (S[right][left] = the line on both wires). Between lane 0 and neighbour i: NEXT from the coupling
 * model between pairs at the same end (left–left, right–right) and FEXT between opposite ends, on
 * both wires of each pair, so the mixed-mode terms equal the model's transfers. A neighbour driven
 * from the right is then a NEXT aggressor at lane 0's receiver (ports 2L+1, 2L+2), one driven from
 * the left a FEXT aggressor. Every port reflects at most `reflection`, and less where the line and
 * the couplings leave no room: each column's magnitudes sum to at most 1, so the file is passive
 * (its largest singular value is at most 1, by Schur's bound for a symmetric matrix).
 */
export function laneBundleTouchstone(o: LaneBundleOptions): string {
  const lanes = 1 + o.neighbours.length;
  if (lanes < 2 || lanes > 4) throw new RangeError("give one to three neighbours");
  const count = Math.floor(o.stop_Hz / o.step_Hz + 1e-9);
  const freqs_Hz = Float64Array.from({ length: count }, (_, k) => (k + 1) * o.step_Hz);
  const h = lossModelS21(freqs_Hz, o.model, o.nyquist_Hz);
  const xt = o.neighbours.map((nb) => ({
    next: couplingTransfer({ kind: "next", ...nb.next }, freqs_Hz, o.nyquist_Hz),
    fext: couplingTransfer({ kind: "fext", ...nb.fext }, freqs_Hz, o.nyquist_Hz),
  }));
  const n = 4 * lanes;
  const s = new Float64Array(count * n * n * 2);
  const put = (f: number, a: number, b: number, re: number, im: number) => {
    for (const [row, col] of [
      [a, b],
      [b, a],
    ]) {
      const at = 2 * ((f * n + (row - 1)) * n + (col - 1));
      s[at] = re;
      s[at + 1] = im;
    }
  };
  const left = (lane: number, wire: 0 | 1) => 2 * lane + 1 + wire;
  const right = (lane: number, wire: 0 | 1) => 2 * lanes + 2 * lane + 1 + wire;
  const refl = o.reflection ?? 0.05;
  for (let f = 0; f < count; f++) {
    let couplingSum = 0;
    for (const x of xt) couplingSum += Math.hypot(x.next.re[f], x.next.im[f]) + Math.hypot(x.fext.re[f], x.fext.im[f]);
    const room = 1 - Math.hypot(h.re[f], h.im[f]) - couplingSum;
    const r = Math.max(0, Math.min(refl, 0.5 * room));
    for (let p = 1; p <= n; p++) put(f, p, p, r, 0);
    for (let lane = 0; lane < lanes; lane++) {
      for (const w of [0, 1] as const) put(f, right(lane, w), left(lane, w), h.re[f], h.im[f]);
    }
    xt.forEach((x, i) => {
      for (const w of [0, 1] as const) {
        put(f, left(0, w), left(i + 1, w), x.next.re[f], x.next.im[f]);
        put(f, right(0, w), right(i + 1, w), x.next.re[f], x.next.im[f]);
        put(f, right(0, w), left(i + 1, w), x.fext.re[f], x.fext.im[f]);
        put(f, left(0, w), right(i + 1, w), x.fext.re[f], x.fext.im[f]);
      }
    });
  }
  const net: NetworkData = { ports: n, freqs_Hz, s, referenceOhms: new Float64Array(n).fill(50) };
  return formatTouchstone(net, { version: 2, format: "RI", unit: "GHz", comments: o.comments });
}
