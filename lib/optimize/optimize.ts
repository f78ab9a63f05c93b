// The joint optimizer's entry point: the best setting for a pulse under a budget, with the proof
// (eye, headroom), the linear-only comparison, the verdict, the headroom surface and the top settings.
import { eyeWidth } from "../analysis/bathtub.ts";
import { type DfeErrorPropagation, dfeErrorPropagation } from "../analysis/dfeErrorPropagation.ts";
import type { BudgetInput } from "../contract/budget.ts";
import type { AggressorKind } from "../crosstalk/aggressorKind.ts";
import type { LinkAggressor } from "../crosstalk/linkAggressor.ts";
import type { Pulse } from "../types.ts";
import type { CtleChannel } from "./ctleChannel.ts";
import { type PhaseEye, phaseEye } from "./evaluateSetting.ts";
import { fewestDfeTaps } from "./fewestDfeTaps.ts";
import { type Candidate, jointSearch } from "./jointSearch.ts";
import { type PreparedChannels, prepareChannels } from "./prepareChannels.ts";
import { refineFir } from "./refineFir.ts";
import { type SearchSpace, searchSpace } from "./searchSpace.ts";
import { type Verdict, verdict } from "./verdict.ts";

/** One equalizer setting with its figures (plain JSON). */
export interface SettingResult {
  /** Transmit FIR taps from the earliest pre-cursor tap (fractions of the peak swing). */
  readonly tx: { readonly taps: number[] };
  readonly ctle: { readonly gDc_dB: number; readonly gDc2_dB: number };
  /** DFE taps in volts at the limiter input, their limits (null: none) and which hit them. */
  readonly dfe: { readonly taps: number[]; readonly limits_V: (number | null)[]; readonly clipped: boolean[] };
  readonly eye: { readonly eyeHeight_V: number; readonly eyeWidth_UI: number };
  readonly limiterHeadroom_V: number;
  /** Sampling phase in UI relative to the equalized pulse's nominal main cursor. */
  readonly samplingPhase_UI: number;
  /** Noise rms at the limiter input with this CTLE setting. */
  readonly noiseRms_V: number;
  /** The receive FFE at this CTLE setting (null: the budget has none). */
  readonly ffe: { readonly taps: number[]; readonly pre: number } | null;
}

/** The crosstalk at the chosen setting (the contract's `crosstalk`, with the eye without it). */
export interface CrosstalkResult {
  /** Rms of all the crosstalk at the sampler (powers add), volts. */
  readonly rms_V: number;
  /** Per aggressor, in the order given: its rms at the sampler and its worst phase (UI from its peak). */
  readonly perAggressor: {
    readonly name: string;
    readonly kind: AggressorKind;
    readonly rms_V: number;
    readonly phase_UI: number;
  }[];
  /** The chosen setting's eye height and headroom without the aggressors (same phase). */
  readonly eyeHeightWithoutCrosstalk_V: number;
  readonly limiterHeadroomWithoutCrosstalk_V: number;
}

/** One of the best settings, for plotting. */
export interface TopSetting {
  readonly ctle: { readonly gDc_dB: number; readonly gDc2_dB: number };
  readonly txTaps: number[];
  readonly dfeTaps: number[];
  readonly samplingPhase_UI: number;
  readonly eyeHeight_V: number;
  readonly limiterHeadroom_V: number;
}

/** The response of the contract's `optimize` command, with the extras the web app plots. */
export interface OptimizeResult extends SettingResult {
  /** The best setting without DFE (transmit FIR + CTLE only). */
  readonly linearOnly: SettingResult;
  /** The aggressors at the chosen setting (null: none given). */
  readonly crosstalk: CrosstalkResult | null;
  readonly verdict: Verdict;
  /**
   * DFE error propagation at the chosen setting (its own decisions fed back; `dfeErrorPropagation`),
   * or null when the setting has no DFE taps.
   */
  readonly errorPropagation: DfeErrorPropagation | null;
  /** Clocking used: scheme, tracking bandwidth, sampling policy and the jitter left at the sampler. */
  readonly clocking: {
    readonly scheme: string;
    readonly policy: string;
    readonly bandwidth_Hz: number;
    readonly rjRms_UI: number;
    readonly djPp_UI: number;
  };
  /**
   * Best headroom per CTLE setting (rows: `gDc2_dB`, columns: `gDc_dB`). `headroom_V` is exact where
   * known (null otherwise); `upperBound_V` bounds every cell (null when no FIR setting is legal).
   */
  readonly surface: {
    readonly gDc_dB: number[];
    readonly gDc2_dB: number[];
    readonly headroom_V: (number | null)[][];
    readonly upperBound_V: (number | null)[][];
  };
  /** The best settings (with the budget's DFE), best first. */
  readonly top: TopSetting[];
  /** When the budget's FIR is continuous: what the Nelder–Mead refinement added over the scaffold grid. */
  readonly refinement: { readonly gain_V: number; readonly linearGain_V: number; readonly evaluations: number } | null;
  /** Work done by the search. */
  readonly search: {
    readonly exactEvaluations: number;
    readonly boundedBoxes: number;
    readonly settingsReached: number;
  };
}

/** A tap value for people and firmware: grid multiples without binary noise (0.6, not 0.6000000000000001). */
export function tidyTap(x: number): number {
  return Math.round(x * 1e12) / 1e12;
}

/** Options of {@link optimize}. */
export interface OptimizeOptions {
  /** Progress 0 … 1 (for a progress bar). */
  readonly onProgress?: (fraction: number) => void;
  /** Number of top settings returned (default 5). */
  readonly topCount?: number;
  /** The victim's aggressors: crosstalk pulses at the receiver's pins (see `LinkAggressor`). */
  readonly aggressors?: readonly LinkAggressor[];
}

/** The optimizer's result together with what a tuning run needs to draw it. */
export interface OptimizeDetail {
  readonly result: OptimizeResult;
  readonly space: SearchSpace;
  readonly prepared: PreparedChannels;
  /** Best setting with the budget's DFE and best linear-only setting, with their channels and eyes. */
  readonly full: { readonly taps: Float64Array; readonly channel: CtleChannel; readonly eye: PhaseEye };
  readonly linear: { readonly taps: Float64Array; readonly channel: CtleChannel; readonly eye: PhaseEye };
}

/** A setting with its figures as plain JSON. */
function settingResult(
  space: SearchSpace,
  s: { taps: Float64Array; channel: CtleChannel; eye: PhaseEye },
): SettingResult {
  const spu = s.channel.pulse.samplesPerUi;
  const limits = Array.from(space.dfeLimits_V.subarray(0, s.eye.dfeTaps.length), (l) =>
    Number.isFinite(l) ? l : null,
  );
  return {
    tx: { taps: Array.from(s.taps, tidyTap) },
    ctle: { gDc_dB: s.channel.setting.gDc_dB, gDc2_dB: s.channel.setting.gDc2_dB },
    dfe: { taps: Array.from(s.eye.dfeTaps), limits_V: limits, clipped: [...s.eye.dfeClipped] },
    eye: {
      eyeHeight_V: s.eye.eyeHeight_V,
      eyeWidth_UI: eyeWidth(s.eye.eye, s.eye.phase, space.budget.targetBer).eyeWidth_UI,
    },
    limiterHeadroom_V: s.eye.limiterHeadroom_V,
    samplingPhase_UI: s.eye.phase / spu,
    noiseRms_V: s.channel.noiseRms_V,
    ffe: s.channel.ffe === null ? null : { taps: Array.from(s.channel.ffe.taps), pre: s.channel.ffe.pre },
  };
}

/** The crosstalk figures of a setting, and its eye without the aggressors. */
function crosstalkResult(
  space: SearchSpace,
  s: { taps: Float64Array; channel: CtleChannel; eye: PhaseEye },
): { result: CrosstalkResult; without: PhaseEye } | null {
  const x = s.eye.crosstalk;
  const agg = s.channel.crosstalk;
  if (x === null || agg === null) return null;
  const without = phaseEye(s.channel, space, s.taps, s.eye.dfeTaps.length, s.eye.phase, false);
  return {
    result: {
      rms_V: x.rms_V,
      perAggressor: x.perAggressor.map((p, i) => ({
        name: p.name,
        kind: agg.aggressors[i].kind,
        rms_V: p.rms_V,
        phase_UI: p.phase_UI,
      })),
      eyeHeightWithoutCrosstalk_V: without.eyeHeight_V,
      limiterHeadroomWithoutCrosstalk_V: without.limiterHeadroom_V,
    },
    without,
  };
}

/**
 * Optimizes transmit FIR × CTLE × DFE for a pulse under a budget (see {@link jointSearch}): the best
 * setting with the budget's DFE taps and the best without DFE in one pass, then the fewest DFE taps
 * that meet the required headroom (feasibility passes, bisecting the tap count: more taps never
 * remove a setting's ability to cancel), then — for a continuous FIR — Nelder–Mead refinement.
 * Aggressors, when given, go through the same front end, CTLE and receive FFE as the channel and are
 * in every eye the search evaluates; the result then reports them at the chosen setting, with its
 * eye without them, and the verdict names crosstalk where it decides.
 *
 * @param pulse - channel pulse response for a 1 V symbol.
 * @param budget - the budget (validated; RangeError names the faulty field).
 * @param options - progress callback, number of top settings, aggressors.
 */
export function optimizeDetailed(pulse: Pulse, budget: BudgetInput, options: OptimizeOptions = {}): OptimizeDetail {
  const space = searchSpace(pulse, budget);
  const report = options.onProgress ?? (() => {});
  report(0);
  const prepared = prepareChannels(pulse, space, options.aggressors ?? []);
  const budgetDfeCount = space.dfeCount;
  const counts = budgetDfeCount > 0 ? [budgetDfeCount, 0] : [0];
  const main = jointSearch(
    pulse,
    space,
    { dfeCounts: counts, topCount: options.topCount, onProgress: (f) => report(0.75 * f) },
    prepared,
  );
  const fullC = main.best[0];
  const linC = main.best[counts.length - 1];
  if (fullC === null || linC === null) {
    throw new RangeError("budget.tx: no transmit FIR setting satisfies the tap ranges, the step and Σ|c| ≤ 1");
  }
  const fewest = fewestDfeTaps(pulse, space, prepared, main, fullC, linC);
  report(0.9);

  const channelOf = (c: Candidate) => prepared.channels[c.ctleIndex];
  let full = {
    taps: fullC.taps,
    channel: channelOf(fullC),
    eye: phaseEye(channelOf(fullC), space, fullC.taps, fullC.dfeCount, fullC.phase),
  };
  let linear = {
    taps: linC.taps,
    channel: channelOf(linC),
    eye: phaseEye(channelOf(linC), space, linC.taps, 0, linC.phase),
  };
  let refinement: OptimizeResult["refinement"] = null;
  if (space.continuousFir) {
    const rf = refineFir(full.channel, space, budgetDfeCount, [full.taps]);
    const rl = budgetDfeCount > 0 ? refineFir(linear.channel, space, 0, [linear.taps]) : rf;
    const gain = Math.max(0, rf.eye.limiterHeadroom_V - full.eye.limiterHeadroom_V);
    const linearGain = Math.max(0, rl.eye.limiterHeadroom_V - linear.eye.limiterHeadroom_V);
    if (rf.eye.limiterHeadroom_V > full.eye.limiterHeadroom_V)
      full = { taps: rf.taps, channel: full.channel, eye: rf.eye };
    if (rl.eye.limiterHeadroom_V > linear.eye.limiterHeadroom_V) {
      linear = { taps: rl.taps, channel: linear.channel, eye: rl.eye };
    }
    refinement = {
      gain_V: gain,
      linearGain_V: linearGain,
      evaluations: rf.evaluations + (budgetDfeCount > 0 ? rl.evaluations : 0),
    };
  }
  report(0.97);

  const fullCandidate: Candidate = {
    ...fullC,
    taps: full.taps,
    limiterHeadroom_V: full.eye.limiterHeadroom_V,
    eyeHeight_V: full.eye.eyeHeight_V,
  };
  const linCandidate: Candidate = {
    ...linC,
    taps: linear.taps,
    limiterHeadroom_V: linear.eye.limiterHeadroom_V,
    eyeHeight_V: linear.eye.eyeHeight_V,
  };
  const propagation = full.eye.dfeTaps.length > 0 ? dfeErrorPropagation(full.eye.eye, full.eye.phase) : null;
  const fullXt = crosstalkResult(space, full);
  const linXt = crosstalkResult(space, linear);
  const worst = fullXt === null ? null : fullXt.result.perAggressor.reduce((a, b) => (b.rms_V > a.rms_V ? b : a));
  const v = verdict(
    space,
    {
      candidate: linCandidate,
      mainCursor_V: linear.eye.eye.main(linear.eye.phase),
      noiseRms_V: linear.channel.noiseRms_V,
    },
    { candidate: fullCandidate, noiseRms_V: full.channel.noiseRms_V, errorPropagation: propagation },
    fewest.taps,
    fullXt === null || linXt === null || worst === null
      ? undefined
      : {
          linearWithout_V: linXt.without.eyeHeight_V,
          fullWithout_V: fullXt.without.eyeHeight_V,
          rms_V: fullXt.result.rms_V,
          count: fullXt.result.perAggressor.length,
          worst,
        },
  );

  const g1 = space.ctleAxes.gDc_dB;
  const g2 = space.ctleAxes.gDc2_dB;
  const cell = (i2: number, i1: number) => main.perCtle[0][i2 * g1.length + i1];
  const result: OptimizeResult = {
    ...settingResult(space, full),
    linearOnly: settingResult(space, linear),
    crosstalk: fullXt?.result ?? null,
    verdict: v,
    errorPropagation: propagation,
    clocking: {
      scheme: space.jitter.scheme,
      policy: space.policy,
      bandwidth_Hz: space.jitter.bandwidth_Hz,
      rjRms_UI: space.jitter.rjRms_UI,
      djPp_UI: space.jitter.djPp_UI,
    },
    surface: {
      gDc_dB: [...g1],
      gDc2_dB: [...g2],
      headroom_V: g2.map((_, i2) =>
        g1.map((_, i1) => (cell(i2, i1).exact ? (cell(i2, i1).best as Candidate).limiterHeadroom_V : null)),
      ),
      upperBound_V: g2.map((_, i2) =>
        g1.map((_, i1) => (Number.isFinite(cell(i2, i1).upperBound_V) ? cell(i2, i1).upperBound_V : null)),
      ),
    },
    top: main.top.map((c) => ({
      ctle: { gDc_dB: c.ctle.gDc_dB, gDc2_dB: c.ctle.gDc2_dB },
      txTaps: Array.from(c.taps, tidyTap),
      dfeTaps: Array.from(c.dfeTaps),
      samplingPhase_UI: c.phase / pulse.samplesPerUi,
      eyeHeight_V: c.eyeHeight_V,
      limiterHeadroom_V: c.limiterHeadroom_V,
    })),
    refinement,
    search: {
      exactEvaluations: fewest.stats.exact,
      boundedBoxes: fewest.stats.boxes,
      settingsReached: fewest.stats.leaves,
    },
  };
  report(1);
  return { result, space, prepared, full, linear };
}

/** {@link optimizeDetailed}'s plain-JSON result: the contract's `optimize` response and its extras. */
export function optimize(pulse: Pulse, budget: BudgetInput, options: OptimizeOptions = {}): OptimizeResult {
  return optimizeDetailed(pulse, budget, options).result;
}
