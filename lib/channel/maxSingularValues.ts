// Passivity of an S-parameter network: the largest singular value of S at each frequency.
import { SingularValueDecomposition } from "ml-matrix";
import { complexEmbedding } from "./complexEmbedding.ts";
import type { NetworkData } from "./networkData.ts";

/**
 * Largest singular value of S at each frequency (the network's largest power gain for any incident
 * waves): a passive network has at most 1 everywhere. Computed on the real embedding
 * `[[Re, −Im], [Im, Re]]`, whose singular values are those of S, each twice.
 *
 * @param net - S-parameters (N ports, F frequencies).
 * @returns F values, ≥ 0.
 * @see Pozar, *Microwave Engineering*, ch. 4 (a lossless network has a unitary S; a passive one has
 *   `I − SᴴS` positive semidefinite, i.e. every singular value ≤ 1).
 */
export function maxSingularValues(net: NetworkData): Float64Array {
  const count = net.freqs_Hz.length;
  const out = new Float64Array(count);
  for (let f = 0; f < count; f++) {
    const svd = new SingularValueDecomposition(complexEmbedding(net.s, net.ports, f), {
      computeLeftSingularVectors: false,
      computeRightSingularVectors: false,
      autoTranspose: true,
    });
    out[f] = Math.max(...svd.diagonal);
  }
  return out;
}
