// The worker's part of a sweep (runs in the engine worker pool, no I/O): a batch is one channel at a
// few corners — the channel's pulse rebuilt at each corner's loss, the budget moved to the corner,
// and the joint search once per pair; the sweep's last job gathers every channel's binding corner.
import type { BudgetInput } from "@lib/contract/budget";
import type { Corner } from "@lib/contract/corner";
import type { PortPairs } from "@lib/channel";
import { cornerBudget, cornerPulses, type CornerSource } from "@lib/corners";
import { optimize } from "@lib/optimize";
import { pulseFromJson } from "@lib/pulse";
import { ENGINE_VERSION } from "@lib/run";
import type { Pulse } from "@lib/types";
import type { ChannelKind, StoredPulse } from "@/features/channels/channels";
import { storedPulse } from "@/features/channels/derive";
import { worstPerChannel, type PairResult, type SweepInputs, type SweepSummary } from "./sweeps";

/** One batch's input: the channel (with its Touchstone text when it came from one), the budget, its corners. */
export interface SweepBatchInput {
  budget: BudgetInput;
  channel: { id: number; kind: ChannelKind; pulse: StoredPulse; derivation: Record<string, unknown>; touchstone: string | null };
  corners: { index: number; corner: Corner }[];
}

export interface SweepBatchResult {
  engineVersion: string;
  pairs: (PairResult & { compute_ms: number })[];
}

/** What rebuilds the channel at another loss: its loss model, its Touchstone S21, or its pulse. */
function cornerSource(ch: SweepBatchInput["channel"], nominal: Pulse): CornerSource {
  const d = ch.derivation;
  const grid = { ui_s: nominal.ui_s, samplesPerUi: nominal.samplesPerUi, ...(typeof d.riseTime_s === "number" ? { riseTime_s: d.riseTime_s } : {}) };
  if (d.source === "loss-model" && d.lossModel && typeof d.lossModel === "object") {
    return { kind: "loss-model", model: d.lossModel as { lossAtNyquist_dB: number }, grid };
  }
  if (d.source === "touchstone" && ch.touchstone !== null) {
    return { kind: "touchstone", text: ch.touchstone, ports: typeof d.ports === "number" ? d.ports : undefined, pairs: d.pairs as PortPairs | undefined, grid };
  }
  return { kind: "pulse", pulse: nominal };
}

/**
 * A channel's pulse at each loss factor, in the stored form (trimmed like the channel's own): the
 * nominal factor 1 is the channel's stored pulse itself, so a sweep's nominal corner computes
 * exactly what a tuning run of the channel does.
 */
function pulsesAt(ch: SweepBatchInput["channel"], scales: number[]): (Pulse | Error)[] {
  const nominal = pulseFromJson(ch.pulse);
  const source = cornerSource(ch, nominal);
  const build = (list: number[]) => cornerPulses(source, list).map((p) => pulseFromJson(storedPulse(p).pulse));
  const others = [...new Set(scales.filter((s) => s !== 1))];
  const built = new Map<number, Pulse | Error>();
  try {
    build(others).forEach((p, i) => built.set(others[i], p));
  } catch {
    // One refused factor (a loss model pushed past 100 dB) must not sink the others: one by one.
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

/** Computes one batch: the joint search per pair; a pair the engine refuses records why. */
export function computeSweepBatch(input: SweepBatchInput, onProgress: (fraction: number) => void): SweepBatchResult {
  const pulses = pulsesAt(input.channel, input.corners.map((c) => c.corner.lossScale ?? 1));
  const pairs = input.corners.map(({ index, corner }, i) => {
    const started = performance.now();
    const base = { channelId: input.channel.id, cornerIndex: index };
    try {
      const pulse = pulses[i];
      if (pulse instanceof Error) throw pulse;
      const r = optimize(pulse, cornerBudget(input.budget, corner), {
        topCount: 1,
        onProgress: (f) => onProgress((i + f) / input.corners.length),
      });
      return {
        ...base,
        limiterHeadroom_V: r.limiterHeadroom_V,
        eyeHeight_V: r.eye.eyeHeight_V,
        linearHeadroom_V: r.linearOnly.limiterHeadroom_V,
        linearReachExhausted: r.verdict.linearReachExhausted,
        fewestDfeTaps: r.verdict.fewestDfeTaps,
        setting: { tx: r.tx.taps, ctle: r.ctle, dfe: r.dfe.taps },
        error: null,
        compute_ms: Math.round(performance.now() - started),
      };
    } catch (e) {
      if (!(e instanceof RangeError || e instanceof TypeError)) throw e;
      return {
        ...base,
        limiterHeadroom_V: null,
        eyeHeight_V: null,
        linearHeadroom_V: null,
        linearReachExhausted: null,
        fewestDfeTaps: null,
        setting: null,
        error: `Corner “${corner.name}”: ${e.message}`.slice(0, 1000),
        compute_ms: Math.round(performance.now() - started),
      };
    }
  });
  onProgress(1);
  return { engineVersion: ENGINE_VERSION, pairs };
}

/** The sweep's last job: every channel's binding corner and the counts its page shows. */
export function summarizeSweep(input: { inputs: SweepInputs; results: (PairResult & { compute_ms: number })[] }): SweepSummary {
  const worst = worstPerChannel(input.inputs.channels, input.inputs.corners, input.results).map(({ channelId, corner, cornerIndex, limiterHeadroom_V }) => ({ channelId, corner, cornerIndex, limiterHeadroom_V }));
  return {
    worst,
    refused: input.results.filter((r) => r.error !== null).length,
    linearReachExhausted: input.results.filter((r) => r.linearReachExhausted === true).length,
    compute_ms: input.results.reduce((t, r) => t + r.compute_ms, 0),
  };
}
