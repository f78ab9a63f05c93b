// The worker's part of a tap table version (runs in the engine worker pool, no I/O), in three steps
// that the queue runs as a tree of jobs: each channel's own optimum at every corner (one job per
// channel), each class's minimax default over its channels and corners on the register map's
// codes (one job per class), and the version's eyes of its worst channel under its class default.
// `computeTapTableVersion` runs the three in one go (the demo seed).
import type { BudgetInput } from "@lib/contract/budget";
import type { Corner } from "@lib/contract/corner";
import { cornerBudget } from "@lib/corners";
import { applyFir } from "@lib/equalizers";
import type { LinkAggressor } from "@lib/crosstalk";
import { prepareChannels, resolveBudget, searchSpace } from "@lib/optimize";
import { pulseFromJson } from "@lib/pulse";
import { ENGINE_VERSION, tuningRun } from "@lib/run";
import {
  aggressorsOnGrid,
  ownOptimum,
  populationDefault,
  type OwnOptimum,
  type PopulationResult,
} from "@lib/tapTables";
import type { Pulse } from "@lib/types";
import type { Budget } from "@lib/contract/budget";
import { pulsesAtLoss, type CornerChannel } from "@/features/channels/lossCorners";
import { budgetForArchitecture, receiverOnlyBudget, tapTableArchitectureProblem } from "./architectureBudget";
import type {
  Architecture,
  ClassResult,
  ChannelHeadroom,
  VersionChannel,
  VersionClass,
  VersionInputs,
  VersionResult,
  WorstEye,
} from "./tapTables";

/** Share of the progress bar the worst channel's eyes take at the end (one-go computation). */
const EYE_SHARE = 0.1;

/** What every step reads: the version's budget and architecture, and its corners (none: the nominal budget only). */
export interface TableBasis {
  budget: BudgetInput;
  architecture: Architecture;
  corners: Corner[] | null;
}

/** A channel of the version as a step gets it: the copy, with its Touchstone text when a corner needs it. */
export type TableChannel = Omit<VersionChannel, "kind" | "derivation"> &
  Partial<Pick<VersionChannel, "kind" | "derivation">> & { touchstone: string | null };

/** The budget the architecture leaves (its FIR, CTLE, DFE out of the budget's), validated. */
function derivedBudget(basis: TableBasis): Budget {
  const problem = tapTableArchitectureProblem(basis.architecture);
  if (problem) throw new Error(problem);
  return resolveBudget(budgetForArchitecture(resolveBudget(basis.budget), basis.architecture));
}

/** The corners a version holds its defaults at: its own, or the nominal budget alone. */
const cornersOf = (basis: TableBasis): Corner[] => basis.corners ?? [{ name: "nominal" }];

/** A channel's pulses at every corner's loss; a corner the engine refuses fails the version, saying which. */
function channelPulses(ch: TableChannel, corners: Corner[]): Pulse[] {
  const source: CornerChannel = {
    kind: ch.kind ?? "pulse-csv",
    pulse: ch.pulse,
    derivation: ch.derivation ?? {},
    touchstone: ch.touchstone,
  };
  return pulsesAtLoss(
    source,
    corners.map((c) => c.lossScale ?? 1),
  ).map((p, k) => {
    if (p instanceof Error) throw new Error(`“${ch.name}” at corner “${corners[k].name}”: ${p.message}`);
    return p;
  });
}

/**
 * A channel's aggressors (crosstalk pulses at the receiver's pins) on its pulse's grid. A corner scales
 * the channel's loss only: its aggressors are the same at every corner.
 */
function channelAggressors(ch: TableChannel, pulse: Pulse): LinkAggressor[] {
  const list = (ch.aggressors ?? []).map((a) => ({ name: a.name, kind: a.kind, pulse: pulseFromJson(a.pulse) }));
  return aggressorsOnGrid([pulse], [list])[0];
}

/** Each corner's budget (the architecture's budget moved to the corner). */
const cornerBudgets = (derived: Budget, corners: Corner[]) => corners.map((c) => cornerBudget(derived, c));

/** Step 1, one job per channel: its own optimum at every corner. */
export interface TableMemberInput extends TableBasis {
  channel: TableChannel;
}
export interface TableMemberResult {
  /** One per corner (one for a version without corners). */
  own: OwnOptimum[];
}

export function computeTableMember(input: TableMemberInput, onProgress: (fraction: number) => void): TableMemberResult {
  const derived = derivedBudget(input);
  const corners = cornersOf(input);
  const budgets = cornerBudgets(derived, corners);
  const pulses = channelPulses(input.channel, corners);
  const own = pulses.map((p, k) => {
    // Its aggressors are in every eye of its own optimum, as in the class default's.
    const o = ownOptimum(
      p,
      budgets[k],
      prepareChannels(p, searchSpace(p, budgets[k]), channelAggressors(input.channel, p)),
    );
    onProgress((k + 1) / pulses.length);
    return o;
  });
  return { own };
}

/** Step 2, one job per class: the minimax default over its channels and corners. */
export interface TableClassInput extends TableBasis {
  registerMap: VersionInputs["registerMap"];
  index: number;
  cls: Omit<VersionClass, "channels"> & { channels: TableChannel[] };
  /** Each channel's own optima (step 1), in the class's order. */
  own: TableMemberResult[];
}
export interface TableClassResult {
  result: ClassResult;
  setting: PopulationResult["setting"];
  /** The class's worst member under its default. */
  worst: { channelIndex: number; cornerIndex: number };
}

export function computeTableClass(input: TableClassInput, onProgress: (fraction: number) => void): TableClassResult {
  const derived = derivedBudget(input);
  const corners = cornersOf(input);
  const K = corners.length;
  const budgets = cornerBudgets(derived, corners);
  // Members channel by channel, each at every corner.
  const pulses = input.cls.channels.flatMap((ch) => channelPulses(ch, corners));
  const r = populationDefault(pulses, derived, {
    registerMap: input.registerMap,
    memberBudgets: pulses.map((_, m) => budgets[m % K]),
    own: input.own.flatMap((o) => o.own),
    onProgress,
    // Each channel's aggressors are in its every eye, with the default and with its own optimum.
    aggressors: pulses.map((p, m) => channelAggressors(input.cls.channels[Math.floor(m / K)], p)),
  });
  const channels: ChannelHeadroom[] = input.cls.channels.map((ch, j) => {
    const at = r.channels.slice(j * K, (j + 1) * K);
    let k = 0;
    at.forEach((m, i) => {
      if (m.defaultHeadroom_V < at[k].defaultHeadroom_V) k = i;
    });
    return {
      id: ch.id,
      name: ch.name,
      lossAtNyquist_dB: ch.lossAtNyquist_dB,
      defaultHeadroom_V: at[k].defaultHeadroom_V,
      defaultEyeHeight_V: at[k].defaultEyeHeight_V,
      ownHeadroom_V: at[k].ownHeadroom_V,
      own: at[k].own,
      ...(at[k].crosstalk === null ? {} : { crosstalkRms_V: at[k].crosstalk!.rms_V }),
      ...(input.corners
        ? {
            worstCorner: corners[k].name,
            corners: at.map((m, i) => ({
              name: corners[i].name,
              defaultHeadroom_V: m.defaultHeadroom_V,
              ownHeadroom_V: m.ownHeadroom_V,
            })),
          }
        : {}),
    };
  });
  return {
    result: {
      index: input.index,
      name: input.cls.name,
      lossRange_dB: input.cls.lossRange_dB,
      codes: r.codes ?? {},
      values: r.values ?? {},
      worstHeadroom_V: r.worstHeadroom_V,
      channels,
    },
    setting: r.setting,
    worst: { channelIndex: Math.floor(r.worstChannel / K), cornerIndex: r.worstChannel % K },
  };
}

/** Step 3, the version's job: the classes together, and the eyes of the worst channel under its default. */
export interface TableVersionInput extends TableBasis {
  classes: TableClassResult[];
  /** The worst class's worst channel (the version's job reads it, with its Touchstone text when needed). */
  worstChannel: TableChannel;
}

/** Which class and member are the version's worst: the lowest headroom over all classes. */
export function worstOf(classes: readonly TableClassResult[]): {
  classIndex: number;
  channelIndex: number;
  cornerIndex: number;
} {
  let ci = 0;
  classes.forEach((c, i) => {
    if (c.result.worstHeadroom_V < classes[ci].result.worstHeadroom_V) ci = i;
  });
  return { classIndex: ci, ...classes[ci].worst };
}

/**
 * The engine's tuning run of the worst channel, at its worst corner, with its class default: the
 * channel through the default's transmit FIR, tuned under a budget whose only setting is the
 * default's receiver side.
 */
export function finishTableVersion(input: TableVersionInput, onProgress: (fraction: number) => void): VersionResult {
  const budget = resolveBudget(input.budget);
  const derived = derivedBudget(input);
  const corners = cornersOf(input);
  const w = worstOf(input.classes);
  const cls = input.classes[w.classIndex];
  const corner = corners[w.cornerIndex];
  const pulse = channelPulses(input.worstChannel, [corner])[0];
  const withTx = applyFir(pulse, Float64Array.from(cls.setting.tx.taps), derived.tx.pre);
  // FEXT aggressors follow the victim's FIR: the default's, given here since the channel carries it already.
  const aggressors = channelAggressors(input.worstChannel, pulse).map((a) =>
    a.kind === "fext" ? { ...a, txTaps: cls.setting.tx.taps } : a,
  );
  const run = tuningRun(
    withTx,
    receiverOnlyBudget(cornerBudget(derived, corner), cls.setting.ctle),
    onProgress,
    aggressors,
  );
  const worstEye: WorstEye = {
    channelId: input.worstChannel.id,
    channelName: input.worstChannel.name,
    className: cls.result.name,
    ...(input.corners ? { corner: corner.name } : {}),
    headroom_V: run.metrics.limiterHeadroom_V,
    eyeHeight_V: run.metrics.eyeHeight_V,
    before: run.eyes.before,
    after: run.eyes.after,
  };
  onProgress(1);
  return {
    engineVersion: ENGINE_VERSION,
    requiredHeadroom_V: budget.requiredHeadroom_V,
    targetBer: budget.targetBer,
    classes: input.classes.map((c) => c.result),
    worstEye,
  };
}

/** The version job's input: its classes' results, or (a version queued before parts existed) its inputs. */
export type TableVersionJob = TableVersionInput | { whole: VersionInputs };

/** The version job's work. */
export function computeTableVersionJob(input: TableVersionJob, onProgress: (fraction: number) => void): VersionResult {
  return "whole" in input ? computeTapTableVersion(input.whole, onProgress) : finishTableVersion(input, onProgress);
}

/** The basis of a version's steps, from its inputs. */
export function tableBasis(inputs: VersionInputs): TableBasis {
  return { budget: inputs.budget.params, architecture: inputs.architecture, corners: inputs.corners ?? null };
}

/**
 * The whole version in one go (the demo seed computes its hand-off here): the same three steps, for
 * versions whose corners need no Touchstone file (`touchstone` gives a channel's text when they do).
 */
export function computeTapTableVersion(
  inputs: VersionInputs,
  onProgress: (fraction: number) => void,
  touchstone: (channelId: number) => string | null = () => null,
): VersionResult {
  const basis = tableBasis(inputs);
  const withText = (ch: VersionChannel): TableChannel => ({ ...ch, touchstone: touchstone(ch.id) });
  const total = inputs.classes.reduce((n, c) => n + c.channels.length, 0);
  let done = 0;
  const classes = inputs.classes.map((cls, index) => {
    const weight = cls.channels.length;
    const channels = cls.channels.map(withText);
    const own = channels.map((channel) => computeTableMember({ ...basis, channel }, () => {}));
    const r = computeTableClass(
      { ...basis, registerMap: inputs.registerMap, index, cls: { ...cls, channels }, own },
      (f) => onProgress(((done + f * weight) / total) * (1 - EYE_SHARE)),
    );
    done += weight;
    return r;
  });
  const w = worstOf(classes);
  return finishTableVersion(
    { ...basis, classes, worstChannel: withText(inputs.classes[w.classIndex].channels[w.channelIndex]) },
    (f) => onProgress(1 - EYE_SHARE + EYE_SHARE * f),
  );
}
