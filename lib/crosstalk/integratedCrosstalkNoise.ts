// Integrated crosstalk noise (ICN): the rms crosstalk a link budget books from the aggressors'
// coupling spectra, weighted by the aggressors' transmit spectra and the receiver's filter.
import { assertPulse } from "../pulse/assertPulse.ts";
import { type ComplexArray, FftPlan, nextPowerOfTwo } from "../signal/fftPlan.ts";
import type { Pulse } from "../types.ts";
import { type AggressorKind, checkAggressorKind } from "./aggressorKind.ts";

/** One aggressor's crosstalk transfer on the shared frequency grid and its transmitter's amplitude. */
export interface IcnAggressor {
  readonly kind: AggressorKind;
  /** Crosstalk transfer (mixed-mode, like SDD21) at each frequency of the grid. */
  readonly transfer: ComplexArray;
  /** Peak amplitude of the aggressor's transmitter `A` in volts (half its peak-to-peak swing). */
  readonly amplitude_V: number;
}

/** Options of {@link integratedCrosstalkNoise}. */
export interface IcnOptions {
  /** Symbol rate `f_b` in Hz. */
  readonly baud_Hz: number;
  /** 3 dB frequency of the NEXT aggressors' transmit filter `f_nt` (default `f_b/4`). */
  readonly nextEdge_Hz?: number;
  /** 3 dB frequency of the FEXT aggressors' transmit filter `f_ft` (default `f_b/4`). */
  readonly fextEdge_Hz?: number;
  /** 3 dB frequency of the receiver's filter `f_r` (default `0.75·f_b`). */
  readonly receiver_Hz?: number;
}

/** ICN in volts rms: all aggressors, NEXT and FEXT apart, and each one alone. */
export interface IcnResult {
  readonly rms_V: number;
  readonly next_V: number;
  readonly fext_V: number;
  readonly perAggressor_V: number[];
}

const sinc = (x: number) => (x === 0 ? 1 : Math.sin(Math.PI * x) / (Math.PI * x));

/**
 * Integrated crosstalk noise: with the aggressor's weighting
 * `W(f) = (A²/f_b)·sinc²(f/f_b)·[1/(1 + (f/f_t)⁴)]·[1/(1 + (f/f_r)⁸)]` (`f_t` = `f_nt` or `f_ft`),
 * `σ_x² = 2·Δf·Σ_n W(f_n)·10^(−MDXT(f_n)/10)` over the grid's frequencies, where the multi-disturber
 * loss sums the aggressors' powers, `10^(−MDXT/10) = Σ_i |X_i|²`; `σ_nx` over the NEXT aggressors,
 * `σ_fx` over the FEXT ones, `σ_x = √(σ_nx² + σ_fx²)`. Each aggressor here has its own amplitude; with
 * equal amplitudes this is the clause's formula.
 *
 * @param freqs_Hz - a uniform frequency grid (step Δf), Hz.
 * @param aggressors - their kinds, transfers on the grid and amplitudes.
 * @param options - symbol rate and the filters' corners.
 * @see IEEE 802.3, Annex 85A (the integrated crosstalk noise of the cable assembly: W_nt, W_ft, σ_nx,
 *   σ_fx, σ_x) and the same form in Annex 69B.4.6 (backplane) [memory: recalled, not re-read — the
 *   sub-clause numbers and the default corners f_nt = f_ft = f_b/4, f_r = 0.75·f_b are from memory].
 */
export function integratedCrosstalkNoise(
  freqs_Hz: Float64Array,
  aggressors: readonly IcnAggressor[],
  options: IcnOptions,
): IcnResult {
  const count = freqs_Hz.length;
  if (count < 2) throw new RangeError(`freqs_Hz must hold at least 2 frequencies, got ${count}`);
  const df = (freqs_Hz[count - 1] - freqs_Hz[0]) / (count - 1);
  if (!(df > 0)) throw new RangeError("freqs_Hz must ascend");
  for (let k = 0; k < count; k++) {
    const want = freqs_Hz[0] + k * df;
    if (!(Number.isFinite(freqs_Hz[k]) && freqs_Hz[k] >= 0) || Math.abs(freqs_Hz[k] - want) > 1e-3 * df) {
      throw new RangeError(
        `freqs_Hz must be a uniform grid ≥ 0 (step ${df} Hz); freqs_Hz[${k}] = ${freqs_Hz[k]} is off it — resample first`,
      );
    }
  }
  const fb = checkBaud(options.baud_Hz);
  const shaped = aggressors.map((a, i) => {
    checkAggressorKind(a.kind, `aggressors[${i}].kind`);
    if (a.transfer.re.length !== count || a.transfer.im.length !== count)
      throw new RangeError(`aggressors[${i}].transfer must hold ${count} values`);
    const power = new Float64Array(count);
    for (let k = 0; k < count; k++) {
      const s = sinc(freqs_Hz[k] / fb);
      power[k] = s * s * (a.transfer.re[k] * a.transfer.re[k] + a.transfer.im[k] * a.transfer.im[k]);
      if (!Number.isFinite(power[k]))
        throw new RangeError(`aggressors[${i}].transfer holds a value that is not finite`);
    }
    return { kind: a.kind, amplitude_V: a.amplitude_V, power };
  });
  return icnOfShapedPower(freqs_Hz, df, shaped, options);
}

/** An aggressor given by its crosstalk pulse at the victim's receiver (for a 1 V symbol). */
export interface IcnPulseAggressor {
  readonly kind: AggressorKind;
  readonly pulse: Pulse;
  /** Peak amplitude of the aggressor's transmitter in volts. */
  readonly amplitude_V: number;
}

/**
 * {@link integratedCrosstalkNoise} for aggressors known by their crosstalk pulses (CSV uploads,
 * synthetic coupling, or Touchstone paths already turned into pulses): a pulse's spectrum is
 * `P(f) = X(f)·UI·sinc(f·UI)·e^{−iπf·UI}`, so the clause's `sinc²(f/f_b)·|X(f)|²` is `|P(f)|²/UI²`, taken
 * from the pulse's FFT on a grid of at least 64 points per baud (the pulses share a UI and grid).
 *
 * @param aggressors - kinds, crosstalk pulses (same UI and samples per UI) and amplitudes.
 * @param options - the filters' corners (`baud_Hz` must be `1/ui_s` of the pulses, within 1 %).
 */
export function integratedCrosstalkNoiseOfPulses(
  aggressors: readonly IcnPulseAggressor[],
  options: IcnOptions,
): IcnResult {
  const fb = checkBaud(options.baud_Hz);
  if (aggressors.length === 0) return { rms_V: 0, next_V: 0, fext_V: 0, perAggressor_V: [] };
  aggressors.forEach((a, i) => {
    checkAggressorKind(a.kind, `aggressors[${i}].kind`);
    assertPulse(a.pulse, `aggressors[${i}].pulse`);
  });
  const { ui_s, samplesPerUi } = aggressors[0].pulse;
  if (Math.abs(ui_s * fb - 1) > 0.01) throw new RangeError(`baud_Hz ${fb} does not match the pulses' UI (${ui_s} s)`);
  let longest = 0;
  aggressors.forEach((a, i) => {
    if (a.pulse.ui_s !== ui_s || a.pulse.samplesPerUi !== samplesPerUi)
      throw new RangeError(`aggressors[${i}].pulse must share the first pulse's UI and samples per UI`);
    longest = Math.max(longest, a.pulse.values_V.length);
  });
  const size = nextPowerOfTwo(Math.max(longest, 64 * samplesPerUi));
  const plan = new FftPlan(size);
  const dt = ui_s / samplesPerUi;
  const df = 1 / (size * dt);
  const count = size / 2 + 1;
  const freqs = Float64Array.from({ length: count }, (_, k) => k * df);
  const shaped = aggressors.map((a) => {
    const p = plan.realForward(a.pulse.values_V);
    const power = new Float64Array(count);
    const scale = dt / ui_s; // P(f) = dt·FFT; |P|²/UI²
    for (let k = 0; k < count; k++) power[k] = scale * scale * (p.re[k] * p.re[k] + p.im[k] * p.im[k]);
    return { kind: a.kind, amplitude_V: a.amplitude_V, power };
  });
  return icnOfShapedPower(freqs, df, shaped, options);
}

function checkBaud(fb: number): number {
  if (!(Number.isFinite(fb) && fb > 0)) throw new RangeError(`baud_Hz must be a finite number > 0, got ${String(fb)}`);
  return fb;
}

/** The clause's sums, with `sinc²(f/f_b)·|X(f)|²` given per aggressor as `power`. */
function icnOfShapedPower(
  freqs_Hz: Float64Array,
  df: number,
  aggressors: readonly { kind: AggressorKind; amplitude_V: number; power: Float64Array }[],
  options: IcnOptions,
): IcnResult {
  const fb = options.baud_Hz;
  const corner = (v: number | undefined, dflt: number, name: string) => {
    const x = v ?? dflt;
    if (!(Number.isFinite(x) && x > 0)) throw new RangeError(`${name} must be a finite number > 0, got ${String(x)}`);
    return x;
  };
  const fnt = corner(options.nextEdge_Hz, fb / 4, "nextEdge_Hz");
  const fft = corner(options.fextEdge_Hz, fb / 4, "fextEdge_Hz");
  const fr = corner(options.receiver_Hz, 0.75 * fb, "receiver_Hz");
  const per = aggressors.map((a, i) => {
    if (!(Number.isFinite(a.amplitude_V) && a.amplitude_V >= 0))
      throw new RangeError(`aggressors[${i}].amplitude_V must be a finite number ≥ 0`);
    const ft = a.kind === "next" ? fnt : fft;
    let sum = 0;
    for (let k = 0; k < freqs_Hz.length; k++) {
      const f = freqs_Hz[k];
      sum += a.power[k] * (1 / (1 + (f / ft) ** 4)) * (1 / (1 + (f / fr) ** 8));
    }
    return 2 * df * ((a.amplitude_V * a.amplitude_V) / fb) * sum;
  });
  let next = 0;
  let fext = 0;
  per.forEach((v, i) => {
    if (aggressors[i].kind === "next") next += v;
    else fext += v;
  });
  return {
    rms_V: Math.sqrt(next + fext),
    next_V: Math.sqrt(next),
    fext_V: Math.sqrt(fext),
    perAggressor_V: per.map(Math.sqrt),
  };
}
