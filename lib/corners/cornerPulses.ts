// A channel's pulse at each loss corner, rebuilt from what the channel was made of: its loss model,
// its Touchstone S21 (or SDD21), or — for a sampled response — its pulse's spectrum.
import { type LossModel, pulseFromLossModel } from "../channel/lossModel.ts";
import { parseTouchstone } from "../channel/parseTouchstone.ts";
import { pulseFromS21 } from "../channel/pulseFromS21.ts";
import { renormalizeNetwork } from "../channel/renormalizeNetwork.ts";
import type { PulseGrid } from "../channel/pulseFromSamples.ts";
import { channelTransfer, type PortPairs } from "../channel/sdd21.ts";
import type { Pulse } from "../types.ts";
import { lossScaledPulse } from "./lossScaledPulse.ts";
import { lossScaledS21 } from "./lossScaledS21.ts";

/** Where a channel's pulse comes from, as far as its loss corners are concerned. */
export type CornerSource =
  /** A synthetic line: the corner scales its loss at Nyquist (both the skin and the dielectric term). */
  | { readonly kind: "loss-model"; readonly model: LossModel; readonly grid: PulseGrid }
  /** A Touchstone file: the corner scales the loss of its S21 (2-port) or SDD21 (`pairs`, 4-port). */
  | {
      readonly kind: "touchstone";
      readonly text: string;
      readonly ports?: number;
      readonly pairs?: PortPairs;
      readonly grid: PulseGrid;
    }
  /** A sampled pulse, step or impulse response: the corner scales the loss read off the pulse. */
  | { readonly kind: "pulse"; readonly pulse: Pulse };

/** Largest loss at Nyquist the loss model takes, dB. */
const MAX_MODEL_LOSS_dB = 100;

/**
 * The channel's pulse for a 1 V symbol at each loss factor (the insertion loss in dB times the
 * factor at every frequency): a loss model is rebuilt with its loss at Nyquist scaled (exact, as both
 * its terms are linear in it); a Touchstone channel is rebuilt from its S21 scaled by
 * {@link lossScaledS21}; a sampled response by {@link lossScaledPulse}. The file is parsed once and
 * equal factors are built once.
 *
 * @param source - what the channel was made of, with the pulse grid it was built on.
 * @param lossScales - the factors (> 0), one pulse each, in that order.
 * @throws RangeError when a factor is out of range or takes the loss model beyond 100 dB.
 */
export function cornerPulses(source: CornerSource, lossScales: readonly number[]): Pulse[] {
  for (const [i, s] of lossScales.entries()) {
    if (!(s > 0) || !Number.isFinite(s))
      throw new RangeError(`lossScales[${i}] must be a finite number > 0, got ${String(s)}`);
  }
  const built = new Map<number, Pulse>();
  let build: (s: number) => Pulse;
  if (source.kind === "loss-model") {
    build = (s) => {
      const loss = source.model.lossAtNyquist_dB * s;
      if (loss > MAX_MODEL_LOSS_dB) {
        throw new RangeError(
          `lossScale ${s} takes the loss at Nyquist to ${loss.toFixed(1)} dB, beyond the model's ${MAX_MODEL_LOSS_dB} dB`,
        );
      }
      return pulseFromLossModel({ ...source.model, lossAtNyquist_dB: loss }, source.grid).pulse;
    };
  } else if (source.kind === "touchstone") {
    const net = renormalizeNetwork(parseTouchstone(source.text, { ports: source.ports }));
    const transfer = channelTransfer(net, source.pairs);
    build = (s) => pulseFromS21(net.freqs_Hz, lossScaledS21(net.freqs_Hz, transfer, s), source.grid).pulse;
  } else {
    build = (s) => lossScaledPulse(source.pulse, s);
  }
  return lossScales.map((s) => {
    let p = built.get(s);
    if (p === undefined) {
      p = build(s);
      built.set(s, p);
    }
    return p;
  });
}
