// A pulse through every CTLE setting of a grid with four inverse FFTs in all: the response is
// bilinear in the two linear DC gains, so the filtered pulses are combinations of four pulses.
import { type CtleParams, ctleResponse } from "../equalizers/ctleResponse.ts";
import { assertPulse } from "../pulse/assertPulse.ts";
import { peakIndex } from "../pulse/peakIndex.ts";
import { paddedSpectrum } from "../equalizers/paddedSpectrum.ts";
import type { Pulse } from "../types.ts";
import type { CtleSetting } from "./searchSpace.ts";

/**
 * The pulse filtered by the CTLE `{...corners, gDc_dB, gDc2_dB}` for every setting of `settings`,
 * on the same grid and with the same padding as a CTLE plan (`createCtlePlan`, default tail): the
 * output is `values.length + 32·samplesPerUi` samples, `mainIndex` its peak.
 *
 * `H(f) = [(g + i f/fz)(g₂ + i f/fLf)] / [(1 + i f/fp1)(1 + i f/fp2)(1 + i f/fLf)]` is bilinear in
 * the linear gains `g = 10^(gDc/20)` and `g₂ = 10^(gDc2/20)`: `H = g·g₂·P + g·Q + g₂·R + S`, and P, Q,
 * R, S follow per bin from `ctleResponse` at the gains 1 and 0.1 of each stage (a single stage has
 * P = R = 0). So the pulse through any setting is `g·g₂·p_P + g·p_Q + g₂·p_R + p_S`, the four pulses
 * being inverse transforms of the pulse's spectrum times P, Q, R and S: four inverse FFTs serve the
 * whole grid (equal to filtering each setting separately up to rounding).
 *
 * @param pulse - channel pulse for a 1 V symbol.
 * @param corners - the fixed CTLE corners (Hz).
 * @param settings - the gains of each setting (dB).
 * @see IEEE 802.3, Annex 93A, eq. 93A-22 (the continuous-time filter) [memory: recalled, not re-read].
 */
export function ctleGridPulses(
  pulse: Pulse,
  corners: Omit<CtleParams, "gDc_dB" | "gDc2_dB">,
  settings: readonly CtleSetting[],
): Pulse[] {
  assertPulse(pulse);
  for (const s of settings) {
    if (!Number.isFinite(s.gDc_dB)) throw new RangeError(`gDc_dB must be finite, got ${String(s.gDc_dB)}`);
    if (!Number.isFinite(s.gDc2_dB)) throw new RangeError(`gDc2_dB must be finite, got ${String(s.gDc2_dB)}`);
    if (s.gDc2_dB !== 0 && corners.fLf_Hz === undefined) {
      throw new RangeError("fLf_Hz is required when gDc2_dB is not 0 (the low-frequency stage needs its corner)");
    }
  }
  const spu = pulse.samplesPerUi;
  const { fft, spectrum, freqs_Hz, outLength } = paddedSpectrum(pulse);
  const half = freqs_Hz.length;
  // H at the gain corners (linear 1 and 0.1 of each stage), then the bilinear coefficients per bin.
  const twoStage = corners.fLf_Hz !== undefined;
  const at = (gDc_dB: number, gDc2_dB: number) => ctleResponse({ ...corners, gDc_dB, gDc2_dB }, freqs_Hz);
  const h11 = at(0, 0);
  const hg1 = at(-20, 0);
  const h1g = twoStage ? at(0, -20) : h11;
  const hgg = twoStage ? at(-20, -20) : hg1;
  const gamma = 0.1;
  const u = 1 - gamma;
  const basis: Float64Array[] = [];
  for (let b = 0; b < 4; b++) {
    const re = new Float64Array(half);
    const im = new Float64Array(half);
    for (let k = 0; k < half; k++) {
      // H(g, g₂) = g·g₂·P + g·Q + g₂·R + S at g, g₂ ∈ {1, γ}.
      const pr = (h11.re[k] - hg1.re[k] - h1g.re[k] + hgg.re[k]) / (u * u);
      const pi = (h11.im[k] - hg1.im[k] - h1g.im[k] + hgg.im[k]) / (u * u);
      const qr = (h11.re[k] - hg1.re[k]) / u - pr;
      const qi = (h11.im[k] - hg1.im[k]) / u - pi;
      const rr = (h11.re[k] - h1g.re[k]) / u - pr;
      const ri = (h11.im[k] - h1g.im[k]) / u - pi;
      const hr = b === 0 ? h11.re[k] - pr - qr - rr : b === 1 ? qr : b === 2 ? rr : pr;
      const hi = b === 0 ? h11.im[k] - pi - qi - ri : b === 1 ? qi : b === 2 ? ri : pi;
      const xr = spectrum.re[k];
      const xi = spectrum.im[k];
      re[k] = xr * hr - xi * hi;
      im[k] = xr * hi + xi * hr;
    }
    basis.push(fft.realInverse({ re, im }));
  }
  return settings.map((s) => {
    const g = 10 ** (s.gDc_dB / 20);
    const g2 = 10 ** (s.gDc2_dB / 20);
    const gg = g * g2;
    const [pS, pQ, pR, pP] = basis;
    const values_V = new Float64Array(outLength);
    for (let i = 0; i < outLength; i++) values_V[i] = gg * pP[i] + g * pQ[i] + g2 * pR[i] + pS[i];
    return { ui_s: pulse.ui_s, samplesPerUi: spu, values_V, mainIndex: peakIndex(values_V) };
  });
}
