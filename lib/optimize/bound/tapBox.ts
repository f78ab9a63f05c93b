// A box of transmit FIR settings and its algebra: the taps as an affine function of the free side
// taps, and the exact range over the box of any linear functional of the taps.

/**
 * Taps as an affine function of the free side taps over a box: `c = base + Σ_s x_s·dir_s`, with the
 * main tap following the side taps (`c_main = 1 − Σ|side|` on a box where each side tap keeps its
 * sign). The box gives each free side tap an interval. A box is a reusable buffer: the first
 * `count` entries of `free`, `lo`, `hi` and `mainSlope` are in use.
 */
export interface TapBox {
  /** Taps at the box's reference point (free side taps 0; their values come from `lo`/`hi`). */
  readonly base: Float64Array;
  /** Indices of the free side taps and, per free tap, its interval and the main tap's slope. */
  readonly free: Int32Array;
  readonly lo: Float64Array;
  readonly hi: Float64Array;
  readonly mainSlope: Float64Array;
  /** Number of free side taps. */
  count: number;
  /** Main tap index; an extra interval `[mainLo, 0]` on the main tap covers grid flooring and caps. */
  readonly main: number;
  mainLo: number;
}

/** An empty box for FIRs of `tapCount` taps with the main tap at `main`. */
export function createTapBox(tapCount: number, main: number): TapBox {
  return {
    base: new Float64Array(tapCount),
    free: new Int32Array(tapCount),
    lo: new Float64Array(tapCount),
    hi: new Float64Array(tapCount),
    mainSlope: new Float64Array(tapCount),
    count: 0,
    main,
    mainLo: 0,
  };
}

/**
 * Exact range over the box of `Σ_j c_j·coefficients[offset + j]` (j over the box's taps), written to
 * `out[at]` (least) and `out[at + 1]` (largest), for tables of ranges filled in place.
 */
export function affineRangeInto(
  box: TapBox,
  coefficients: Float64Array,
  offset: number,
  out: Float64Array,
  at: number,
): void {
  const tapCount = box.base.length;
  let c = 0;
  for (let j = 0; j < tapCount; j++) c += box.base[j] * coefficients[offset + j];
  let lo = c;
  let hi = c;
  const onMain = coefficients[offset + box.main];
  for (let s = 0; s < box.count; s++) {
    const coef = coefficients[offset + box.free[s]] + box.mainSlope[s] * onMain;
    const a = coef * box.lo[s];
    const b = coef * box.hi[s];
    if (a < b) {
      lo += a;
      hi += b;
    } else {
      lo += b;
      hi += a;
    }
  }
  const m = box.mainLo * onMain;
  if (m < 0) lo += m;
  else hi += m;
  out[at] = lo;
  out[at + 1] = hi;
}
