// One default setting for a whole class of channels: the transmit FIR and CTLE that maximize the
// worst channel's limiter headroom (minimax), optionally on register codes, with each channel's
// headroom under the default next to its own optimum.
import type { BudgetInput } from "../contract/budget.ts";
import type { LinkAggressor } from "../crosstalk/linkAggressor.ts";
import { type CtleChannel, channelFor } from "../optimize/ctleChannel.ts";
import type { ReceiveFfe } from "../optimize/receiveFfe.ts";
import { evaluateSetting, type PhaseEye } from "../optimize/evaluateSetting.ts";
import { type Candidate, jointSearch } from "../optimize/jointSearch.ts";
import { ownOptimum, type OwnOptimum } from "./ownOptimum.ts";
import { tidyTap } from "../optimize/optimize.ts";
import { type PreparedChannels, prepareChannels } from "../optimize/prepareChannels.ts";
import { searchSpace, sharedGridMismatch } from "../optimize/searchSpace.ts";
import { assertPulse } from "../pulse/assertPulse.ts";
import { resampleLinear } from "../signal/resampleLinear.ts";
import type { Pulse } from "../types.ts";
import { type EqualizerSetting, quantizeSetting } from "./quantizeSetting.ts";
import { encodeField, decodeField, type RegisterField } from "./registerMap.ts";

/** One channel under the class default. */
export interface ChannelUnderDefault {
  /** Limiter headroom with the default (the DFE adapting in closed form within its limits), volts. */
  readonly defaultHeadroom_V: number;
  readonly defaultEyeHeight_V: number;
  /** Sampling phase with the default, UI from the equalized pulse's main cursor. */
  readonly samplingPhase_UI: number;
  /** The channel's adapted DFE taps with the default, volts. */
  readonly dfeTaps: number[];
  /** The channel's adapted receive FFE taps with the default (null: the budget has no FFE). */
  readonly ffeTaps: number[] | null;
  /** Its aggressors with the default: crosstalk rms at the sampler, per aggressor (null: none). */
  readonly crosstalk: {
    readonly rms_V: number;
    readonly perAggressor: { readonly name: string; readonly rms_V: number; readonly phase_UI: number }[];
  } | null;
  /** The channel's own optimum on the budget's grid (its best setting alone). */
  readonly ownHeadroom_V: number;
  readonly own: { readonly tx: number[]; readonly ctle: { readonly gDc_dB: number; readonly gDc2_dB: number } };
}

/** The class default and what it gives each channel. */
export interface PopulationResult {
  /**
   * The default: transmit FIR and CTLE, and DFE starting values (the centre of the channels' adapted
   * taps, tap by tap — DFE taps adapt per channel in the field; the figures assume they do).
   */
  readonly setting: {
    readonly tx: { readonly taps: number[] };
    readonly ctle: { readonly gDc_dB: number; readonly gDc2_dB: number };
    readonly dfe: { readonly taps: number[] };
    /** Receive FFE starting values like the DFE's (null: the budget has no FFE); main tap `taps[pre]`. */
    readonly ffe: { readonly taps: number[]; readonly pre: number } | null;
  };
  /** Register codes and their values per field name (null without a register map). */
  readonly codes: Record<string, number> | null;
  readonly values: Record<string, number> | null;
  /** The worst channel's headroom with the default, and its index. */
  readonly worstHeadroom_V: number;
  readonly worstChannel: number;
  /** Per channel, in the order given. */
  readonly channels: ChannelUnderDefault[];
}

/** Options of {@link populationDefault}. */
export interface PopulationOptions {
  /** Round the default to these register fields' codes. */
  readonly registerMap?: readonly RegisterField[];
  /** Progress 0 … 1. */
  readonly onProgress?: (fraction: number) => void;
  /**
   * One budget per member, when members are channels at corners (other swing, noise, jitter or
   * sensitivity): each member is searched and evaluated under its own. They must share `budget`'s
   * grids (CTLE, transmit FIR, DFE); `budget` for every member when left out.
   */
  readonly memberBudgets?: readonly BudgetInput[];
  /** Each member's own optimum when already known (computed by another job): those searches are skipped. */
  readonly own?: readonly OwnOptimum[];
  /** Per channel (same order as the pulses), its aggressors at the receiver's pins. */
  readonly aggressors?: readonly (readonly LinkAggressor[])[];
}

/**
 * The members of a class on one sampling grid: every pulse must share the first one's UI (within
 * 1 %); pulses with another `samplesPerUi` are resampled linearly to the first one's.
 */
export function commonGrid(pulses: readonly Pulse[]): Pulse[] {
  if (!Array.isArray(pulses) || pulses.length === 0) throw new RangeError("pulses must hold at least one pulse");
  pulses.forEach((p, i) => assertPulse(p, `pulses[${i}]`));
  const ref = pulses[0];
  return pulses.map((p, i) => {
    if (Math.abs(p.ui_s / ref.ui_s - 1) > 0.01) {
      throw new RangeError(
        `pulses[${i}].ui_s ${p.ui_s} s differs from pulses[0] (${ref.ui_s} s): one class has one bit rate`,
      );
    }
    if (p.samplesPerUi === ref.samplesPerUi) return p;
    const dtIn = p.ui_s / p.samplesPerUi;
    const dtOut = ref.ui_s / ref.samplesPerUi;
    const values_V = resampleLinear(p.values_V, dtIn, dtOut);
    const mainIndex = Math.min(values_V.length - 1, Math.round((p.mainIndex * dtIn) / dtOut));
    return { ui_s: ref.ui_s, samplesPerUi: ref.samplesPerUi, values_V, mainIndex };
  });
}

/**
 * Each member's aggressors on the members' grid (resampled like the members by {@link commonGrid});
 * empty lists when none are given.
 * @throws RangeError unless there is one list per member.
 */
export function aggressorsOnGrid(
  members: readonly Pulse[],
  given: readonly (readonly LinkAggressor[])[] | undefined,
): LinkAggressor[][] {
  if (given !== undefined && given.length !== members.length) {
    throw new RangeError(`aggressors must hold one list per pulse (${members.length}), got ${given.length}`);
  }
  return members.map((_, i) => {
    const list = given?.[i] ?? [];
    const onGrid = commonGrid([members[0], ...list.map((a) => a.pulse)]).slice(1);
    return list.map((a, j) => ({ ...a, pulse: onGrid[j] }));
  });
}

interface Evaluated {
  readonly setting: EqualizerSetting;
  readonly eyes: PhaseEye[];
  readonly channels: CtleChannel[];
  readonly worst: number;
  readonly worstIndex: number;
}

/**
 * Population default (minimax): the setting of the budget's transmit FIR grid × CTLE grid that
 * maximizes the worst channel's limiter headroom, each channel sampling at its own policy phase with
 * its DFE adapted in closed form. The search is the exact branch and bound of `jointSearch` over all
 * channels at once. With a register map the default is rounded to codes; each channel's own optimum
 * (rounded the same way) is then also tried, so the default is never worse for the worst channel than
 * any single channel's optimum applied to the whole class. Without a map that holds by exactness.
 * Members may be channels at corners, each with its own budget (`memberBudgets`): the default then
 * maximizes the worst headroom over channels and corners.
 * Each channel's aggressors are in its every eye (through its receive FFE, when the budget has one);
 * the FFE, like the DFE, adapts per channel, and the default carries starting values for both.
 *
 * @param pulses - the class's members (same UI; pulses for a 1 V symbol).
 * @param budget - the budget (validated against the first pulse); its grids are every member's.
 * @param options - register map, progress, the members' budgets, their own optima when known, each
 *   member's aggressors.
 */
export function populationDefault(
  pulses: readonly Pulse[],
  budget: BudgetInput,
  options: PopulationOptions = {},
): PopulationResult {
  const members = commonGrid(pulses);
  const space = searchSpace(members[0], budget);
  const report = options.onProgress ?? (() => {});
  const dfeCount = space.dfeCount;
  const memberCount = members.length;
  if (options.memberBudgets !== undefined && options.memberBudgets.length !== memberCount) {
    throw new RangeError(
      `memberBudgets must hold one budget per pulse (${memberCount}), got ${options.memberBudgets.length}`,
    );
  }
  if (options.own !== undefined && options.own.length !== memberCount)
    throw new RangeError(`own must hold one optimum per pulse (${memberCount}), got ${options.own.length}`);
  const spaces = members.map((p, i) => {
    const given = options.memberBudgets?.[i];
    if (given === undefined) return space;
    const s = searchSpace(p, given);
    const differs = sharedGridMismatch(space, s);
    if (differs !== null)
      throw new RangeError(`memberBudgets[${i}].${differs} differs from budget's; a class's members share the grids`);
    return s;
  });
  const aggressors = aggressorsOnGrid(members, options.aggressors);
  const prepared: PreparedChannels[] = members.map((p, i) => prepareChannels(p, spaces[i], aggressors[i]));
  report(0.05);
  const own: readonly OwnOptimum[] =
    options.own ??
    members.map((p, i) => {
      const o = ownOptimum(p, spaces[i].budget, prepared[i]);
      report(0.05 + (0.45 * (i + 1)) / memberCount);
      return o;
    });
  const pop = jointSearch(
    members[0],
    space,
    { dfeCounts: [dfeCount], topCount: 1, onProgress: (f) => report(0.5 + 0.4 * f) },
    prepared,
  );
  const best = pop.best[0] as Candidate;

  const asSetting = (c: { taps: ArrayLike<number>; ctle: { gDc_dB: number; gDc2_dB: number } }): EqualizerSetting => ({
    tx: Array.from(c.taps),
    txPre: space.firSpec.pre,
    ctle: { gDc_dB: c.ctle.gDc_dB, gDc2_dB: c.ctle.gDc2_dB },
    dfe: [],
  });
  const map = options.registerMap;
  const evaluate = (s: EqualizerSetting): Evaluated => {
    const onGrid = space.ctleSettings.findIndex((x) => x.gDc_dB === s.ctle.gDc_dB && x.gDc2_dB === s.ctle.gDc2_dB);
    const channels = members.map((p, i) =>
      onGrid >= 0 ? prepared[i].channels[onGrid] : channelFor(p, spaces[i], s.ctle, aggressors[i]),
    );
    const eyes = channels.map((ch, i) => evaluateSetting(ch, spaces[i], s.tx, dfeCount));
    let worstIndex = 0;
    eyes.forEach((e, i) => {
      if (e.limiterHeadroom_V < eyes[worstIndex].limiterHeadroom_V) worstIndex = i;
    });
    return { setting: s, eyes, channels, worst: eyes[worstIndex].limiterHeadroom_V, worstIndex };
  };
  let chosen: Evaluated;
  let codes: Record<string, number> | null = null;
  let values: Record<string, number> | null = null;
  if (map === undefined) {
    chosen = evaluate(asSetting(best));
  } else {
    const candidates = [best, ...own].map((c) => quantizeSetting(asSetting(c), map));
    let pick = 0;
    chosen = evaluate(candidates[0].setting);
    for (let i = 1; i < candidates.length; i++) {
      const e = evaluate(candidates[i].setting);
      if (e.worst > chosen.worst) {
        pick = i;
        chosen = e;
      }
    }
    codes = { ...candidates[pick].codes };
    values = { ...candidates[pick].values };
  }
  report(0.95);

  // DFE and FFE starting values: per tap the centre of the channels' adapted taps (then rounded to codes).
  const centre = (values: number[]) => (Math.min(...values) + Math.max(...values)) / 2;
  const dfeStart = Array.from({ length: dfeCount }, (_, k) => centre(chosen.eyes.map((e) => e.dfeTaps[k])));
  const ffeSpec = space.ffe;
  const ffeStart =
    ffeSpec === null
      ? null
      : Array.from({ length: ffeSpec.pre + 1 + ffeSpec.post }, (_, k) =>
          centre(chosen.channels.map((c) => (c.ffe as ReceiveFfe).taps[k])),
        );
  if (map !== undefined && codes !== null && values !== null) {
    for (const f of map) {
      const d = /^dfe\[(\d+)\]$/.exec(f.parameter);
      const r = /^ffe\[(-?\d+)\]$/.exec(f.parameter);
      let start: number[] | null = null;
      let k = -1;
      if (d !== null && Number(d[1]) <= dfeCount) [start, k] = [dfeStart, Number(d[1]) - 1];
      if (r !== null && ffeStart !== null && ffeSpec !== null) [start, k] = [ffeStart, Number(r[1]) + ffeSpec.pre];
      if (start === null || k < 0 || k >= start.length) continue;
      const code = encodeField(f, Math.min(f.max, Math.max(f.min, start[k])));
      codes[f.name] = code;
      values[f.name] = decodeField(f, code);
      start[k] = values[f.name];
    }
  }
  const spu = members[0].samplesPerUi;
  const result: PopulationResult = {
    setting: {
      tx: { taps: chosen.setting.tx.map(tidyTap) },
      ctle: { ...chosen.setting.ctle },
      dfe: { taps: dfeStart },
      ffe: ffeStart === null || ffeSpec === null ? null : { taps: ffeStart, pre: ffeSpec.pre },
    },
    codes,
    values,
    worstHeadroom_V: chosen.worst,
    worstChannel: chosen.worstIndex,
    channels: chosen.eyes.map((e, i) => ({
      defaultHeadroom_V: e.limiterHeadroom_V,
      defaultEyeHeight_V: e.eyeHeight_V,
      samplingPhase_UI: e.phase / spu,
      dfeTaps: Array.from(e.dfeTaps),
      ffeTaps: chosen.channels[i].ffe === null ? null : Array.from((chosen.channels[i].ffe as ReceiveFfe).taps),
      crosstalk:
        e.crosstalk === null
          ? null
          : { rms_V: e.crosstalk.rms_V, perAggressor: e.crosstalk.perAggressor.map((x) => ({ ...x })) },
      ownHeadroom_V: own[i].limiterHeadroom_V,
      own: { tx: Array.from(own[i].taps, tidyTap), ctle: { gDc_dB: own[i].ctle.gDc_dB, gDc2_dB: own[i].ctle.gDc2_dB } },
    })),
  };
  report(1);
  return result;
}
