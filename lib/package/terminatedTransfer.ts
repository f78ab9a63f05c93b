// The voltage a 2-port delivers between real terminations: reflection coefficients and the
// terminated transfer function of IEEE 802.3 Annex 93A.
import type { NetworkData } from "../channel/networkData.ts";
import type { ComplexArray } from "../signal/fftPlan.ts";
import { checkNetwork } from "./cascadeNetworks.ts";

/**
 * Reflection coefficient of an impedance `Z = re + i·im` against the reference `Z0`:
 * `Γ = (Z − Z0)/(Z + Z0)`, as `[re, im]`.
 *
 * @param z_Ohm - the impedance `[re, im]` in ohms (re ≥ 0).
 * @param reference_Ohm - the reference in ohms (> 0).
 * @see Pozar, *Microwave Engineering*, the reflection coefficient of a load [memory: recalled, not re-read].
 */
export function reflectionCoefficient(z_Ohm: readonly [number, number], reference_Ohm: number): [number, number] {
  const [zr, zi] = z_Ohm;
  if (!(Number.isFinite(zr) && zr >= 0 && Number.isFinite(zi)))
    throw new RangeError(`z_Ohm must be [re ≥ 0, im] finite, got [${zr}, ${zi}]`);
  if (!(Number.isFinite(reference_Ohm) && reference_Ohm > 0))
    throw new RangeError(`reference_Ohm must be a finite number > 0, got ${reference_Ohm}`);
  const nr = zr - reference_Ohm;
  const dr = zr + reference_Ohm;
  const den = dr * dr + zi * zi;
  return [(nr * dr + zi * zi) / den, (zi * dr - nr * zi) / den];
}

/**
 * Voltage transfer of a 2-port driven from a source whose impedance has reflection coefficient
 * `Γ1` and loaded by one with `Γ2` (both against the network's reference, real):
 * `H21 = S21·(1 − Γ1)·(1 + Γ2) / (1 − S11·Γ1 − S22·Γ2 − S21·S12·Γ1·Γ2 + S11·S22·Γ1·Γ2)`, the load
 * voltage relative to the voltage the source gives a matched load (so a matched thru gives 1).
 *
 * @param net - a 2-port.
 * @param sourceGamma - Γ1 of the source termination (real, |Γ1| < 1).
 * @param loadGamma - Γ2 of the load termination (real, |Γ2| < 1).
 * @see IEEE 802.3, Annex 93A, eq. 93A-18 (voltage transfer function with terminations) [memory:
 *   recalled, not re-read]; derived from the signal-flow graph of a terminated 2-port (Pozar).
 */
export function terminatedTransfer(net: NetworkData, sourceGamma: number, loadGamma: number): ComplexArray {
  checkNetwork(net);
  if (net.ports !== 2) throw new RangeError(`net must be a 2-port, it has ${net.ports} ports`);
  for (const [name, g] of [
    ["sourceGamma", sourceGamma],
    ["loadGamma", loadGamma],
  ] as const) {
    if (!(Number.isFinite(g) && Math.abs(g) < 1))
      throw new RangeError(`${name} must be a number with |Γ| < 1, got ${String(g)}`);
  }
  const count = net.freqs_Hz.length;
  const re = new Float64Array(count);
  const im = new Float64Array(count);
  const g1 = sourceGamma;
  const g2 = loadGamma;
  const k = (1 - g1) * (1 + g2);
  for (let f = 0; f < count; f++) {
    const s = net.s.subarray(8 * f, 8 * f + 8);
    const [s11r, s11i, s12r, s12i, s21r, s21i, s22r, s22i] = s;
    const p12r = s21r * s12r - s21i * s12i; // S21·S12
    const p12i = s21r * s12i + s21i * s12r;
    const p11r = s11r * s22r - s11i * s22i; // S11·S22
    const p11i = s11r * s22i + s11i * s22r;
    const dr = 1 - s11r * g1 - s22r * g2 + g1 * g2 * (p11r - p12r);
    const di = -s11i * g1 - s22i * g2 + g1 * g2 * (p11i - p12i);
    const den = dr * dr + di * di;
    re[f] = (k * (s21r * dr + s21i * di)) / den;
    im[f] = (k * (s21i * dr - s21r * di)) / den;
  }
  return { re, im };
}
