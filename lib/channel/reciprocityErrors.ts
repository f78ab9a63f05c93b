// Reciprocity of an S-parameter network: how far S is from its transpose at each frequency.

import type { NetworkData } from "./networkData.ts";

/**
 * `max over i, j of |Sᵢⱼ − Sⱼᵢ|` at each frequency: 0 for a reciprocal network (passive circuits of
 * resistors, capacitors, inductors and lines are; ferrites and active parts are not).
 *
 * @param net - S-parameters (N ports, F frequencies).
 * @returns F values, ≥ 0.
 * @see Pozar, *Microwave Engineering*, ch. 4 (reciprocal networks have a symmetric S).
 */
export function reciprocityErrors(net: NetworkData): Float64Array {
  const n = net.ports;
  const count = net.freqs_Hz.length;
  const out = new Float64Array(count);
  for (let f = 0; f < count; f++) {
    let worst = 0;
    for (let r = 0; r < n; r++) {
      for (let c = r + 1; c < n; c++) {
        const a = 2 * ((f * n + r) * n + c);
        const b = 2 * ((f * n + c) * n + r);
        worst = Math.max(worst, Math.hypot(net.s[a] - net.s[b], net.s[a + 1] - net.s[b + 1]));
      }
    }
    out[f] = worst;
  }
  return out;
}
