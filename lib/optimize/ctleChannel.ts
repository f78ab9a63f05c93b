// The channel after one CTLE setting (and the receive FFE, when the budget has one), prepared for a
// search: filtered once, noise at the limiter known, its aggressors at the sampler, and
// symbol-spaced cursors per sampling phase computed once and kept.
import { jitterKernel } from "../analysis/jitterKernel.ts";
import { aggressorLabel, type LinkAggressor } from "../crosstalk/linkAggressor.ts";
import { applyFir } from "../equalizers/applyFir.ts";
import { createCtlePlan } from "../equalizers/ctlePlan.ts";
import type { CtleParams } from "../equalizers/ctleResponse.ts";
import { applyFrontEnd } from "../package/frontEnd.ts";
import type { Pulse } from "../types.ts";
import { type ChannelCrosstalk, channelCrosstalk, receivedAggressor } from "./channelCrosstalk.ts";
import { designReceiveFfe, ffeNoiseVariance, type ReceiveFfe } from "./receiveFfe.ts";
import { receiverNoiseCorrelation } from "./receiverNoise.ts";
import type { CtleSetting, SearchSpace } from "./searchSpace.ts";

/** The channel through one CTLE setting (pulse for a 1 V symbol, before the transmit FIR). */
export interface CtleChannel {
  readonly setting: CtleSetting;
  readonly params: CtleParams;
  /** CTLE (and receive FFE) output for a 1 V symbol; `mainIndex` is its main cursor. */
  readonly pulse: Pulse;
  /** Noise rms at the limiter input with this CTLE (and FFE), volts. */
  readonly noiseRms_V: number;
  /** Noise-power gain of the receiver (package, bandwidth, CTLE, FFE) on the front-end noise (1 when there is none). */
  readonly noisePowerGain: number;
  /** The aggressors at the sampler (null: none). */
  readonly crosstalk: ChannelCrosstalk | null;
  /** The receive FFE designed for this CTLE setting (null: none). */
  readonly ffe: ReceiveFfe | null;
  /** Cursors per phase hold offsets `−pre … length − 1 − pre` around the main cursor. */
  readonly pre: number;
  readonly length: number;
  /**
   * Cursors of the CTLE output at phase `p` (samples from its main index): `h[i]` is the sample
   * `mainIndex + p + (i − pre)·samplesPerUi` (0 outside the record). Computed once per phase.
   */
  cursors(p: number): Float64Array;
}

/**
 * Largest phase offset (samples) any evaluation of a search space asks for: the ±½ UI window, the
 * jitter kernel's reach, and the timing criteria's one-UI lag.
 */
export function phaseReach(space: SearchSpace, samplesPerUi: number): number {
  const k = jitterKernel(space.jitter, samplesPerUi, 0);
  const kernel = Math.max(Math.abs(k.first), Math.abs(k.first + k.weights.length - 1));
  return Math.floor(samplesPerUi / 2) + kernel + samplesPerUi + 2;
}

/**
 * One CTLE channel of `pulse` (and its aggressors) for any setting (e.g. gains rounded to register
 * codes): through the budget's front end and the CTLE, then {@link receiverChannel}.
 */
export function channelFor(
  pulse: Pulse,
  space: SearchSpace,
  setting: CtleSetting,
  aggressors: readonly LinkAggressor[] = [],
): CtleChannel {
  const params: CtleParams = { ...space.ctleCorners, gDc_dB: setting.gDc_dB, gDc2_dB: setting.gDc2_dB };
  const through = (p: Pulse) => createCtlePlan(applyFrontEnd(p, space.frontEnd)).apply(params);
  const atCtle = aggressors.map((a) => ({ ...a, pulse: through(a.pulse) }));
  return receiverChannel(through(pulse), space, setting, phaseReach(space, pulse.samplesPerUi), atCtle);
}

/**
 * A channel from the pulse already through the front end and the CTLE setting `setting` (e.g. by
 * `ctleGridPulses`), with its aggressors likewise filtered: the receive FFE designed for it when the
 * budget has one ({@link designReceiveFfe}) and applied to the channel and every aggressor; the noise
 * at the limiter, `√(noiseRms_V² + cᵀ·R·c)` with `R` the front-end noise's correlation through the
 * receiver ({@link receiverNoiseCorrelation}; `c = [1]` without an FFE); each aggressor's transmitter
 * (swing, and its own FIR unless it follows the victim's); and the cursors per phase.
 *
 * @param filtered - the CTLE output for a 1 V symbol, `mainIndex` at its peak.
 * @param space - the resolved budget (corners, noise, FFE).
 * @param setting - the gains the pulse was filtered with.
 * @param maxPhase - largest |phase| in samples that will be asked for (sizes the cursor window).
 * @param aggressors - the aggressors, their pulses through the same front end and CTLE.
 */
export function receiverChannel(
  filtered: Pulse,
  space: SearchSpace,
  setting: CtleSetting,
  maxPhase: number,
  aggressors: readonly LinkAggressor[] = [],
): CtleChannel {
  if (!Number.isInteger(maxPhase) || maxPhase < 0)
    throw new RangeError(`maxPhase must be an integer ≥ 0, got ${maxPhase}`);
  const params: CtleParams = { ...space.ctleCorners, gDc_dB: setting.gDc_dB, gDc2_dB: setting.gDc2_dB };
  const b = space.budget;
  const ffeSpec = space.ffe;
  const r = receiverNoiseCorrelation(space, params, ffeSpec === null ? 0 : ffeSpec.pre + ffeSpec.post);
  const received = aggressors.map((a, i) =>
    receivedAggressor(
      { name: aggressorLabel(a, i), kind: a.kind, pulse: a.pulse, txTaps: a.txTaps },
      (p) => p,
      (a.txSwing_Vppd ?? b.txSwing_Vppd) / 2,
    ),
  );
  let pulse = filtered;
  let ffe: ReceiveFfe | null = null;
  let inputVariance = r[0];
  let atSampler = received;
  if (ffeSpec !== null) {
    ffe = designReceiveFfe(
      filtered,
      space,
      r,
      received.map((a) => a.pulse),
    );
    const f = ffe;
    pulse = applyFir(filtered, f.taps, f.pre);
    inputVariance = ffeNoiseVariance(f, r);
    atSampler = received.map((a) => ({ ...a, pulse: applyFir(a.pulse, f.taps, f.pre) }));
  }
  const sigmaIn = b.inputNoiseRms_V;
  const noisePowerGain = sigmaIn > 0 ? inputVariance / (sigmaIn * sigmaIn) : 1;
  const noiseRms_V = Math.sqrt(b.noiseRms_V * b.noiseRms_V + inputVariance);
  const crosstalk = atSampler.length === 0 ? null : channelCrosstalk(atSampler, space.modulation, noiseRms_V);
  return new FilteredChannel(setting, params, pulse, noiseRms_V, noisePowerGain, maxPhase, crosstalk, ffe);
}

/** {@link CtleChannel} with its cursors computed per phase on first use. */
class FilteredChannel implements CtleChannel {
  readonly pre: number;
  readonly length: number;
  readonly #cache = new Map<number, Float64Array>();
  readonly #maxPhase: number;

  constructor(
    readonly setting: CtleSetting,
    readonly params: CtleParams,
    readonly pulse: Pulse,
    readonly noiseRms_V: number,
    readonly noisePowerGain: number,
    maxPhase: number,
    readonly crosstalk: ChannelCrosstalk | null,
    readonly ffe: ReceiveFfe | null,
  ) {
    const spu = pulse.samplesPerUi;
    const m = pulse.mainIndex;
    this.pre = Math.ceil((m + maxPhase) / spu) + 1;
    this.length = this.pre + Math.ceil((pulse.values_V.length - m + maxPhase) / spu) + 2;
    this.#maxPhase = maxPhase;
  }

  cursors(p: number): Float64Array {
    let h = this.#cache.get(p);
    if (h !== undefined) return h;
    if (!Number.isInteger(p) || Math.abs(p) > this.#maxPhase) {
      throw new RangeError(`phase ${p} is outside the prepared window ±${this.#maxPhase} samples`);
    }
    const { values_V: v, mainIndex: m, samplesPerUi: spu } = this.pulse;
    const n = this.length;
    const pre = this.pre;
    h = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      const idx = m + p + (i - pre) * spu;
      if (idx >= 0 && idx < v.length) h[i] = v[idx];
    }
    this.#cache.set(p, h);
    return h;
  }
}

/**
 * Cursors of the equalized signal at phase `p` at the limiter input: the transmit FIR `taps` (main
 * tap `taps[pre]`) applied to the CTLE output, times the symbol amplitude `scale_V`.
 * `g[i] = scale_V·Σ_j taps[j]·h[i − j]`; the main cursor is `g[channel.pre + pre]`.
 */
export function equalizedCursors(
  channel: CtleChannel,
  taps: ArrayLike<number>,
  pre: number,
  p: number,
  scale_V: number,
): { h: Float64Array; main: number } {
  const h = channel.cursors(p);
  const n = h.length;
  const g = new Float64Array(n + taps.length - 1);
  for (let j = 0; j < taps.length; j++) {
    const c = taps[j] * scale_V;
    if (c === 0) continue;
    for (let i = 0; i < n; i++) g[i + j] += c * h[i];
  }
  return { h: g, main: channel.pre + pre };
}
