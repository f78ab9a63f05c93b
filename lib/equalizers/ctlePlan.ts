// CTLE applied to one pulse many times: the pulse's spectrum is computed once, each setting costs one IFFT.
import type { Pulse } from "../types.ts";
import { peakIndex } from "../pulse/peakIndex.ts";
import { DEFAULT_TAIL_UI, paddedSpectrum } from "./paddedSpectrum.ts";
import { checkCtleParams, ctleAt, type CtleParams } from "./ctleResponse.ts";

/** Options of {@link createCtlePlan}. */
export interface CtlePlanOptions {
  /**
   * UIs of room kept after the input pulse for the CTLE's tail (default 32). The output is
   * `values.length + tail_UI·samplesPerUi` samples long; the FFT grid is at least twice that,
   * so the slow tail of a low-frequency stage does not wrap around.
   */
  readonly tail_UI?: number;
}

/** A pulse prepared for filtering by many CTLE settings. */
export interface CtlePlan {
  /** Frequencies of the FFT grid in Hz, bins 0 … N/2. */
  readonly freqs_Hz: Float64Array;
  /**
   * The pulse through the CTLE with these settings: a fresh pulse whose `mainIndex` is the
   * peak of the filtered response.
   */
  apply(params: CtleParams): Pulse;
}

/**
 * Prepares `pulse` for CTLE filtering: zero-pads it, transforms it once, and returns a plan whose
 * `apply(params)` multiplies by `H(f)` (see {@link ctleResponse}) and transforms back. Filtering on
 * the grid is a circular convolution; the padding keeps it equal to the linear one.
 */
export function createCtlePlan(pulse: Pulse, options: CtlePlanOptions = {}): CtlePlan {
  const { fft, spectrum, freqs_Hz, outLength } = paddedSpectrum(pulse, options.tail_UI ?? DEFAULT_TAIL_UI);
  const spu = pulse.samplesPerUi;
  const half = freqs_Hz.length;
  const re = new Float64Array(half);
  const im = new Float64Array(half);
  const h = new Float64Array(2);
  return {
    freqs_Hz,
    apply(params: CtleParams): Pulse {
      checkCtleParams(params);
      const g1 = 10 ** (params.gDc_dB / 20);
      const g2 = 10 ** ((params.gDc2_dB ?? 0) / 20);
      for (let k = 0; k < half; k++) {
        ctleAt(params, g1, g2, freqs_Hz[k], h);
        const xr = spectrum.re[k];
        const xi = spectrum.im[k];
        re[k] = xr * h[0] - xi * h[1];
        im[k] = xr * h[1] + xi * h[0];
      }
      const values_V = fft.realInverse({ re, im }).slice(0, outLength);
      return { ui_s: pulse.ui_s, samplesPerUi: spu, values_V, mainIndex: peakIndex(values_V) };
    },
  };
}
