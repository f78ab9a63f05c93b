// An architecture study: for a set of channels and one budget, how much limiter headroom each
// candidate equalizer architecture leaves (worst case and median), against its complexity.
import type { BudgetInput } from "../contract/budget.ts";
import type { LinkAggressor } from "../crosstalk/linkAggressor.ts";
import { jointSearch } from "../optimize/jointSearch.ts";
import { prepareChannels } from "../optimize/prepareChannels.ts";
import { resolveBudget, searchSpace } from "../optimize/searchSpace.ts";
import type { Pulse } from "../types.ts";
import { aggressorsOnGrid, commonGrid } from "./populationDefault.ts";

/** A candidate architecture: which blocks the link has and their tap counts. */
export interface ArchitectureCandidate {
  /** Identifier of the candidate (echoed in the outcome). */
  readonly key: string;
  /** Transmit FIR tap counts (null: no de-emphasis, a single full-swing tap). */
  readonly tx: { readonly pre: number; readonly post: number } | null;
  /** Whether the receiver has the budget's CTLE (else a flat front end). */
  readonly ctle: boolean;
  /** DFE taps (0: none). */
  readonly dfeTaps: number;
  /** Receive FFE tap counts (null: none). */
  readonly ffe: { readonly pre: number; readonly post: number } | null;
}

/** One candidate's figures over the channels. */
export interface ArchitectureOutcome {
  readonly key: string;
  /** Adjustable taps and gains: transmit side taps + CTLE (1) + DFE taps + receive FFE side taps. */
  readonly complexity: number;
  readonly worstHeadroom_V: number;
  readonly medianHeadroom_V: number;
  /** Index of the channel with the worst headroom. */
  readonly worstChannel: number;
  /** Each channel's best headroom under this architecture, in the order given. */
  readonly headroom_V: number[];
}

/** Complexity figure of a candidate (see {@link ArchitectureOutcome.complexity}). */
export function architectureComplexity(a: ArchitectureCandidate): number {
  return (a.tx ? a.tx.pre + a.tx.post : 0) + (a.ctle ? 1 : 0) + a.dfeTaps + (a.ffe ? a.ffe.pre + a.ffe.post : 0);
}

/** A front end without a CTLE: zero on the first pole and the second pole far beyond any band. */
const FLAT_CTLE = { gDc_dB: [0, 0, 1] as [number, number, number], fz_Hz: 1e9, fp1_Hz: 1e9, fp2_Hz: 1e18 };

function median(v: readonly number[]): number {
  const s = [...v].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 === 1 ? s[m] : (s[m - 1] + s[m]) / 2;
}

function checkCandidate(a: ArchitectureCandidate, i: number): void {
  const name = `candidates[${i}]`;
  if (a === null || typeof a !== "object") throw new TypeError(`${name} must be an object`);
  const counts = (x: { pre: number; post: number } | null, what: string, max: number) => {
    if (x === null) return;
    if (!Number.isInteger(x.pre) || !Number.isInteger(x.post) || x.pre < 0 || x.post < 0 || x.pre + x.post > max) {
      throw new RangeError(`${name}.${what} must hold integer pre/post counts (at most ${max} side taps)`);
    }
  };
  counts(a.tx, "tx", 12);
  counts(a.ffe, "ffe", 24);
  if (!Number.isInteger(a.dfeTaps) || a.dfeTaps < 0 || a.dfeTaps > 32)
    throw new RangeError(`${name}.dfeTaps must be an integer 0…32`);
  if (typeof a.ctle !== "boolean") throw new RangeError(`${name}.ctle must be true or false`);
}

/**
 * Evaluates candidate architectures over channels under one budget: every channel is optimized on
 * its own for every candidate (the joint search of the budget's grids restricted to the candidate's
 * blocks), and the outcome gives the worst and median headroom.
 *
 * Blocks a candidate lacks become neutral: no transmit FIR is one full-swing tap; no CTLE is a flat
 * front end (the budget's noise and front-end noise apply unshaped). A receive FFE is the budget's
 * `ffe` in the joint search itself — the feed-forward filter of an MMSE-DFE with the candidate's DFE
 * taps, designed per CTLE setting against the noise and crosstalk that reach it, its noise the
 * front-end noise's correlation through it — the same model as a tuning run. DFE limits beyond the
 * budget's list repeat its last limit. Candidates that share transmit FIR, CTLE and FFE share one
 * search per channel (the DFE tap counts are searched together; with an FFE, whose design depends
 * on the feedback taps, one search per count). Each channel's aggressors are in every eye.
 *
 * @param pulses - the channels (same UI).
 * @param budget - the budget.
 * @param candidates - the architectures.
 * @param onProgress - progress 0 … 1.
 * @param aggressors - per channel (same order), its aggressors at the receiver's pins.
 */
export function evaluateArchitectures(
  pulses: readonly Pulse[],
  budget: BudgetInput,
  candidates: readonly ArchitectureCandidate[],
  onProgress: (fraction: number) => void = () => {},
  aggressors?: readonly (readonly LinkAggressor[])[],
): ArchitectureOutcome[] {
  const members = commonGrid(pulses);
  const memberAggressors = aggressorsOnGrid(members, aggressors);
  if (!Array.isArray(candidates) || candidates.length === 0)
    throw new RangeError("candidates must hold at least one architecture");
  candidates.forEach(checkCandidate);
  const b = resolveBudget(budget);
  const groupKey = (c: ArchitectureCandidate) =>
    JSON.stringify([c.tx, c.ctle, c.ffe, c.ffe === null ? null : c.dfeTaps]);
  const groups = new Map<string, { cand: ArchitectureCandidate; counts: Set<number> }>();
  for (const c of candidates) {
    const key = groupKey(c);
    const g = groups.get(key) ?? { cand: c, counts: new Set<number>() };
    g.counts.add(c.dfeTaps);
    groups.set(key, g);
  }
  const headroom = new Map<string, number[]>(); // group key + count → per channel
  const total = groups.size * members.length;
  let done = 0;
  for (const [gk, { cand, counts }] of groups) {
    const maxDfe = Math.max(...counts);
    const lim = b.dfe.limits_V;
    const limits =
      lim === undefined || typeof lim === "number" || lim.length === 0
        ? typeof lim === "number"
          ? lim
          : undefined
        : Array.from({ length: maxDfe }, (_, k) => lim[Math.min(k, lim.length - 1)]);
    const sameTx = cand.tx !== null && cand.tx.pre === b.tx.pre && cand.tx.post === b.tx.post;
    const derived: BudgetInput = {
      ...b,
      tx:
        cand.tx === null
          ? { pre: 0, post: 0, step: 0.5, ranges: [[1, 1]] as [number, number][] }
          : { pre: cand.tx.pre, post: cand.tx.post, step: b.tx.step, ranges: sameTx ? b.tx.ranges : undefined },
      ctle: cand.ctle ? b.ctle : FLAT_CTLE,
      dfe: { taps: maxDfe, limits_V: limits },
      ffe: cand.ffe ?? undefined,
    };
    const list = [...counts].sort((x, y) => x - y);
    const per = list.map(() => [] as number[]);
    members.forEach((pulse, i) => {
      const space = searchSpace(pulse, derived);
      const r = jointSearch(
        pulse,
        space,
        { dfeCounts: list, topCount: 1 },
        prepareChannels(pulse, space, memberAggressors[i]),
      );
      r.best.forEach((c, j) => per[j].push(c === null ? Number.NEGATIVE_INFINITY : c.limiterHeadroom_V));
      done++;
      onProgress(done / total);
    });
    list.forEach((n, j) => headroom.set(`${gk}|${n}`, per[j]));
  }
  return candidates.map((c) => {
    const h = headroom.get(`${groupKey(c)}|${c.dfeTaps}`) as number[];
    let worst = 0;
    h.forEach((v, i) => {
      if (v < h[worst]) worst = i;
    });
    return {
      key: c.key,
      complexity: architectureComplexity(c),
      worstHeadroom_V: h[worst],
      medianHeadroom_V: median(h),
      worstChannel: worst,
      headroom_V: h,
    };
  });
}
