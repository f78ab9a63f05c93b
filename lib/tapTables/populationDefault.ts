// One default setting for a whole class of channels: the transmit FIR and CTLE that maximize the
// worst channel's limiter headroom (minimax), optionally on register codes, with each channel's
// headroom under the default next to its own optimum.
import type { BudgetInput } from "../contract/budget.ts";
import { channelFor } from "../optimize/ctleChannel.ts";
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
      throw new RangeError(`pulses[${i}].ui_s ${p.ui_s} s differs from pulses[0] (${ref.ui_s} s): one class has one bit rate`);
    }
    if (p.samplesPerUi === ref.samplesPerUi) return p;
    const dtIn = p.ui_s / p.samplesPerUi;
    const dtOut = ref.ui_s / ref.samplesPerUi;
    const values_V = resampleLinear(p.values_V, dtIn, dtOut);
    const mainIndex = Math.min(values_V.length - 1, Math.round((p.mainIndex * dtIn) / dtOut));
    return { ui_s: ref.ui_s, samplesPerUi: ref.samplesPerUi, values_V, mainIndex };
  });
}

interface Evaluated {
  readonly setting: EqualizerSetting;
  readonly eyes: PhaseEye[];
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
 *
 * @param pulses - the class's members (same UI; pulses for a 1 V symbol).
 * @param budget - the budget (validated against the first pulse); its grids are every member's.
 * @param options - register map, progress, the members' budgets, their own optima when known.
 */
export function populationDefault(pulses: readonly Pulse[], budget: BudgetInput, options: PopulationOptions = {}): PopulationResult {
  const members = commonGrid(pulses);
  const space = searchSpace(members[0], budget);
  const report = options.onProgress ?? (() => {});
  const dfeCount = space.dfeCount;
  const memberCount = members.length;
  if (options.memberBudgets !== undefined && options.memberBudgets.length !== memberCount) {
    throw new RangeError(`memberBudgets must hold one budget per pulse (${memberCount}), got ${options.memberBudgets.length}`);
  }
  if (options.own !== undefined && options.own.length !== memberCount) throw new RangeError(`own must hold one optimum per pulse (${memberCount}), got ${options.own.length}`);
  const spaces = members.map((p, i) => {
    const given = options.memberBudgets?.[i];
    if (given === undefined) return space;
    const s = searchSpace(p, given);
    const differs = sharedGridMismatch(space, s);
    if (differs !== null) throw new RangeError(`memberBudgets[${i}].${differs} differs from budget's; a class's members share the grids`);
    return s;
  });
  const prepared: PreparedChannels[] = members.map((p, i) => prepareChannels(p, spaces[i]));
  report(0.05);
  const own: readonly OwnOptimum[] =
    options.own ??
    members.map((p, i) => {
      const o = ownOptimum(p, spaces[i].budget, prepared[i]);
      report(0.05 + (0.45 * (i + 1)) / memberCount);
      return o;
    });
  const pop = jointSearch(members[0], space, { dfeCounts: [dfeCount], topCount: 1, onProgress: (f) => report(0.5 + 0.4 * f) }, prepared);
  const best = pop.best[0] as Candidate;

  const asSetting = (c: { taps: ArrayLike<number>; ctle: { gDc_dB: number; gDc2_dB: number } }): EqualizerSetting => ({
    tx: Array.from(c.taps),
    txPre: space.firSpec.pre,
    ctle: { gDc_dB: c.ctle.gDc_dB, gDc2_dB: c.ctle.gDc2_dB },
    dfe: [],
  });
  const map = options.registerMap;
  const evaluate = (s: EqualizerSetting): Evaluated => {
    const eyes = members.map((p, i) => {
      const onGrid = space.ctleSettings.findIndex((x) => x.gDc_dB === s.ctle.gDc_dB && x.gDc2_dB === s.ctle.gDc2_dB);
      const ch = onGrid >= 0 ? prepared[i].channels[onGrid] : channelFor(p, spaces[i], s.ctle);
      return evaluateSetting(ch, spaces[i], s.tx, dfeCount);
    });
    let worstIndex = 0;
    eyes.forEach((e, i) => {
      if (e.limiterHeadroom_V < eyes[worstIndex].limiterHeadroom_V) worstIndex = i;
    });
    return { setting: s, eyes, worst: eyes[worstIndex].limiterHeadroom_V, worstIndex };
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

  // DFE starting values: per tap the centre of the channels' adapted taps (then rounded to codes).
  const dfeStart: number[] = [];
  for (let k = 0; k < dfeCount; k++) {
    const taps = chosen.eyes.map((e) => e.dfeTaps[k]);
    dfeStart.push((Math.min(...taps) + Math.max(...taps)) / 2);
  }
  if (map !== undefined && codes !== null && values !== null) {
    for (const f of map) {
      const m = /^dfe\[(\d+)\]$/.exec(f.parameter);
      if (m === null) continue;
      const k = Number(m[1]) - 1;
      if (k >= dfeCount) continue;
      const v = Math.min(f.max, Math.max(f.min, dfeStart[k]));
      const code = encodeField(f, v);
      codes[f.name] = code;
      values[f.name] = decodeField(f, code);
      dfeStart[k] = values[f.name];
    }
  }
  const spu = members[0].samplesPerUi;
  const result: PopulationResult = {
    setting: {
      tx: { taps: chosen.setting.tx.map(tidyTap) },
      ctle: { ...chosen.setting.ctle },
      dfe: { taps: dfeStart },
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
      ownHeadroom_V: own[i].limiterHeadroom_V,
      own: { tx: Array.from(own[i].taps, tidyTap), ctle: { gDc_dB: own[i].ctle.gDc_dB, gDc2_dB: own[i].ctle.gDc2_dB } },
    })),
  };
  report(1);
  return result;
}
