// A channel's pulse at other losses (a sweep's or a tap table's corners), rebuilt from what the
// channel was made of: its loss model, its Touchstone S21 (or SDD21), or its sampled pulse. Pure:
// the caller hands in the Touchstone text when the channel came from a file.
import type { PortPairs } from "@lib/channel";
import type { Corner } from "@lib/contract/corner";
import { cornerPulses, type CornerSource } from "@lib/corners";
import { pulseFromJson } from "@lib/pulse";
import type { Pulse } from "@lib/types";
import type { ChannelKind, StoredPulse } from "./channels";
import { storedPulse } from "./derive";

/** What a channel's loss corners are rebuilt from. */
export interface CornerChannel {
  kind: ChannelKind;
  /** The channel's stored pulse (the nominal corner). */
  pulse: StoredPulse;
  /** How the channel was derived (its loss model, port pairing, rise time…). */
  derivation: Record<string, unknown>;
  /** The Touchstone file's text, for a channel made from one (only read when a corner scales its loss). */
  touchstone: string | null;
}

/** Whether rebuilding these corners needs the channel's Touchstone text. */
export function needsTouchstone(kind: ChannelKind | undefined, corners: readonly Corner[]): boolean {
  return kind === "touchstone" && corners.some((c) => (c.lossScale ?? 1) !== 1);
}

function cornerSource(ch: CornerChannel, nominal: Pulse): CornerSource {
  const d = ch.derivation;
  const grid = {
    ui_s: nominal.ui_s,
    samplesPerUi: nominal.samplesPerUi,
    ...(typeof d.riseTime_s === "number" ? { riseTime_s: d.riseTime_s } : {}),
  };
  if (d.source === "loss-model" && d.lossModel && typeof d.lossModel === "object") {
    return { kind: "loss-model", model: d.lossModel as { lossAtNyquist_dB: number }, grid };
  }
  if (d.source === "touchstone" && ch.touchstone !== null) {
    return {
      kind: "touchstone",
      text: ch.touchstone,
      ports: typeof d.ports === "number" ? d.ports : undefined,
      pairs: d.pairs as PortPairs | undefined,
      grid,
    };
  }
  return { kind: "pulse", pulse: nominal };
}

/**
 * The channel's pulse at each loss factor, in the stored form (trimmed like the channel's own). The
 * factor 1 is the stored pulse itself, so a nominal corner computes exactly what a tuning run of the
 * channel does. A factor the engine refuses (a loss model past 100 dB) gives its error in its place.
 */
export function pulsesAtLoss(ch: CornerChannel, scales: readonly number[]): (Pulse | Error)[] {
  const nominal = pulseFromJson(ch.pulse);
  const source = cornerSource(ch, nominal);
  const build = (list: number[]) => cornerPulses(source, list).map((p) => pulseFromJson(storedPulse(p).pulse));
  const others = [...new Set(scales.filter((s) => s !== 1))];
  const built = new Map<number, Pulse | Error>();
  try {
    build(others).forEach((p, i) => built.set(others[i], p));
  } catch {
    // One refused factor must not sink the others: one by one.
    for (const s of others) {
      try {
        built.set(s, build([s])[0]);
      } catch (e) {
        built.set(s, e instanceof Error ? e : new Error(String(e)));
      }
    }
  }
  return scales.map((s) => (s === 1 ? nominal : (built.get(s) as Pulse | Error)));
}
