// The differential-mode network of a single-ended multi-port: one port per pair of wires.
import type { NetworkData } from "./networkData.ts";

/** One differential pair: its positive and negative single-ended ports (numbered from 1). */
export interface PortPair {
  readonly p: number;
  readonly n: number;
}

/**
 * Differential-mode S-parameters `Sdd` of the given pairs: a network with one port per pair, where
 * `Sdd[i][j] = ½(S[p_i][p_j] − S[p_i][n_j] − S[n_i][p_j] + S[n_i][n_j])` and each port's reference is
 * the sum of its pair's references (100 Ω from two 50 Ω ports). SDD21 of a channel and the
 * mixed-mode crosstalk of one pair into another are entries of it.
 *
 * @param net - a single-ended network.
 * @param pairs - the pairs, each two different ports, no port in two pairs.
 * @see Bockelman & Eisenstadt, "Combined differential and common-mode scattering parameters",
 *   IEEE Trans. Microwave Theory Tech. 43(7), 1995.
 */
export function differentialNetwork(net: NetworkData, pairs: readonly PortPair[]): NetworkData {
  if (!Array.isArray(pairs) || pairs.length === 0) throw new RangeError("pairs must hold at least one pair");
  const used = new Set<number>();
  pairs.forEach((pair, i) => {
    for (const [key, q] of [
      ["p", pair.p],
      ["n", pair.n],
    ] as const) {
      if (!Number.isInteger(q) || q < 1 || q > net.ports)
        throw new RangeError(`pairs[${i}].${key} must be a port 1…${net.ports}, got ${String(q)}`);
    }
    for (const q of [pair.p, pair.n]) {
      if (used.has(q)) throw new RangeError(`port ${q} appears in more than one pair (pairs[${i}])`);
      used.add(q);
    }
  });
  const n = net.ports;
  const K = pairs.length;
  const count = net.freqs_Hz.length;
  const s = new Float64Array(2 * count * K * K);
  const at = (f: number, row: number, col: number) => 2 * ((f * n + row - 1) * n + col - 1);
  for (let f = 0; f < count; f++) {
    for (let i = 0; i < K; i++) {
      for (let j = 0; j < K; j++) {
        const a = at(f, pairs[i].p, pairs[j].p);
        const b = at(f, pairs[i].p, pairs[j].n);
        const c = at(f, pairs[i].n, pairs[j].p);
        const d = at(f, pairs[i].n, pairs[j].n);
        const o = 2 * ((f * K + i) * K + j);
        s[o] = 0.5 * (net.s[a] - net.s[b] - net.s[c] + net.s[d]);
        s[o + 1] = 0.5 * (net.s[a + 1] - net.s[b + 1] - net.s[c + 1] + net.s[d + 1]);
      }
    }
  }
  const referenceOhms = Float64Array.from(
    pairs,
    (pair) => net.referenceOhms[pair.p - 1] + net.referenceOhms[pair.n - 1],
  );
  return { ports: K, freqs_Hz: Float64Array.from(net.freqs_Hz), s, referenceOhms };
}
