// A victim lane and its aggressors chosen among the pairs of one multi-port S-parameter file.
import { differentialNetwork } from "../channel/differentialNetwork.ts";
import type { NetworkData } from "../channel/networkData.ts";
import type { PortPairs } from "../channel/sdd21.ts";
import type { ComplexArray } from "../signal/fftPlan.ts";
import { type AggressorKind, checkAggressorKind } from "./aggressorKind.ts";

/** An aggressor in a multi-port file: the pair its transmitter drives (ports numbered from 1). */
export interface AggressorPorts {
  readonly name?: string;
  readonly kind: AggressorKind;
  /** Positive and negative port of the aggressor's driven pair (at the victim's receiving end for NEXT, at its far end for FEXT). */
  readonly p: number;
  readonly n: number;
}

/** The victim's transfer and each aggressor's crosstalk transfer into the victim's receiving pair. */
export interface CrosstalkTransfers {
  readonly freqs_Hz: Float64Array;
  /** SDD21 of the victim (its input pair to its output pair). */
  readonly victim: ComplexArray;
  readonly aggressors: { readonly name: string; readonly kind: AggressorKind; readonly transfer: ComplexArray }[];
}

/**
 * The victim's SDD21 and, per aggressor, the mixed-mode crosstalk from the aggressor's driven pair to
 * the victim's output pair, taken as for SDD21: `½(S[outP][p] − S[outP][n] − S[outN][p] + S[outN][n])`.
 * A NEXT aggressor's pair sits at the victim's receiving end, a FEXT aggressor's at its transmitting
 * end; the file alone cannot tell which, so the caller says.
 *
 * @param net - a single-ended network of 6 or more ports (8, 12 and 16 are usual: 2, 3 or 4 lanes).
 * @param victim - the victim's pairs (`inP`, `inN` → `outP`, `outN`).
 * @param aggressors - the aggressors' pairs; no port may serve two pairs.
 * @see Bockelman & Eisenstadt, "Combined differential and common-mode scattering parameters",
 *   IEEE Trans. Microwave Theory Tech. 43(7), 1995 (differential-mode terms between any two pairs).
 */
export function crosstalkTransfers(
  net: NetworkData,
  victim: PortPairs,
  aggressors: readonly AggressorPorts[],
): CrosstalkTransfers {
  if (net.ports < 6)
    throw new RangeError(
      `a victim with aggressors needs a file of 6 or more ports (8, 12, 16 …), this one has ${net.ports}`,
    );
  if (!Array.isArray(aggressors)) throw new TypeError("aggressors must be an array");
  aggressors.forEach((a, i) => checkAggressorKind(a.kind, `aggressors[${i}].kind`));
  const pairs = [
    { p: victim.inP, n: victim.inN },
    { p: victim.outP, n: victim.outN },
    ...aggressors.map((a) => ({ p: a.p, n: a.n })),
  ];
  const dd = differentialNetwork(net, pairs);
  const K = dd.ports;
  const entry = (row: number, col: number): ComplexArray => {
    const count = dd.freqs_Hz.length;
    const re = new Float64Array(count);
    const im = new Float64Array(count);
    for (let f = 0; f < count; f++) {
      const o = 2 * ((f * K + row) * K + col);
      re[f] = dd.s[o];
      im[f] = dd.s[o + 1];
    }
    return { re, im };
  };
  return {
    freqs_Hz: dd.freqs_Hz,
    victim: entry(1, 0),
    aggressors: aggressors.map((a, i) => ({
      name: a.name ?? `${a.kind === "next" ? "NEXT" : "FEXT"} ${a.p}/${a.n}`,
      kind: a.kind,
      transfer: entry(1, 2 + i),
    })),
  };
}
