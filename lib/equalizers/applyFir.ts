// A symbol-spaced FIR (transmit FIR or receive FFE) applied to an oversampled pulse response.
import type { Pulse } from "../types.ts";
import { assertPulse } from "../pulse/assertPulse.ts";
import { checkTaps } from "./checkTaps.ts";

/**
 * The pulse response through a symbol-spaced FIR: `y(t) = Σ_j c[j]·p(t − j·UI)`, so the main
 * cursor moves `pre` UIs later. A transmit FIR and a receive FFE have the same effect on the
 * pulse; they differ in what they do to noise (see {@link firNoiseGain}).
 *
 * @param pulse - the pulse response (volts for a 1 V symbol).
 * @param taps - `pre + 1 + post` coefficients from the earliest pre-cursor tap; main tap `taps[pre]`.
 * @param pre - number of pre-cursor taps.
 * @returns a fresh pulse of length `values.length + (taps.length − 1)·samplesPerUi` with
 *   `mainIndex = pulse.mainIndex + pre·samplesPerUi`.
 */
export function applyFir(pulse: Pulse, taps: ArrayLike<number>, pre: number): Pulse {
  assertPulse(pulse);
  checkTaps(taps, pre);
  const spu = pulse.samplesPerUi;
  const src = pulse.values_V;
  const out = new Float64Array(src.length + (taps.length - 1) * spu);
  for (let j = 0; j < taps.length; j++) {
    const c = taps[j];
    if (c === 0) continue;
    const off = j * spu;
    for (let i = 0; i < src.length; i++) out[i + off] += c * src[i];
  }
  return { ui_s: pulse.ui_s, samplesPerUi: spu, values_V: out, mainIndex: pulse.mainIndex + pre * spu };
}
