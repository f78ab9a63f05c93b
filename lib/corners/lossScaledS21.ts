// A measured channel (S21 on its own frequency grid) at a loss corner: its insertion loss in dB times s.
import type { ComplexArray } from "../signal/fftPlan.ts";
import { nextPowerOfTwo } from "../signal/fftPlan.ts";
import { interpolateLinear } from "../signal/interpolateLinear.ts";
import { minimumPhaseSpectrum } from "../signal/minimumPhase.ts";

/** Smallest |S21| used for the loss (−400 dB): an exact zero has no logarithm. */
const MIN_MAGNITUDE = 1e-20;

/**
 * S21 with its insertion loss scaled: `|S21_s(f)| = |S21(f)|^s` at every data frequency, so the
 * loss in dB is multiplied by `lossScale` exactly; the change `|S21|^(s−1)` is applied as a
 * minimum-phase filter, so it adds (or removes) loss causally and keeps the channel's own phase
 * and delay. For a line that is minimum phase plus a delay this equals the line `s` times as lossy
 * with the same delay. The filter's phase comes from the folded real cepstrum of `(s−1)·ln|S21|`
 * on a uniform grid to twice the top frequency (held flat outside the data), read back at the
 * data's frequencies.
 *
 * @param freqs_Hz - ascending frequencies in Hz (≥ 0), at least 2.
 * @param s21 - S21 at those frequencies.
 * @param lossScale - factor on the insertion loss in dB (> 0; 1 returns a copy).
 * @see Oppenheim & Schafer, *Discrete-Time Signal Processing*, 3rd ed., §13 (minimum phase from
 *   the magnitude); Pozar, *Microwave Engineering* (a line's loss in dB grows in proportion to it).
 */
export function lossScaledS21(freqs_Hz: Float64Array, s21: ComplexArray, lossScale: number): ComplexArray {
  const count = freqs_Hz.length;
  if (!(lossScale > 0) || !Number.isFinite(lossScale))
    throw new RangeError(`lossScale must be a finite number > 0, got ${String(lossScale)}`);
  if (count < 2) throw new RangeError(`freqs_Hz must hold at least 2 frequencies, got ${count}`);
  if (s21.re.length !== count || s21.im.length !== count)
    throw new RangeError(`s21 must hold ${count} values (one per frequency)`);
  for (let i = 0; i < count; i++) {
    if (!Number.isFinite(freqs_Hz[i]) || freqs_Hz[i] < 0)
      throw new RangeError(`freqs_Hz[${i}] must be a finite number ≥ 0`);
    if (i > 0 && !(freqs_Hz[i] > freqs_Hz[i - 1]))
      throw new RangeError(`freqs_Hz must ascend strictly (freqs_Hz[${i}])`);
    if (!Number.isFinite(s21.re[i]) || !Number.isFinite(s21.im[i])) throw new RangeError(`s21[${i}] must be finite`);
  }
  if (lossScale === 1) return { re: Float64Array.from(s21.re), im: Float64Array.from(s21.im) };

  // The extra log-magnitude (natural log) at the data's frequencies.
  const extra = new Float64Array(count);
  for (let i = 0; i < count; i++) {
    extra[i] = (lossScale - 1) * Math.log(Math.max(MIN_MAGNITUDE, Math.hypot(s21.re[i], s21.im[i])));
  }
  // A uniform grid from DC to twice the top frequency, fine enough to resolve the data's spacing;
  // the curve is held flat below the first and above the last data point.
  const fTop = freqs_Hz[count - 1];
  const minSpacing = freqs_Hz.reduce(
    (m, f, i) => (i === 0 ? m : Math.min(m, f - freqs_Hz[i - 1])),
    Number.POSITIVE_INFINITY,
  );
  const half = Math.min(1 << 17, nextPowerOfTwo(Math.max(4 * count, Math.ceil((4 * fTop) / minSpacing))));
  const size = 2 * half;
  const df = (2 * fTop) / half;
  const uniform = Float64Array.from({ length: half + 1 }, (_, k) => k * df);
  const g = minimumPhaseSpectrum(interpolateLinear(freqs_Hz, extra, uniform, "hold"), size);
  const phase = interpolateLinear(uniform, g.phase_rad, freqs_Hz);
  const re = new Float64Array(count);
  const im = new Float64Array(count);
  for (let i = 0; i < count; i++) {
    const a = Math.exp(extra[i]);
    const c = a * Math.cos(phase[i]);
    const s = a * Math.sin(phase[i]);
    re[i] = s21.re[i] * c - s21.im[i] * s;
    im[i] = s21.re[i] * s + s21.im[i] * c;
  }
  return { re, im };
}
