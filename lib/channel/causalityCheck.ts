// Causality of a channel's transfer function: does its impulse response arrive before it starts?
import { FftPlan, type ComplexArray } from "../signal/fftPlan.ts";
import { s21OnFftGrid } from "./s21OnFftGrid.ts";

/** Share of the band rolled off before the causality check (the band edge must not ring before the onset). */
const CAUSALITY_TAPER = 0.5;

/** What {@link causalityCheck} measured. */
export interface CausalityCheck {
  /** Delay from the slope of the unwrapped phase against ω (least squares, weighted by |S21|²), in seconds. */
  readonly phaseDelay_s: number;
  /** Time of the impulse response's onset in seconds (the start of its rise to the peak). */
  readonly onset_s: number;
  /** Share of the impulse response's energy in the half window before its onset (0…1). */
  readonly preOnsetEnergy: number;
}

/**
 * Measures how causal the transfer function looks. The impulse response comes from the same spectrum
 * the pulse does ({@link s21OnFftGrid}: real DC bin) with a raised-cosine taper over the top half of the
 * band, so the band edge's own ringing stays far below the limit, by a real IFFT over `window_s`. The delay is removed by taking the onset as reference: walking back
 * from the peak to the first sample below 1 % of it, less `2/fmax` (a response band-limited to `fmax`
 * starts that much early). The energy in the half window before that point, over the total, is
 * `preOnsetEnergy`; on a periodic window it also catches a tail that wrapped round. A negative
 * `phaseDelay_s` (phase rising with frequency) means the response comes before its stimulus.
 *
 * @param freqs_Hz - ascending frequencies in Hz, at least 2.
 * @param transfer - S21 (or SDD21) at those frequencies.
 * @param dt_s - time step in seconds.
 * @param window_s - time window in seconds (the pulse's; at least 1/Δf of the data).
 * @see Oppenheim & Schafer, *Discrete-Time Signal Processing* (a causal real response's spectrum is
 *   Hilbert-related; sampling in frequency makes the time response periodic).
 */
export function causalityCheck(
  freqs_Hz: Float64Array,
  transfer: ComplexArray,
  dt_s: number,
  window_s: number,
): CausalityCheck {
  const size = 2 ** Math.round(Math.log2(window_s / dt_s));
  const { spectrum } = s21OnFftGrid(freqs_Hz, transfer, size, dt_s, CAUSALITY_TAPER);
  const x = new FftPlan(size).realInverse(spectrum);
  let peak = 0;
  let total = 0;
  for (let i = 0; i < size; i++) {
    total += x[i] * x[i];
    if (Math.abs(x[i]) > Math.abs(x[peak])) peak = i;
  }
  const at = (i: number) => x[((i % size) + size) % size];
  let onset = peak;
  while (onset > peak - size / 2 && Math.abs(at(onset - 1)) >= 0.01 * Math.abs(x[peak])) onset--;
  const fmax = Math.min(freqs_Hz[freqs_Hz.length - 1], 1 / (2 * dt_s));
  const margin = Math.ceil(2 / (fmax * dt_s));
  let pre = 0;
  for (let i = onset - size / 2; i < onset - margin; i++) pre += at(i) * at(i);
  return {
    phaseDelay_s: phaseDelay(freqs_Hz, transfer),
    onset_s: onset * dt_s,
    preOnsetEnergy: total > 0 ? pre / total : 0,
  };
}

/** Weighted least-squares slope of the unwrapped phase against ω (with an intercept), as a delay. */
function phaseDelay(freqs_Hz: Float64Array, h: ComplexArray): number {
  let prev = 0;
  let sw = 0;
  let sx = 0;
  let sy = 0;
  let sxx = 0;
  let sxy = 0;
  for (let i = 0; i < freqs_Hz.length; i++) {
    const raw = Math.atan2(h.im[i], h.re[i]);
    const ph = i === 0 ? raw : prev + (raw - prev) - 2 * Math.PI * Math.round((raw - prev) / (2 * Math.PI));
    prev = ph;
    const w = h.re[i] * h.re[i] + h.im[i] * h.im[i];
    const omega = 2 * Math.PI * freqs_Hz[i];
    sw += w;
    sx += w * omega;
    sy += w * ph;
    sxx += w * omega * omega;
    sxy += w * omega * ph;
  }
  const det = sw * sxx - sx * sx;
  return det > 0 ? -(sw * sxy - sx * sy) / det : 0;
}
