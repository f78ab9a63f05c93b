// The constants of the headroom bounds for one CTLE channel: which equalized cursors they watch,
// which jitter phases give a bound, and the noise quantiles and binning slack per cursor count.
import { qFromBer } from "../../analysis/ber.ts";
import { jitterKernel } from "../../analysis/jitterKernel.ts";
import type { CtleChannel } from "../ctleChannel.ts";
import { kernelFloorOf } from "../evaluateSetting.ts";
import type { SearchSpace } from "../searchSpace.ts";

/**
 * Per CTLE channel: which equalized cursors the bound looks at, and the constants of the bound.
 *
 * The bound rests on three facts about the eye's upper edge `top = L·g₀ + q` (`q` the lower
 * `b`-quantile of ISI plus noise `X + n`, `X` symmetric and independent of `n`, `b` the edge's
 * conditional tail at the target BER, `space.edgeTail`):
 * 1. `P(Y + n < x) ≥ min(Φ(x/σ), ¼)` for any symmetric `Y` (Φ is convex below its ¼-quantile);
 * 2. for any `k` residual cursors `S`, all of them at their adverse extreme has probability `m^−k`
 *    (m = 2 for NRZ, 4 for PAM4), so with fact 1 for the rest: `q ≤ −Σ_S|r| − σ·Q(b·m^k)` whenever
 *    `b·m^k ≤ ¼` (k = 0 is fact 1 alone: `q ≤ −σ·Q(b)`);
 * 3. under jitter the tail is a mixture over phases `t + j` with weights `w_j`, so the edge at phase t
 *    is no higher than the bound at any single phase `t + j` with `b/w_j`; the least of them counts.
 * The computed eye puts the ISI on a grid of step Δ: a two-point part of at least one step sits on
 * the nodes `±s` and `±(s + 1)` with `P(part ≤ −s) = ½` and `s·Δ > |m| − Δ`, a smaller one joins
 * the Gaussian (holding it adverse is holding that Gaussian at or below 0, probability ½, which
 * gives away less than Δ), and the Gaussian's rms is at least σ, so facts 1 and 2 hold for the
 * computed law with each held part costing at most Δ (a PAM4 cursor is two parts); the quantile is
 * interpolated between nodes (less than Δ). So the bound of `k` cursors adds `2(k + 1)·Δ` (NRZ) or
 * `(4k + 2)·Δ` (PAM4), with Δ bounded from above (`binStepBound`).
 */
export interface BoundSetup {
  /** Number of FIR taps. */
  readonly tapCount: number;
  /** Offsets (relative to the main cursor) of the equalized cursors used; offset 0 first. */
  readonly offsets: Int32Array;
  /** Jitter phase offsets `j` (samples) whose weight gives a bound (`b/w_j ≤ ¼`), outermost first, and their weights. */
  readonly shifts: Int32Array;
  readonly weights: Float64Array;
  /** `σ·Q(b·m^k/w_j)` of fact 2 at `[j·offsets.length + k]` (k = 0 for fact 1); NaN where it gives nothing. */
  readonly qSigma: Float64Array;
  /** Binning slack in grid steps for a bound over k cursors: `slack[k]·Δ`. */
  readonly slack: Float64Array;
  /** Noise rms of the channel: the law's Gaussian is at least this (facts 1 and 2), volts. */
  readonly noiseRms_V: number;
  /** The law's Gaussian is at most this (with every aggressor's lumped parts at their largest; for the grid step), volts. */
  readonly noiseHigh_V: number;
  /**
   * Parts of the aggressors whose FIR is fixed (volts, largest first): independent two-point parts
   * the bound may hold adverse like residual cursors (each at probability ½ ≥ 1/m).
   */
  readonly crosstalkParts_V: Float64Array;
  /** Upper bound on the total of every aggressor's parts (fixed, and FEXT following any FIR of the grid), volts. */
  readonly crosstalkSpan_V: number;
  /** Level spacing: the eye is `levelGap·g₀ + 2q`. */
  readonly levelGap: number;
  readonly sensitivity_V: number;
  /** DFE limits (volts). */
  readonly limits_V: Float64Array;
}

/** Offsets of pre-cursors and of post-cursors beyond the DFE span that the bound watches. */
const WATCHED_BEYOND = 3;

/**
 * Bound constants for one CTLE channel, for DFE counts up to `maxDfe` (see {@link BoundSetup}).
 *
 * @param space - the resolved budget (BER target, modulation, jitter, DFE limits).
 * @param channel - the channel through one CTLE setting (its noise at the limiter).
 * @param maxDfe - the largest DFE tap count the bounds will be asked for.
 */
export function boundSetup(space: SearchSpace, channel: CtleChannel, maxDfe: number): BoundSetup {
  const tapCount = space.firSpec.pre + 1 + space.firSpec.post;
  const offsets: number[] = [0];
  for (let k = 1; k <= WATCHED_BEYOND; k++) offsets.push(-k);
  for (let k = 1; k <= maxDfe + WATCHED_BEYOND; k++) offsets.push(k);
  const watchedCount = offsets.length;
  const ber = space.edgeTail; // the conditional tail of one eye edge at the target BER
  const kernel = jitterKernel(space.jitter, channel.pulse.samplesPerUi, 0, kernelFloorOf(space));
  // Phases whose weight gives a bound, outermost first: their worse eyes usually bound lowest.
  const usable = Array.from(kernel.weights, (w, i) => ({ shift: kernel.first + i, w })).filter(
    (x) => ber / x.w <= 0.25,
  );
  usable.sort((a, b) => Math.abs(b.shift) - Math.abs(a.shift) || a.shift - b.shift);
  const shifts = usable.map((x) => x.shift);
  const weights = usable.map((x) => x.w);
  const crosstalk = crosstalkBounds(channel);
  const sigma = crosstalk.noiseLow_V;
  const levelsPerCursor = space.modulation === "pam4" ? 4 : 2;
  const qSigma = new Float64Array(shifts.length * watchedCount);
  weights.forEach((w, j) => {
    for (let k = 0; k < watchedCount; k++) {
      const arg = (ber / w) * levelsPerCursor ** k;
      qSigma[j * watchedCount + k] = arg <= 0.25 ? sigma * qFromBer(arg) : Number.NaN;
    }
  });
  const slack = Float64Array.from({ length: watchedCount }, (_, k) =>
    levelsPerCursor === 2 ? 2 * (k + 1) : 4 * k + 2,
  );
  return {
    tapCount,
    offsets: Int32Array.from(offsets),
    shifts: Int32Array.from(shifts),
    weights: Float64Array.from(weights),
    qSigma,
    slack,
    noiseRms_V: sigma,
    noiseHigh_V: crosstalk.noiseHigh_V,
    crosstalkParts_V: crosstalk.parts_V,
    crosstalkSpan_V: crosstalk.span_V,
    levelGap: space.levelGap,
    sensitivity_V: space.budget.limiterSensitivity_V,
    limits_V: space.dfeLimits_V,
  };
}

/**
 * What the bounds know of a channel's crosstalk before the transmit FIR is chosen. The fixed
 * aggressors' parts and lumped variance are exact. A FEXT aggressor that follows the victim's FIR
 * `c` (Σ|c| ≤ 1) has cursors `x = f * c` at its worst phase, so `Σ|x| ≤ max_t Σ_k |f(t + k·UI)|` and
 * `Σx² ≤ max_t Σ_k f(t + k·UI)²` (Minkowski): these bound its share of the law's span and of the
 * lumped Gaussian from above, and 0 bounds them from below.
 */
function crosstalkBounds(channel: CtleChannel): {
  parts_V: Float64Array;
  span_V: number;
  noiseLow_V: number;
  noiseHigh_V: number;
} {
  const sigma = channel.noiseRms_V;
  const x = channel.crosstalk;
  if (x === null) return { parts_V: new Float64Array(0), span_V: 0, noiseLow_V: sigma, noiseHigh_V: sigma };
  const parts_V = Float64Array.from(x.fixed.parts_V).sort().reverse();
  let span_V = 0;
  for (const m of parts_V) span_V += m;
  let energy = 0;
  for (const a of x.aggressors) {
    if (!a.followsVictimFir) continue;
    const v = a.pulse.values_V;
    const spu = a.pulse.samplesPerUi;
    let sumMax = 0;
    let energyMax = 0;
    for (let ph = 0; ph < spu; ph++) {
      let s = 0;
      let e = 0;
      for (let i = ph; i < v.length; i += spu) {
        s += Math.abs(v[i]);
        e += v[i] * v[i];
      }
      if (s > sumMax) sumMax = s;
      if (e > energyMax) energyMax = e;
    }
    span_V += sumMax;
    energy += energyMax;
  }
  const low = sigma * sigma + x.fixed.lumpedVariance_V2;
  return { parts_V, span_V, noiseLow_V: Math.sqrt(low), noiseHigh_V: Math.sqrt(low + energy) };
}
