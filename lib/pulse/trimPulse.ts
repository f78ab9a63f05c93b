// Framing a pulse around its main cursor: trimming or zero-padding to a number of UIs each side.
import type { Pulse } from "../types.ts";
import { assertPulse } from "./assertPulse.ts";

/**
 * A fresh pulse holding exactly `preUi·samplesPerUi` samples before the main cursor and
 * `postUi·samplesPerUi` samples after it: samples beyond are dropped, missing ones are zeros.
 *
 * @param pulse - the pulse response.
 * @param preUi - UIs kept before the main cursor (integer ≥ 0).
 * @param postUi - UIs kept after the main cursor (integer ≥ 0).
 * @returns a pulse of length `(preUi + postUi)·samplesPerUi + 1` with `mainIndex = preUi·samplesPerUi`.
 */
export function trimPulse(pulse: Pulse, preUi: number, postUi: number): Pulse {
  assertPulse(pulse);
  if (!Number.isInteger(preUi) || preUi < 0) throw new RangeError(`preUi must be an integer ≥ 0, got ${String(preUi)}`);
  if (!Number.isInteger(postUi) || postUi < 0) {
    throw new RangeError(`postUi must be an integer ≥ 0, got ${String(postUi)}`);
  }
  const spu = pulse.samplesPerUi;
  const before = preUi * spu;
  const out = new Float64Array(before + postUi * spu + 1);
  const src = pulse.values_V;
  const offset = pulse.mainIndex - before; // source index of out[0]
  for (let i = 0; i < out.length; i++) {
    const j = i + offset;
    if (j >= 0 && j < src.length) out[i] = src[j];
  }
  return { ui_s: pulse.ui_s, samplesPerUi: spu, values_V: out, mainIndex: before };
}
