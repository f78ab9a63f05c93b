// Two-port networks built from formulas on a frequency grid: the elements package models are made of.
import type { NetworkData } from "../channel/networkData.ts";

/** Writes `[S11, S12, S21, S22]` (re, im interleaved, 8 numbers) of a 2-port at `freq_Hz` into `out`. */
export type TwoPortFormula = (freq_Hz: number, out: Float64Array) => void;

/** Throws unless `freqs_Hz` are finite and ≥ 0 and `reference_Ohm` is a finite resistance > 0. */
export function checkGrid(freqs_Hz: ArrayLike<number>, reference_Ohm: number): void {
  if (freqs_Hz.length < 1) throw new RangeError("freqs_Hz must hold at least one frequency");
  for (let k = 0; k < freqs_Hz.length; k++) {
    const f = freqs_Hz[k];
    if (!(Number.isFinite(f) && f >= 0))
      throw new RangeError(`freqs_Hz[${k}] must be a finite number ≥ 0, got ${String(f)}`);
  }
  if (!(Number.isFinite(reference_Ohm) && reference_Ohm > 0)) {
    throw new RangeError(`reference_Ohm must be a finite resistance > 0, got ${String(reference_Ohm)}`);
  }
}

/**
 * A 2-port on `freqs_Hz` (both ports referred to `reference_Ohm`) whose S-matrix at each frequency
 * `formula` writes; port 1 is the left side, port 2 the right.
 */
export function twoPortNetwork(
  freqs_Hz: ArrayLike<number>,
  reference_Ohm: number,
  formula: TwoPortFormula,
): NetworkData {
  checkGrid(freqs_Hz, reference_Ohm);
  const count = freqs_Hz.length;
  const s = new Float64Array(8 * count);
  const out = new Float64Array(8);
  for (let k = 0; k < count; k++) {
    formula(freqs_Hz[k], out);
    s.set(out, 8 * k);
  }
  return {
    ports: 2,
    freqs_Hz: Float64Array.from(freqs_Hz),
    s,
    referenceOhms: Float64Array.of(reference_Ohm, reference_Ohm),
  };
}

/**
 * A shunt capacitance `C` to the reference node between two ports of reference `R0`: with
 * `y = i·2πf·C·R0`, `S11 = S22 = −y/(2 + y)` and `S21 = S12 = 2/(2 + y)` — a single pole at
 * `f = 1/(π·R0·C)` between matched terminations.
 *
 * @param capacitance_F - capacitance in farads (≥ 0).
 * @param freqs_Hz - frequencies in Hz.
 * @param reference_Ohm - reference impedance in ohms (> 0).
 * @see IEEE 802.3, Annex 93A, eq. 93A-8 (the package's shunt capacitances) [memory: recalled, not re-read].
 */
export function shuntCapacitance(
  capacitance_F: number,
  freqs_Hz: ArrayLike<number>,
  reference_Ohm: number,
): NetworkData {
  if (!(Number.isFinite(capacitance_F) && capacitance_F >= 0)) {
    throw new RangeError(`capacitance_F must be a finite number ≥ 0, got ${String(capacitance_F)}`);
  }
  return twoPortNetwork(freqs_Hz, reference_Ohm, (f, out) => {
    const y = 2 * Math.PI * f * capacitance_F * reference_Ohm; // y = i·this
    // 2/(2 + iy) = 2(2 − iy)/(4 + y²); −iy/(2 + iy) = −iy(2 − iy)/(4 + y²) = (−y² − 2iy)/(4 + y²)
    const d = 4 + y * y;
    const tr = 4 / d;
    const ti = (-2 * y) / d;
    const rr = (-y * y) / d;
    const ri = (-2 * y) / d;
    out.set([rr, ri, tr, ti, tr, ti, rr, ri]);
  });
}
