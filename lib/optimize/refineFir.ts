// Continuous refinement of transmit FIR taps (Nelder–Mead) where the budget gives no tap step:
// the grid search supplies a scaffold optimum, and ZF and MMSE supply further starts.
import { resolveTapRanges } from "../equalizers/txFirConstraints.ts";
import { mmseEqualizer } from "../solvers/mmse.ts";
import { zeroForcing } from "../solvers/zeroForcing.ts";
import type { CtleChannel } from "./ctleChannel.ts";
import { evaluateSetting, type PhaseEye } from "./evaluateSetting.ts";
import { nelderMead } from "./nelderMead.ts";
import type { SearchSpace } from "./searchSpace.ts";

/** A refined setting. */
export interface RefinedFir {
  readonly taps: Float64Array;
  readonly eye: PhaseEye;
  /** Objective evaluations spent. */
  readonly evaluations: number;
}

/**
 * The legal FIR closest in spirit to side taps `side` (in the order of the side positions):
 * each clamped into its range, the main tap `min(main max, 1 − Σ|side|)`; when that falls below the
 * main tap's minimum the side taps are scaled down until it does not (possible whenever the side
 * ranges contain 0, as the defaults do). `Σ|c| ≤ 1` always holds.
 */
export function projectFir(space: SearchSpace, side: readonly number[]): Float64Array {
  const spec = space.firSpec;
  const ranges = resolveTapRanges(spec);
  const tapCount = ranges.length;
  const taps = new Float64Array(tapCount);
  let k = 0;
  let sum = 0;
  for (let j = 0; j < tapCount; j++) {
    if (j === spec.pre) continue;
    const v = Math.min(ranges[j][1], Math.max(ranges[j][0], side[k++]));
    taps[j] = v;
    sum += Math.abs(v);
  }
  const [mainMin, mainMax] = ranges[spec.pre];
  if (1 - sum < mainMin && sum > 0) {
    const f = (1 - mainMin) / sum;
    sum = 0;
    for (let j = 0; j < tapCount; j++) {
      if (j === spec.pre) continue;
      // Scaling toward 0 keeps a tap inside its range when the range contains 0; otherwise clamp again.
      taps[j] = Math.min(ranges[j][1], Math.max(ranges[j][0], taps[j] * f));
      sum += Math.abs(taps[j]);
    }
  }
  taps[spec.pre] = Math.min(mainMax, 1 - sum);
  return taps;
}

/**
 * Refines the FIR taps for one CTLE channel and DFE count: Nelder–Mead on the side taps through
 * {@link projectFir}, maximizing the limiter headroom under the budget's policy, from each start
 * (e.g. the grid optimum) plus the channel's zero-forcing and MMSE taps; the best result wins.
 *
 * @param channel - the CTLE channel.
 * @param space - the resolved budget.
 * @param dfeCount - DFE taps.
 * @param starts - starting FIRs (full tap vectors).
 * @param maxIterations - iterations per start (default 60).
 */
export function refineFir(
  channel: CtleChannel,
  space: SearchSpace,
  dfeCount: number,
  starts: readonly Float64Array[],
  maxIterations = 60,
): RefinedFir {
  const spec = space.firSpec;
  const cursors = { h: channel.cursors(0), main: channel.pre };
  const all: Float64Array[] = [...starts];
  try {
    all.push(zeroForcing(cursors, spec.pre, spec.post, { normalize: "peak-swing" }).taps);
  } catch {
    // a singular zero-forcing system gives no start
  }
  try {
    all.push(mmseEqualizer(cursors, spec.pre, spec.post, channel.noiseRms_V / space.scale_V).taps);
  } catch {
    // no MMSE start without cursors or noise
  }
  if (all.length === 0) throw new RangeError("starts must hold at least one FIR");
  const sideOf = (t: Float64Array) => Array.from(t).filter((_, j) => j !== spec.pre);
  let evaluations = 0;
  const value = (side: readonly number[]): { taps: Float64Array; eye: PhaseEye } => {
    evaluations++;
    const taps = projectFir(space, side);
    return { taps, eye: evaluateSetting(channel, space, taps, dfeCount) };
  };
  let best: { taps: Float64Array; eye: PhaseEye } | null = null;
  for (const s of all) {
    if (sideOf(s).length === 0) {
      const v = value([]);
      if (best === null || v.eye.limiterHeadroom_V > best.eye.limiterHeadroom_V) best = v;
      continue;
    }
    const r = nelderMead((x) => -value(x).eye.limiterHeadroom_V, sideOf(s), {
      maxIterations,
      minErrorDelta: 1e-7,
      zeroDelta: 0.04,
      nonZeroDelta: 1.3,
    });
    const v = value(r.x);
    if (best === null || v.eye.limiterHeadroom_V > best.eye.limiterHeadroom_V) best = v;
  }
  const b = best as { taps: Float64Array; eye: PhaseEye };
  return { taps: b.taps, eye: b.eye, evaluations };
}
