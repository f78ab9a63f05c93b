// One multi-port S-parameter file → the victim's pulse response and each aggressor's crosstalk pulse.
import { parseTouchstone } from "../channel/parseTouchstone.ts";
import { inputQuality, type InputQuality } from "../channel/inputQuality.ts";
import { type FrequencyPulse, pulseFromS21, type S21PulseOptions } from "../channel/pulseFromS21.ts";
import { renormalizeNetwork } from "../channel/renormalizeNetwork.ts";
import type { PortPairs } from "../channel/sdd21.ts";
import type { AggressorKind } from "./aggressorKind.ts";
import { type AggressorPorts, crosstalkTransfers } from "./crosstalkTransfers.ts";

/** An aggressor's crosstalk pulse (victim's receiver, 1 V aggressor symbol) with its coupling curve. */
export interface AggressorPulse extends FrequencyPulse {
  readonly name: string;
  readonly kind: AggressorKind;
}

/** A victim lane and its aggressors, as pulses on one grid. */
export interface LinkPulses {
  readonly victim: FrequencyPulse;
  readonly aggressors: AggressorPulse[];
  /** The judgement of the file, for the victim's transfer (see {@link inputQuality}). */
  readonly quality: InputQuality;
}

/**
 * Reads a multi-port Touchstone file once, re-references its ports to 50 Ω, and derives the victim's pulse (its SDD21) and every
 * aggressor's crosstalk pulse (the mixed-mode term from the aggressor's pair to the victim's output
 * pair, see {@link crosstalkTransfers}), each through {@link pulseFromS21} with the same options;
 * an aggressor's `insertionLoss` is its coupling `20·log10|X(f)|`.
 *
 * @param text - the file's text.
 * @param options - pulse grid and shaping; `ports` from the file name when known; the victim's pairs
 *   and the aggressors' pairs.
 * @throws InputFileError for a malformed file, RangeError for unusable pairs or options.
 */
export function linkFromTouchstone(
  text: string,
  options: S21PulseOptions & {
    readonly ports?: number;
    readonly victim: PortPairs;
    readonly aggressors: readonly AggressorPorts[];
  },
): LinkPulses {
  const net = renormalizeNetwork(parseTouchstone(text, { ports: options.ports }));
  const t = crosstalkTransfers(net, options.victim, options.aggressors);
  const victim = pulseFromS21(t.freqs_Hz, t.victim, options);
  return {
    victim,
    quality: inputQuality(net, t.victim, victim, {
      ui_s: options.ui_s,
      samplesPerUi: options.samplesPerUi,
      pairs: options.victim,
    }),
    aggressors: t.aggressors.map((a) => ({
      name: a.name,
      kind: a.kind,
      ...pulseFromS21(t.freqs_Hz, a.transfer, options),
    })),
  };
}
