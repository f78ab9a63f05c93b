// The continuous-time linear equalizer of IEEE 802.3 Annex 93A, with the optional low-frequency stage.
import { magnitudeDb } from "../signal/decibels.ts";
import type { ComplexArray } from "../signal/fftPlan.ts";

/** CTLE settings: DC gains in dB and pole/zero frequencies in Hz. */
export interface CtleParams {
  /** DC gain of the main stage in dB (≤ 0 for peaking). */
  readonly gDc_dB: number;
  /** Zero frequency in Hz (> 0). */
  readonly fz_Hz: number;
  /** First pole in Hz (> 0). */
  readonly fp1_Hz: number;
  /** Second pole in Hz (> 0). */
  readonly fp2_Hz: number;
  /** DC gain of the low-frequency stage in dB; omit (or 0) for a single stage. */
  readonly gDc2_dB?: number;
  /** Pole/zero frequency of the low-frequency stage in Hz; needed when `gDc2_dB ≠ 0`. */
  readonly fLf_Hz?: number;
}

const positive = (v: number | undefined) => typeof v === "number" && Number.isFinite(v) && v > 0;

/** Throws RangeError naming the field unless `params` is a usable CTLE setting. */
export function checkCtleParams(params: CtleParams): void {
  if (params === null || typeof params !== "object") throw new TypeError("params must be a CTLE settings object");
  if (!Number.isFinite(params.gDc_dB)) throw new RangeError(`gDc_dB must be finite, got ${String(params.gDc_dB)}`);
  for (const key of ["fz_Hz", "fp1_Hz", "fp2_Hz"] as const) {
    if (!positive(params[key])) throw new RangeError(`${key} must be a finite number > 0, got ${String(params[key])}`);
  }
  if (params.gDc2_dB !== undefined && !Number.isFinite(params.gDc2_dB)) {
    throw new RangeError(`gDc2_dB must be finite, got ${String(params.gDc2_dB)}`);
  }
  if (params.fLf_Hz !== undefined && !positive(params.fLf_Hz)) {
    throw new RangeError(`fLf_Hz must be a finite number > 0, got ${String(params.fLf_Hz)}`);
  }
  if ((params.gDc2_dB ?? 0) !== 0 && params.fLf_Hz === undefined) {
    throw new RangeError("fLf_Hz is required when gDc2_dB is not 0 (the low-frequency stage needs its corner)");
  }
}

/**
 * Writes `H(f)` of the CTLE for one frequency into `out[0]` (re) and `out[1]` (im). Internal to
 * the equalizers area; the caller has checked the parameters.
 */
export function ctleAt(params: CtleParams, g1: number, g2: number, f: number, out: Float64Array): void {
  // (g1 + j f/fz) / ((1 + j f/fp1)(1 + j f/fp2))
  let nr = g1;
  let ni = f / params.fz_Hz;
  const a = f / params.fp1_Hz;
  const b = f / params.fp2_Hz;
  let dr = 1 - a * b;
  let di = a + b;
  if (params.fLf_Hz !== undefined && g2 !== 1) {
    const c = f / params.fLf_Hz;
    // numerator × (g2 + j c), denominator × (1 + j c)
    const nr2 = nr * g2 - ni * c;
    ni = nr * c + ni * g2;
    nr = nr2;
    const dr2 = dr - di * c;
    di = dr * c + di;
    dr = dr2;
  }
  const den = dr * dr + di * di;
  out[0] = (nr * dr + ni * di) / den;
  out[1] = (ni * dr - nr * di) / den;
}

/**
 * Complex response of the CTLE
 * `H(f) = [(g + i f/fz)(g2 + i f/fLf)] / [(1 + i f/fp1)(1 + i f/fp2)(1 + i f/fLf)]`,
 * `g = 10^(gDc/20)`, `g2 = 10^(gDc2/20)` (the second factor is 1 for a single stage).
 *
 * @param params - gains in dB, corners in Hz.
 * @param freqs_Hz - frequencies in Hz (≥ 0).
 * @see IEEE 802.3, Annex 93A, eq. 93A-22 (single stage); the low-frequency stage of later clauses.
 */
export function ctleResponse(params: CtleParams, freqs_Hz: ArrayLike<number>): ComplexArray {
  checkCtleParams(params);
  const g1 = 10 ** (params.gDc_dB / 20);
  const g2 = 10 ** ((params.gDc2_dB ?? 0) / 20);
  const re = new Float64Array(freqs_Hz.length);
  const im = new Float64Array(freqs_Hz.length);
  const tmp = new Float64Array(2);
  for (let k = 0; k < freqs_Hz.length; k++) {
    const f = freqs_Hz[k];
    if (!Number.isFinite(f) || f < 0)
      throw new RangeError(`freqs_Hz[${k}] must be a finite number ≥ 0, got ${String(f)}`);
    ctleAt(params, g1, g2, f, tmp);
    re[k] = tmp[0];
    im[k] = tmp[1];
  }
  return { re, im };
}

/** `20·log10|H(f)|` of the CTLE in dB on the given frequencies (see {@link ctleResponse}). */
export function ctleMagnitudeDb(params: CtleParams, freqs_Hz: ArrayLike<number>): Float64Array {
  const { re, im } = ctleResponse(params, freqs_Hz);
  return magnitudeDb(re, im);
}
