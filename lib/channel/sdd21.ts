// Differential insertion loss of a single-ended network: mixed-mode SDD21 for any port pairing.
import type { ComplexArray } from "../signal/fftPlan.ts";
import { sParameter, type NetworkData } from "./networkData.ts";

/** Which single-ended ports form the input and output pairs (numbered from 1). */
export interface PortPairs {
  readonly inP: number;
  readonly inN: number;
  readonly outP: number;
  readonly outN: number;
}

/** Default pairing: ports 1/2 in, 3/4 out. */
export const DEFAULT_PORT_PAIRS: PortPairs = { inP: 1, inN: 2, outP: 3, outN: 4 };

/**
 * `SDD21 = ½(S[outP][inP] − S[outP][inN] − S[outN][inP] + S[outN][inN])` over frequency.
 *
 * @param net - a network of at least 4 ports.
 * @param pairs - four distinct ports (default {@link DEFAULT_PORT_PAIRS}).
 * @see Bockelman & Eisenstadt, "Combined differential and common-mode scattering parameters",
 *   IEEE Trans. Microwave Theory Tech. 43(7), 1995.
 */
export function sdd21(net: NetworkData, pairs: PortPairs = DEFAULT_PORT_PAIRS): ComplexArray {
  if (net.ports < 4) throw new RangeError(`net must have at least 4 ports for SDD21, it has ${net.ports}`);
  const ids = [pairs.inP, pairs.inN, pairs.outP, pairs.outN];
  for (const [name, p] of Object.entries(pairs)) {
    if (!Number.isInteger(p) || p < 1 || p > net.ports)
      throw new RangeError(`pairs.${name} must be a port 1…${net.ports}, got ${String(p)}`);
  }
  if (new Set(ids).size !== 4) throw new RangeError("pairs must name four different ports");
  const a = sParameter(net, pairs.outP, pairs.inP);
  const b = sParameter(net, pairs.outP, pairs.inN);
  const c = sParameter(net, pairs.outN, pairs.inP);
  const d = sParameter(net, pairs.outN, pairs.inN);
  const re = new Float64Array(a.re.length);
  const im = new Float64Array(a.re.length);
  for (let i = 0; i < re.length; i++) {
    re[i] = 0.5 * (a.re[i] - b.re[i] - c.re[i] + d.re[i]);
    im[i] = 0.5 * (a.im[i] - b.im[i] - c.im[i] + d.im[i]);
  }
  return { re, im };
}

/**
 * The channel's transfer function: S21 of a 2-port, SDD21 (with `pairs`) of a network of 4 or more ports.
 */
export function channelTransfer(net: NetworkData, pairs?: PortPairs): ComplexArray {
  if (net.ports === 2) return sParameter(net, 2, 1);
  if (net.ports >= 4) return sdd21(net, pairs);
  throw new RangeError(`a channel needs a 2-port or a 4-port (or larger) network, this one has ${net.ports} port(s)`);
}
