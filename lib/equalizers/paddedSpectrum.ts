// A pulse zero-padded for frequency-domain filtering and transformed once, for filters applied many times.
import type { Pulse } from "../types.ts";
import { assertPulse } from "../pulse/assertPulse.ts";
import { type ComplexArray, FftPlan, nextPowerOfTwo } from "../signal/fftPlan.ts";

/** UIs of room kept after a pulse for a CTLE's tail, unless a caller asks for another. */
export const DEFAULT_TAIL_UI = 32;

/** The padded transform of a pulse, with the plan that transforms filtered spectra back. */
export interface PaddedSpectrum {
  /** FFT plan of the grid's size (at least twice `outLength`, a power of two). */
  readonly fft: FftPlan;
  /** The pulse's spectrum, bins 0 … N/2. */
  readonly spectrum: ComplexArray;
  /** Frequencies of the bins in Hz. */
  readonly freqs_Hz: Float64Array;
  /** Samples a filtered pulse keeps: the input's length plus `tail_UI·samplesPerUi`. */
  readonly outLength: number;
}

/**
 * Zero-pads `pulse` to a power of two at least twice `values.length + tail_UI·samplesPerUi` and
 * transforms it: filtering on this grid (a circular convolution) equals the linear convolution
 * for any filter whose response fits in the tail.
 *
 * @param pulse - the pulse to filter.
 * @param tail_UI - UIs of room after the pulse (integer 0…4096).
 */
export function paddedSpectrum(pulse: Pulse, tail_UI: number = DEFAULT_TAIL_UI): PaddedSpectrum {
  assertPulse(pulse);
  if (!Number.isInteger(tail_UI) || tail_UI < 0 || tail_UI > 4096) {
    throw new RangeError(`tail_UI must be an integer 0…4096, got ${String(tail_UI)}`);
  }
  const spu = pulse.samplesPerUi;
  const outLength = pulse.values_V.length + tail_UI * spu;
  const size = nextPowerOfTwo(2 * outLength);
  const fft = new FftPlan(size);
  const spectrum = fft.realForward(pulse.values_V);
  const dt = pulse.ui_s / spu;
  const half = size / 2 + 1;
  const freqs_Hz = new Float64Array(half);
  for (let k = 0; k < half; k++) freqs_Hz[k] = k / (size * dt);
  return { fft, spectrum, freqs_Hz, outLength };
}
