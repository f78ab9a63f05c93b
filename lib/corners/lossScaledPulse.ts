// A channel known only by its sampled pulse response at a loss corner: the loss of its spectrum
// times s, read within the band where the pulse's spectrum still shows the channel.
import { assertPulse } from "../pulse/assertPulse.ts";
import { peakIndex } from "../pulse/peakIndex.ts";
import { FftPlan, nextPowerOfTwo } from "../signal/fftPlan.ts";
import { minimumPhaseSpectrum } from "../signal/minimumPhase.ts";
import type { Pulse } from "../types.ts";

/**
 * Top of the band, in multiples of the symbol rate, where a pulse's spectrum is divided by its
 * one-UI rectangle to read the channel's loss: |sinc| ≥ 0.30 there, and the band holds Nyquist.
 */
export const PULSE_LOSS_BAND_BAUD = 0.75;

/** Dynamic range of the channel loss read from a pulse (120 dB): deeper nulls are numerical noise. */
const LOSS_RANGE = 1e6;

/** Largest FFT used to rescale a pulse. */
const MAX_FFT = 1 << 22;

/**
 * The pulse of a channel whose insertion loss in dB is multiplied by `lossScale`, for a channel
 * known only by its sampled pulse response. A pulse is the channel's response to a one-UI
 * rectangle, `P(f) = H(f)·UI·sinc(f·UI)`, so the channel's loss `|H| = |P| / (UI·|sinc|)` is read
 * up to {@link PULSE_LOSS_BAND_BAUD} × baud and held flat above it (where the rectangle's nulls make the
 * division meaningless and a lossy channel's pulse carries little energy). The change
 * `|H|^(s−1)` is applied to the pulse's spectrum as a minimum-phase filter, so it adds or removes
 * loss causally: the result starts where the pulse starts, its loss in dB is `s` times the
 * original's at every frequency of the band (Nyquist included), and its tail grows or shrinks.
 *
 * @param pulse - the channel's pulse for a 1 V symbol.
 * @param lossScale - factor on the insertion loss in dB (> 0; 1 returns a copy).
 * @see Oppenheim & Schafer, *Discrete-Time Signal Processing*, 3rd ed., §13 (minimum phase from the
 *   magnitude).
 */
export function lossScaledPulse(pulse: Pulse, lossScale: number): Pulse {
  assertPulse(pulse);
  if (!(lossScale > 0) || !Number.isFinite(lossScale))
    throw new RangeError(`lossScale must be a finite number > 0, got ${String(lossScale)}`);
  const { ui_s, samplesPerUi: spu, values_V } = pulse;
  if (lossScale === 1)
    return { ui_s, samplesPerUi: spu, values_V: Float64Array.from(values_V), mainIndex: pulse.mainIndex };
  const len = values_V.length;
  // Room for a tail several times longer, and a fine frequency grid for the cepstrum.
  const size = nextPowerOfTwo(Math.max(8 * len, 256 * spu));
  if (size > MAX_FFT) throw new RangeError(`pulse.values_V is too long to rescale (${len} samples)`);
  const dt = ui_s / spu;
  const half = size / 2 + 1;
  const df = 1 / (size * dt);
  const plan = new FftPlan(size);
  const spectrum = plan.realForward(values_V);

  const band = Math.min(half - 1, Math.floor(PULSE_LOSS_BAND_BAUD / ui_s / df));
  const logH = new Float64Array(half);
  let top = Number.NEGATIVE_INFINITY;
  for (let k = 0; k <= band; k++) {
    const x = k * df * ui_s;
    const sinc = x === 0 ? 1 : Math.sin(Math.PI * x) / (Math.PI * x);
    const mag = (Math.hypot(spectrum.re[k], spectrum.im[k]) * dt) / (ui_s * Math.abs(sinc));
    logH[k] = Math.log(mag);
    if (logH[k] > top) top = logH[k];
  }
  if (!Number.isFinite(top)) throw new RangeError("pulse.values_V must not be all zero");
  const floor = top - Math.log(LOSS_RANGE);
  for (let k = 0; k <= band; k++) logH[k] = Math.max(floor, logH[k]);
  for (let k = band + 1; k < half; k++) logH[k] = logH[band];

  const extra = Float64Array.from(logH, (v) => (lossScale - 1) * v);
  const g = minimumPhaseSpectrum(extra, size);
  const re = new Float64Array(half);
  const im = new Float64Array(half);
  for (let k = 0; k < half; k++) {
    re[k] = spectrum.re[k] * g.re[k] - spectrum.im[k] * g.im[k];
    im[k] = spectrum.re[k] * g.im[k] + spectrum.im[k] * g.re[k];
  }
  const scaled = plan.realInverse({ re, im });
  // The first half of the window holds the causal result; keep the original length at least and
  // a grown tail until it falls below 1e-4 of the peak.
  let peak = 0;
  for (let i = 0; i < size / 2; i++) peak = Math.max(peak, Math.abs(scaled[i]));
  let last = size / 2 - 1;
  while (last > len && Math.abs(scaled[last]) <= 1e-4 * peak) last--;
  const out = scaled.slice(0, Math.min(size / 2, Math.max(len, last + 1 + spu)));
  return { ui_s, samplesPerUi: spu, values_V: out, mainIndex: peakIndex(out) };
}
