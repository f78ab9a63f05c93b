// What the joint search has found so far: the best setting per objective, the top list, each CTLE
// setting's best and its pruned bound, the threshold a setting must beat, and the work counters.
import type { PhaseEye } from "../evaluateSetting.ts";
import type { Candidate, CtleOutcome, JointSearchResult } from "../jointSearch.ts";
import type { CtleSetting } from "../searchSpace.ts";

/** Work done by a search. */
export interface SearchStats {
  /** Exact eyes evaluated. */
  exact: number;
  /** Single-law (heavy) bounds computed. */
  heavy: number;
  /** Boxes bounded. */
  boxes: number;
  /** Settings reached (each counted once per CTLE setting). */
  leaves: number;
}

/** What the bookkeeping keeps of an evaluated eye. */
export type EyeFigures = Pick<PhaseEye, "phase" | "dfeTaps" | "dfeClipped" | "eyeHeight_V" | "limiterHeadroom_V">;

/**
 * The search's results and its thresholds. Objective `o` is the DFE count `dfeCounts[o]`; the first
 * objective keeps the `topCount` best settings, the others only their best. In feasibility mode
 * (`target_V` given) every objective's threshold is the target, and the first setting that reaches
 * it ends the search ({@link targetReached}).
 */
export class SearchResults {
  /** Best setting per objective. */
  readonly best: (Candidate | null)[];
  /** The first objective's best settings, best first. */
  readonly top: Candidate[] = [];
  readonly stats: SearchStats = { exact: 0, heavy: 0, boxes: 0, leaves: 0 };
  /** True once a setting reached the feasibility target: nothing more is recorded or searched. */
  targetReached = false;
  /** Per objective and CTLE setting: its best setting, and the largest bound of what was pruned there. */
  readonly #found: (Candidate | null)[][];
  readonly #pruned: Float64Array[];

  /**
   * @param dfeCounts - DFE tap count per objective.
   * @param ctleCount - number of CTLE settings.
   * @param topCount - size of the top list.
   * @param target_V - feasibility target (volts), or undefined to optimize.
   */
  constructor(
    readonly dfeCounts: readonly number[],
    ctleCount: number,
    readonly topCount: number,
    readonly target_V: number | undefined,
  ) {
    this.best = dfeCounts.map(() => null);
    this.#found = dfeCounts.map(() => new Array<Candidate | null>(ctleCount).fill(null));
    this.#pruned = dfeCounts.map(() => new Float64Array(ctleCount).fill(Number.NEGATIVE_INFINITY));
  }

  /** Headroom of the last setting of a full top list (−∞ while it is not full). */
  kthBest(): number {
    const top = this.top;
    return top.length < this.topCount ? Number.NEGATIVE_INFINITY : top[top.length - 1].limiterHeadroom_V;
  }

  /** What objective `o`'s figure must beat: the target, the k-th best (first objective) or the best. */
  threshold(o: number): number {
    if (this.target_V !== undefined) return this.target_V;
    if (o === 0) return this.kthBest();
    const b = this.best[o];
    return b === null ? Number.NEGATIVE_INFINITY : b.limiterHeadroom_V;
  }

  /** Whether a bound (or figure) `value_V` for objective `o` can still enter the result. */
  canEnter(o: number, value_V: number): boolean {
    return this.target_V !== undefined ? value_V >= this.target_V : value_V > this.threshold(o);
  }

  /** Where a box bound for objective `o` may stop tightening: at or below it the box is dropped anyway. */
  stopAt(o: number): number {
    return this.target_V !== undefined ? this.target_V - Number.EPSILON : this.threshold(o);
  }

  /** Records the exact figure of a setting for objective `o` (its worst member's eye). */
  record(
    ctleIndex: number,
    ctle: CtleSetting,
    o: number,
    taps: Float64Array,
    eye: EyeFigures,
    worstMember: number,
  ): void {
    const cand: Candidate = {
      ctleIndex,
      ctle,
      taps: Float64Array.from(taps),
      dfeCount: this.dfeCounts[o],
      phase: eye.phase,
      dfeTaps: eye.dfeTaps,
      dfeClipped: eye.dfeClipped,
      eyeHeight_V: eye.eyeHeight_V,
      limiterHeadroom_V: eye.limiterHeadroom_V,
      worstMember,
    };
    const f = this.#found[o][ctleIndex];
    if (f === null || eye.limiterHeadroom_V > f.limiterHeadroom_V) this.#found[o][ctleIndex] = cand;
    const b = this.best[o];
    if (b === null || eye.limiterHeadroom_V > b.limiterHeadroom_V) this.best[o] = cand;
    if (o === 0) this.#pushTop(cand);
    if (this.target_V !== undefined && eye.limiterHeadroom_V >= this.target_V) this.targetReached = true;
  }

  /** Notes that settings of CTLE setting `ctleIndex` bounded by `bound_V` were dropped for objective `o`. */
  prune(ctleIndex: number, o: number, bound_V: number): void {
    if (bound_V > this.#pruned[o][ctleIndex]) this.#pruned[o][ctleIndex] = bound_V;
  }

  /** The search's answer: per objective the best (none below a feasibility target) and every CTLE setting's outcome. */
  result(): JointSearchResult {
    const best = [...this.best];
    if (this.target_V !== undefined && best[0] !== null && best[0].limiterHeadroom_V < this.target_V) best[0] = null;
    const perCtle: CtleOutcome[][] = this.#found.map((found, o) =>
      found.map((f, ci) => {
        const v = f === null ? Number.NEGATIVE_INFINITY : f.limiterHeadroom_V;
        const pruned = this.#pruned[o][ci];
        return { best: f, upperBound_V: Math.max(v, pruned), exact: f !== null && v >= pruned };
      }),
    );
    return { best, perCtle, top: this.top, stats: this.stats };
  }

  #pushTop(c: Candidate): void {
    const top = this.top;
    if (top.length >= this.topCount && !(c.limiterHeadroom_V > this.kthBest())) return;
    let i = top.length;
    while (i > 0 && top[i - 1].limiterHeadroom_V < c.limiterHeadroom_V) i--;
    top.splice(i, 0, c);
    if (top.length > this.topCount) top.pop();
  }
}
