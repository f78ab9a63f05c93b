// Noise sampled once per UI after a filter: its autocorrelation at symbol spacing, which a receive
// FFE needs to weigh noise against ISI (the samples of coloured noise are correlated).

/**
 * Autocorrelation at symbol spacing of stationary noise with one-sided power spectral density `psd`
 * (V²/Hz) on `[0, band_Hz]` (zero above): `r[m] = ∫₀^band S(f)·cos(2πf·m·ui_s) df` for
 * `m = 0 … lags`, by composite Simpson's rule fine enough for the cosine of the largest lag.
 * `r[0]` is the noise variance; white noise band-limited to `1/(2·ui_s)` gives `r[m] = 0` for m ≥ 1.
 *
 * @param psd - one-sided PSD in V²/Hz at a frequency in Hz (finite, ≥ 0).
 * @param band_Hz - upper end of the noise band in Hz (> 0).
 * @param ui_s - the symbol spacing in seconds (> 0).
 * @param lags - largest lag (integer ≥ 0).
 * @see Wiener–Khinchin theorem; Proakis, *Digital Communications*, sampled noise through a filter
 *   [memory: recalled, not re-read].
 */
export function noiseCorrelation(
  psd: (freq_Hz: number) => number,
  band_Hz: number,
  ui_s: number,
  lags: number,
): Float64Array {
  if (!(Number.isFinite(band_Hz) && band_Hz > 0))
    throw new RangeError(`band_Hz must be a finite number > 0, got ${String(band_Hz)}`);
  if (!(Number.isFinite(ui_s) && ui_s > 0))
    throw new RangeError(`ui_s must be a finite number > 0, got ${String(ui_s)}`);
  if (!Number.isInteger(lags) || lags < 0 || lags > 4096)
    throw new RangeError(`lags must be an integer 0…4096, got ${String(lags)}`);
  // At least 32 intervals per period of the fastest cosine, and 2048 in all.
  let intervals = Math.max(2048, Math.ceil(32 * band_Hz * ui_s * lags));
  if (intervals % 2 === 1) intervals++;
  const step = band_Hz / intervals;
  const r = new Float64Array(lags + 1);
  for (let i = 0; i <= intervals; i++) {
    const f = i * step;
    const s = psd(f);
    if (!(Number.isFinite(s) && s >= 0))
      throw new RangeError(`psd(${f}) must be a finite number ≥ 0, got ${String(s)}`);
    const w = (i === 0 || i === intervals ? 1 : i % 2 === 1 ? 4 : 2) * s;
    for (let m = 0; m <= lags; m++) r[m] += w * Math.cos(2 * Math.PI * f * m * ui_s);
  }
  for (let m = 0; m <= lags; m++) r[m] *= step / 3;
  return r;
}
