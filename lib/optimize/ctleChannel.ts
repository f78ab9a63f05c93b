// The channel after one CTLE setting, prepared for a search: filtered once, noise at the limiter
// known, and symbol-spaced cursors per sampling phase computed once and kept.
import { jitterKernel } from "../analysis/jitterKernel.ts";
import { limiterNoise } from "../analysis/limiterNoise.ts";
import { ctleNoiseGain } from "../equalizers/ctleNoiseGain.ts";
import { type CtlePlan, createCtlePlan } from "../equalizers/ctlePlan.ts";
import type { CtleParams } from "../equalizers/ctleResponse.ts";
import type { Pulse } from "../types.ts";
import type { CtleSetting, SearchSpace } from "./searchSpace.ts";

/** The channel through one CTLE setting (pulse for a 1 V symbol, before the transmit FIR). */
export interface CtleChannel {
  readonly setting: CtleSetting;
  readonly params: CtleParams;
  /** CTLE output for a 1 V symbol; `mainIndex` is its peak. */
  readonly pulse: Pulse;
  /** Noise rms at the limiter input with this CTLE, volts. */
  readonly noiseRms_V: number;
  /** CTLE noise-power gain applied to the front-end noise (1 when there is none). */
  readonly noisePowerGain: number;
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

/** One CTLE channel of `pulse` for any setting (e.g. gains rounded to register codes). */
export function channelFor(pulse: Pulse, space: SearchSpace, setting: CtleSetting): CtleChannel {
  return ctleChannel(createCtlePlan(pulse), space, setting, phaseReach(space, pulse.samplesPerUi));
}

/**
 * Filters the pulse by one CTLE setting (through a shared plan) and prepares its cursors.
 *
 * @param plan - CTLE plan of the channel's pulse.
 * @param space - the resolved budget (corners, noise).
 * @param setting - the gains of this setting.
 * @param maxPhase - largest |phase| in samples that will be asked for (sizes the cursor window).
 */
export function ctleChannel(plan: CtlePlan, space: SearchSpace, setting: CtleSetting, maxPhase: number): CtleChannel {
  if (!Number.isInteger(maxPhase) || maxPhase < 0) throw new RangeError(`maxPhase must be an integer ≥ 0, got ${maxPhase}`);
  const params: CtleParams = { ...space.ctleCorners, gDc_dB: setting.gDc_dB, gDc2_dB: setting.gDc2_dB };
  return filteredChannel(plan.apply(params), space, setting, maxPhase);
}

/**
 * A channel from the pulse already filtered by the CTLE setting `setting` (e.g. by
 * `ctleGridPulses`): its noise at the limiter and its cursors per phase.
 *
 * @param filtered - the CTLE output for a 1 V symbol, `mainIndex` at its peak.
 * @param space - the resolved budget (corners, noise).
 * @param setting - the gains the pulse was filtered with.
 * @param maxPhase - largest |phase| in samples that will be asked for (sizes the cursor window).
 */
export function filteredChannel(filtered: Pulse, space: SearchSpace, setting: CtleSetting, maxPhase: number): CtleChannel {
  if (!Number.isInteger(maxPhase) || maxPhase < 0) throw new RangeError(`maxPhase must be an integer ≥ 0, got ${maxPhase}`);
  const params: CtleParams = { ...space.ctleCorners, gDc_dB: setting.gDc_dB, gDc2_dB: setting.gDc2_dB };
  const b = space.budget;
  const noisePowerGain = b.inputNoiseRms_V > 0 ? ctleNoiseGain(params, space.baud_Hz / 2) : 1;
  return new FilteredChannel(setting, params, filtered, limiterNoise(b.noiseRms_V, b.inputNoiseRms_V, noisePowerGain), noisePowerGain, maxPhase);
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
