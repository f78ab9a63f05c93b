// Levels of a 3-tap transmit FIR and the de-emphasis, pre-shoot and boost they define.
import { checkTaps } from "./checkTaps.ts";

/** Output levels and ratios of a transmit FIR with at most one pre- and one post-cursor tap. */
export interface FirLevels {
  /** `c0 + |c1| − |c−1|`: a long run's first bit after a transition, without pre-shoot. */
  readonly va: number;
  /** `c0 − |c1| − |c−1|`: the steady level of a long run. */
  readonly vb: number;
  /** `c0 + |c−1| − |c1|`: the level with pre-shoot only. */
  readonly vc: number;
  /** `Σ|c|`: the peak (maximum) level. */
  readonly vd: number;
  /** `20·log10(vb/va)` in dB (negative for de-emphasis). */
  readonly deEmphasis_dB: number;
  /** `20·log10(vc/vb)` in dB. */
  readonly preShoot_dB: number;
  /** `20·log10(vd/vb)` in dB. */
  readonly boost_dB: number;
}

/**
 * The transmitter levels Va…Vd of a FIR `[c−1, c0, c1]` (either side tap may be absent) and
 * the de-emphasis, pre-shoot and boost ratios derived from them.
 *
 * @param taps - 1 to 3 coefficients, main tap `taps[pre]`.
 * @param pre - 0 or 1.
 * @throws RangeError when `Vb ≤ 0` (the ratios would be undefined).
 * @see PCI Express Base Specification 3.0, transmitter equalization presets (the Va…Vd definitions).
 */
export function firLevels(taps: ArrayLike<number>, pre: number): FirLevels {
  checkTaps(taps, pre);
  const post = taps.length - 1 - pre;
  if (pre > 1 || post > 1) {
    throw new RangeError(
      `taps must have at most one pre- and one post-cursor tap for levels (pre ${pre}, post ${post})`,
    );
  }
  const cm = pre === 1 ? Math.abs(taps[0]) : 0;
  const c0 = taps[pre];
  const cp = post === 1 ? Math.abs(taps[pre + 1]) : 0;
  const va = c0 + cp - cm;
  const vb = c0 - cp - cm;
  const vc = c0 + cm - cp;
  const vd = Math.abs(c0) + cp + cm;
  if (!(vb > 0)) {
    throw new RangeError(`taps leave no positive steady level (Vb = ${vb}); the main tap must exceed |c−1| + |c1|`);
  }
  const db = (x: number) => 20 * Math.log10(x);
  return {
    va,
    vb,
    vc,
    vd,
    deEmphasis_dB: db(vb / va),
    preShoot_dB: db(vc / vb),
    boost_dB: db(vd / vb),
  };
}
