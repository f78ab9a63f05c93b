// The receive FFE of one CTLE setting: the feed-forward filter of an MMSE-DFE designed on the CTLE's
// output, against the noise and crosstalk that actually reach it.
import { PAM4_INNER_LEVEL } from "../analysis/isiParts.ts";
import { worstPhaseSampling } from "../crosstalk/aggressorSampling.ts";
import { cursorsAt } from "../pulse/cursorsAt.ts";
import { mmseDfe } from "../solvers/mmseDfe.ts";
import type { Pulse } from "../types.ts";
import type { SearchSpace } from "./searchSpace.ts";

/** A receive FFE: symbol-spaced taps, main tap `taps[pre]`. */
export interface ReceiveFfe {
  readonly taps: Float64Array;
  readonly pre: number;
}

/** Symbol-spaced cursors taken around the main cursor for the design. */
const DESIGN_SPAN = { pre: 16, post: 96 } as const;

/**
 * The FFE for one CTLE output: the MMSE-DFE feed-forward filter (`mmseDfe`, as many feedback taps as
 * the budget's DFE) on the CTLE output's cursors at its main cursor times the transmit amplitude
 * (a plain transmit FIR), for unit-power symbols of the budget's modulation, against the front-end
 * noise's correlation `noise_V2` plus each aggressor's (`E_s·Σ_k x_k·x_{k+m}` of its cursors at its
 * worst phase). The DFE's tap limits are honoured by leaving out of the feedback every post-cursor
 * the design would make larger than its tap may cancel, and designing again (at most one pass per
 * DFE tap). The taps are then scaled so that the equalized main cursor equals the CTLE output's (an
 * unbiased slicer); a singular system gives the plain FFE.
 *
 * @param ctleOut - the CTLE output for a 1 V symbol (main cursor at its `mainIndex`).
 * @param space - the resolved budget (`space.ffe` non-null).
 * @param noise_V2 - front-end noise correlation at the FFE's input, lags 0 … pre + post.
 * @param aggressors - the aggressors at the FFE's input, in volts (swing applied).
 * @see N. Al-Dhahir and J. M. Cioffi, "MMSE decision-feedback equalizers: finite-length results",
 *   IEEE Trans. Inform. Theory 41(4), 1995 [memory: recalled, not re-read].
 */
export function designReceiveFfe(
  ctleOut: Pulse,
  space: SearchSpace,
  noise_V2: Float64Array,
  aggressors: readonly Pulse[],
): ReceiveFfe {
  const spec = space.ffe;
  if (spec === null) throw new RangeError("the budget has no receive FFE");
  const n = spec.pre + 1 + spec.post;
  const plain = Float64Array.from({ length: n }, (_, j) => (j === spec.pre ? 1 : 0));
  const spu = ctleOut.samplesPerUi;
  const pre = Math.min(DESIGN_SPAN.pre, Math.floor(ctleOut.mainIndex / spu));
  const cursors = cursorsAt(ctleOut, ctleOut.mainIndex, pre, DESIGN_SPAN.post);
  const h = Float64Array.from(cursors.h, (v) => v * space.scale_V);
  const es = space.modulation === "pam4" ? (1 + PAM4_INNER_LEVEL ** 2) / 2 : 1;
  const r = Float64Array.from({ length: n }, (_, m) => (m < noise_V2.length ? noise_V2[m] : 0));
  for (const a of aggressors) {
    const x = worstPhaseSampling(a).cursors;
    for (let m = 0; m < n; m++) {
      let s = 0;
      for (let k = 0; k + m < x.length; k++) s += x[k] * x[k + m];
      r[m] += es * s;
    }
  }
  const N = space.dfeCount;
  const cancelled = new Array<boolean>(N).fill(true);
  try {
    for (let pass = 0; pass <= N; pass++) {
      const d = mmseDfe(
        { h, main: cursors.main },
        { pre: spec.pre, post: spec.post, feedbackTaps: N, cancelled, noiseCorrelation_V2: r, symbolPower: es },
      );
      const g = d.equalized;
      const gain = g.h[g.main];
      if (!(Math.abs(gain) > 1e-12 * Math.abs(h[cursors.main]))) return { taps: plain, pre: spec.pre };
      const scale = h[cursors.main] / gain;
      // A post-cursor beyond its tap's limit (after the unbiasing scale) cannot be cancelled: design without it.
      let changed = false;
      for (let k = 0; k < N; k++) {
        const i = g.main + 1 + k;
        const v = i < g.h.length ? Math.abs(g.h[i] * scale) : 0;
        if (cancelled[k] && v > space.dfeLimits_V[k]) {
          cancelled[k] = false;
          changed = true;
        }
      }
      if (!changed) return { taps: Float64Array.from(d.taps, (c) => c * scale), pre: spec.pre };
    }
  } catch (e) {
    if (e instanceof RangeError) return { taps: plain, pre: spec.pre };
    throw e;
  }
  return { taps: plain, pre: spec.pre };
}

/** `cᵀ·R·c` for the Toeplitz correlation `r` (lags beyond it are 0): the variance after the FFE. */
export function ffeNoiseVariance(ffe: ReceiveFfe, r: Float64Array): number {
  const c = ffe.taps;
  let s = 0;
  for (let i = 0; i < c.length; i++) {
    for (let j = 0; j < c.length; j++) {
      const m = Math.abs(i - j);
      if (m < r.length) s += c[i] * c[j] * r[m];
    }
  }
  return s;
}
