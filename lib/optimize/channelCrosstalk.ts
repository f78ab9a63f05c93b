// A CTLE channel's aggressors, through the same receiver as the victim (front end, CTLE, receive
// FFE): the ones whose transmitter FIR is fixed are sampled once; a FEXT aggressor driven by the
// victim link's own FIR is sampled again for each transmit FIR the search tries.
import { applyFir } from "../equalizers/applyFir.ts";
import { type CrosstalkParts, crosstalkParts, type SampledAggressor } from "../crosstalk/crosstalkParts.ts";
import type { AggressorKind } from "../crosstalk/aggressorKind.ts";
import { scalePulse } from "../pulse/scalePulse.ts";
import type { Modulation, Pulse } from "../types.ts";

/** One aggressor at the sampler, before any FIR that depends on the search. */
export interface ReceivedAggressor {
  readonly name: string;
  readonly kind: AggressorKind;
  /**
   * Its crosstalk pulse at the sampler in volts: for a fixed FIR, the whole transmitted symbol
   * (swing and FIR applied); for the victim's FIR, per unit of FIR tap (swing applied, FIR not).
   */
  readonly pulse: Pulse;
  /** True when the aggressor's FIR is the victim's chosen transmit FIR (FEXT by default). */
  readonly followsVictimFir: boolean;
}

/** The crosstalk of one CTLE channel. */
export interface ChannelCrosstalk {
  readonly aggressors: readonly ReceivedAggressor[];
  readonly modulation: Modulation;
  /** Gaussian noise at the sampler the small parts are lumped into (see `crosstalkParts`). */
  readonly noiseRms_V: number;
  /** The parts of the aggressors whose FIR is fixed (the same for every transmit FIR). */
  readonly fixed: CrosstalkParts;
  /** True when some aggressor follows the victim's FIR. */
  readonly dependsOnFir: boolean;
  /** Memo of {@link crosstalkFor}'s last answer. */
  last: { key: string; parts: CrosstalkParts } | null;
}

/** The crosstalk of a channel whose aggressors are already at the sampler. */
export function channelCrosstalk(aggressors: readonly ReceivedAggressor[], modulation: Modulation, noiseRms_V: number): ChannelCrosstalk {
  const fixed = aggressors.filter((a) => !a.followsVictimFir);
  return {
    aggressors,
    modulation,
    noiseRms_V,
    fixed: crosstalkParts(fixed, modulation, noiseRms_V),
    dependsOnFir: fixed.length < aggressors.length,
    last: null,
  };
}

/**
 * The crosstalk parts with transmit FIR `taps` (main tap `taps[pre]`): each aggressor at its worst
 * phase, the FEXT aggressors that follow the victim's FIR through `taps` (a whole number of UIs of
 * delay does not change an asynchronous aggressor's cursors). Per-aggressor figures in input order.
 */
export function crosstalkFor(x: ChannelCrosstalk, taps: ArrayLike<number>, pre: number): CrosstalkParts {
  if (!x.dependsOnFir) return x.fixed;
  const key = Array.prototype.join.call(taps, ",");
  if (x.last !== null && x.last.key === key) return x.last.parts;
  const sampled: SampledAggressor[] = x.aggressors.map((a) => ({ name: a.name, pulse: a.followsVictimFir ? applyFir(a.pulse, taps, pre) : a.pulse }));
  const parts = crosstalkParts(sampled, x.modulation, x.noiseRms_V);
  x.last = { key, parts };
  return parts;
}

/**
 * An aggressor's pulse at the receiver's pins turned into the sampler's: `receive` filters it (front
 * end, CTLE, FFE), then its transmitter is applied — a fixed FIR and its swing, or, for one that follows
 * the victim's FIR, the swing alone.
 *
 * @param a - the aggressor's pulse at the pins for a 1 V symbol, kind, name and transmitter.
 * @param receive - the receiver from the pins to the sampler.
 * @param swing_V - the aggressor transmitter's symbol amplitude (half its peak-to-peak swing).
 */
export function receivedAggressor(
  a: { readonly name: string; readonly kind: AggressorKind; readonly pulse: Pulse; readonly txTaps?: readonly number[] },
  receive: (p: Pulse) => Pulse,
  swing_V: number,
): ReceivedAggressor {
  const follows = a.kind === "fext" && a.txTaps === undefined;
  const taps = a.txTaps ?? [1];
  const at = receive(a.pulse);
  const pulse = scalePulse(follows ? at : applyFir(at, taps, 0), swing_V);
  return { name: a.name, kind: a.kind, pulse, followsVictimFir: follows };
}
