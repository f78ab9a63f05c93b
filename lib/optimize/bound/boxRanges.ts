// The box-range cache: the range over one box of every watched cursor at any phase, and of each
// cursor's change between a sampling phase and a jitter phase, computed once per box.
import type { BoundSetup } from "./boundSetup.ts";
import type { CoefficientSource } from "./phaseCoefficients.ts";
import { affineRangeInto, type TapBox } from "./tapBox.ts";

/**
 * The ranges over one box of every watched cursor at any absolute phase, computed when first asked
 * and shared by every sampling phase, jitter phase and DFE count the box is bounded for; and the
 * ranges of each cursor's change between a sampling phase and a jitter phase around it (what a DFE
 * tap set at the sampling phase leaves at the jitter phase, when the tap does not clip).
 */
export class BoxRanges {
  /** Per phase, `2·watched + 1` numbers: `[lo, hi]` of each watched cursor `f`, then the tail bound. */
  readonly values: Float64Array;
  /** Per (sampling phase, jitter phase index), `2·watched` numbers: `[lo, hi]` of cursor f at t + shift minus at t. */
  readonly diffs: Float64Array;
  readonly #setup: BoundSetup;
  readonly #coefficients: CoefficientSource;
  readonly #minPhase: number;
  readonly #phaseCount: number;
  readonly #stamp: Int32Array;
  readonly #diffStamp: Int32Array;
  /** Per (sampling phase, jitter phase index), the coefficients of the changes (computed once). */
  readonly #diffVec: (Float64Array | undefined)[];
  /** The joint figure's coefficients per tap (working memory of {@link jointMax}). */
  readonly #joint: Float64Array;
  readonly #pair = new Float64Array(2);
  #serial = 0;
  #box: TapBox | null = null;

  /**
   * @param setup - the channel's bound constants.
   * @param coefficients - its watched cursors' coefficients per phase.
   * @param minPhase - lowest absolute phase (samples) asked for.
   * @param maxPhase - highest.
   */
  constructor(setup: BoundSetup, coefficients: CoefficientSource, minPhase: number, maxPhase: number) {
    const watchedCount = setup.offsets.length;
    this.#setup = setup;
    this.#coefficients = coefficients;
    this.#minPhase = minPhase;
    this.#phaseCount = maxPhase - minPhase + 1;
    this.values = new Float64Array(this.#phaseCount * (2 * watchedCount + 1));
    this.#stamp = new Int32Array(this.#phaseCount);
    this.diffs = new Float64Array(this.#phaseCount * setup.shifts.length * 2 * watchedCount);
    this.#diffStamp = new Int32Array(this.#phaseCount * setup.shifts.length);
    this.#diffVec = new Array<Float64Array | undefined>(this.#phaseCount * setup.shifts.length);
    this.#joint = new Float64Array(setup.tapCount);
  }

  /** Starts a new box (its ranges are computed afresh). */
  reset(box: TapBox): void {
    this.#box = box;
    this.#serial++;
  }

  /** Offset in `values` of phase `p`'s numbers. */
  at(p: number): number {
    const slot = p - this.#minPhase;
    if (!(slot >= 0 && slot < this.#phaseCount)) {
      throw new RangeError(
        `phase ${p} is outside the box table's ${this.#minPhase} … ${this.#minPhase + this.#phaseCount - 1}`,
      );
    }
    const watchedCount = this.#setup.offsets.length;
    const tapCount = this.#setup.tapCount;
    const o = slot * (2 * watchedCount + 1);
    if (this.#stamp[slot] !== this.#serial) {
      const box = this.#box as TapBox;
      const pc = this.#coefficients(p);
      for (let f = 0; f < watchedCount; f++) affineRangeInto(box, pc.v, f * tapCount, this.values, o + 2 * f);
      this.values[o + 2 * watchedCount] = pc.tail;
      this.#stamp[slot] = this.#serial;
    }
    return o;
  }

  /**
   * Largest values over the box of `gap·g₀(p) − 2·Σ_{i<k} sign_i·r_i` for k = 1 … n, written to
   * `out[k − 1]`, where `r_i` is watched cursor `cursors[i]` at phase `p = t + shifts[shiftIndex]`
   * (`change[i]` 0) or its change from `t` to `p` (1): affine functions of the taps, so the maxima
   * are exact.
   */
  jointMax(
    t: number,
    shiftIndex: number,
    gap: number,
    cursors: Int32Array,
    signs: Float64Array,
    change: Uint8Array,
    n: number,
    out: Float64Array,
  ): void {
    const tapCount = this.#setup.tapCount;
    const v = this.#coefficients(t + this.#setup.shifts[shiftIndex]).v;
    const w = this.#joint;
    for (let j = 0; j < tapCount; j++) w[j] = gap * v[j];
    for (let i = 0; i < n; i++) {
      const d = change[i] === 1 ? this.#changeCoefficients(t, shiftIndex) : v;
      const o = cursors[i] * tapCount;
      const s = 2 * signs[i];
      for (let j = 0; j < tapCount; j++) w[j] -= s * d[o + j];
      affineRangeInto(this.#box as TapBox, w, 0, this.#pair, 0);
      out[i] = this.#pair[1];
    }
  }

  /** Coefficients of every watched cursor's change from `t` to `t + shifts[shiftIndex]` (computed once). */
  #changeCoefficients(t: number, shiftIndex: number): Float64Array {
    const shiftCount = this.#setup.shifts.length;
    const slot = (t - this.#minPhase) * shiftCount + shiftIndex;
    let v = this.#diffVec[slot];
    if (v === undefined) {
      const size = this.#setup.offsets.length * this.#setup.tapCount;
      const a = this.#coefficients(t + this.#setup.shifts[shiftIndex]).v;
      const b = this.#coefficients(t).v;
      v = new Float64Array(size);
      for (let i = 0; i < size; i++) v[i] = a[i] - b[i];
      this.#diffVec[slot] = v;
    }
    return v;
  }

  /** Offset in `diffs` of the changes from phase `t` to `t + shifts[shiftIndex]`. */
  diff(t: number, shiftIndex: number): number {
    const shiftCount = this.#setup.shifts.length;
    const watchedCount = this.#setup.offsets.length;
    const tapCount = this.#setup.tapCount;
    const slot = (t - this.#minPhase) * shiftCount + shiftIndex;
    const o = slot * 2 * watchedCount;
    if (this.#diffStamp[slot] !== this.#serial) {
      const v = this.#changeCoefficients(t, shiftIndex);
      const box = this.#box as TapBox;
      // Only the cursors a DFE tap may cancel (offsets 1 … number of DFE limits).
      const offsets = this.#setup.offsets;
      const dfe = this.#setup.limits_V.length;
      for (let f = 1; f < watchedCount; f++) {
        if (offsets[f] >= 1 && offsets[f] <= dfe) affineRangeInto(box, v, f * tapCount, this.diffs, o + 2 * f);
      }
      this.#diffStamp[slot] = this.#serial;
    }
    return o;
  }
}
