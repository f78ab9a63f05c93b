// The worker's part of a sweep (runs in the engine worker pool, no I/O): a batch is one channel at a
// few corners — the channel's pulse rebuilt at each corner's loss, the budget moved to the corner,
// and the joint search once per pair; the sweep's last job gathers every channel's binding corner.
import type { BudgetInput } from "@lib/contract/budget";
import type { Corner } from "@lib/contract/corner";
import { cornerBudget } from "@lib/corners";
import { optimize } from "@lib/optimize";
import { ENGINE_VERSION } from "@lib/run";
import { pulsesAtLoss, type CornerChannel } from "@/features/channels/lossCorners";
import { worstPerChannel, type PairResult, type SweepInputs, type SweepSummary } from "./sweeps";

/** One batch's input: the channel (with its Touchstone text when it came from one), the budget, its corners. */
export interface SweepBatchInput {
  budget: BudgetInput;
  channel: CornerChannel & { id: number };
  corners: { index: number; corner: Corner }[];
}

export interface SweepBatchResult {
  engineVersion: string;
  pairs: (PairResult & { compute_ms: number })[];
}

/** Computes one batch: the joint search per pair; a pair the engine refuses records why. */
export function computeSweepBatch(input: SweepBatchInput, onProgress: (fraction: number) => void): SweepBatchResult {
  const pulses = pulsesAtLoss(
    input.channel,
    input.corners.map((c) => c.corner.lossScale ?? 1),
  );
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
export function summarizeSweep(input: {
  inputs: SweepInputs;
  results: (PairResult & { compute_ms: number })[];
}): SweepSummary {
  const worst = worstPerChannel(input.inputs.channels, input.inputs.corners, input.results).map(
    ({ channelId, corner, cornerIndex, limiterHeadroom_V }) => ({ channelId, corner, cornerIndex, limiterHeadroom_V }),
  );
  return {
    worst,
    refused: input.results.filter((r) => r.error !== null).length,
    linearReachExhausted: input.results.filter((r) => r.linearReachExhausted === true).length,
    compute_ms: input.results.reduce((t, r) => t + r.compute_ms, 0),
  };
}
