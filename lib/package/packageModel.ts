// The transmitter's and receiver's package: die capacitance, a trace, pad capacitance, and the
// die's termination — the package and termination model of IEEE 802.3 Annex 93A.
import type { NetworkData } from "../channel/networkData.ts";
import type { ComplexArray } from "../signal/fftPlan.ts";
import { cascadeNetworks } from "./cascadeNetworks.ts";
import { terminatedTransfer } from "./terminatedTransfer.ts";
import { checkLineSegment, transmissionLine, type LineLoss } from "./transmissionLine.ts";
import { shuntCapacitance } from "./twoPortNetwork.ts";

/** A package model (single-ended values of the differential half-circuit). */
export interface PackageModel {
  /** Die capacitance `C_d` in farads (shunt at the die). */
  readonly dieCapacitance_F: number;
  /** Pad (ball) capacitance `C_p` in farads (shunt at the board). */
  readonly padCapacitance_F: number;
  /** Length of the package trace `z_p` in metres. */
  readonly traceLength_m: number;
  /** Characteristic impedance of the trace `Z_c` in ohms. */
  readonly traceImpedance_Ohm: number;
  /** Loss and delay of the trace per metre. */
  readonly traceLoss: LineLoss;
  /** Die termination `R_d` in ohms. */
  readonly termination_Ohm: number;
  /** Reference `R_0` in ohms (default 50). */
  readonly reference_Ohm?: number;
}

/**
 * The package values of IEEE 802.3 Annex 93A as this project recalls them (802.3bj tables; not
 * re-read — check them against the clause before relying on them): `C_d` = 0.25 pF, `C_p` = 0.18 pF,
 * `z_p` = 12 mm, `Z_c` = 78.2 Ω, `R_d` = 55 Ω, `R_0` = 50 Ω, trace loss `a1` = 1.734·10⁻³ √ns/mm,
 * `a2` = 1.455·10⁻⁴ ns/mm, delay `τ` = 6.141·10⁻³ ns/mm [memory].
 */
export const ANNEX_93A_PACKAGE: PackageModel = {
  dieCapacitance_F: 0.25e-12,
  padCapacitance_F: 0.18e-12,
  traceLength_m: 0.012,
  traceImpedance_Ohm: 78.2,
  traceLoss: { skinAt1GHz_NpPerM: 1.734, dielectricAt1GHz_NpPerM: 0.1455, delay_sPerM: 6.141e-9 },
  termination_Ohm: 55,
  reference_Ohm: 50,
};

/** Throws RangeError naming the field unless `model` is a usable package. */
export function checkPackageModel(model: PackageModel, name = "package"): void {
  if (model === null || typeof model !== "object") throw new TypeError(`${name} must be a package model`);
  for (const key of ["dieCapacitance_F", "padCapacitance_F"] as const) {
    if (!(Number.isFinite(model[key]) && model[key] >= 0 && model[key] < 1e-9)) {
      throw new RangeError(`${name}.${key} must be a capacitance 0…1 nF in farads, got ${String(model[key])}`);
    }
  }
  checkLineSegment(
    { length_m: model.traceLength_m, impedance_Ohm: model.traceImpedance_Ohm, loss: model.traceLoss },
    name,
  );
  for (const key of ["termination_Ohm", "reference_Ohm"] as const) {
    const v = model[key];
    if (v !== undefined && !(Number.isFinite(v) && v > 0))
      throw new RangeError(`${name}.${key} must be a finite resistance > 0, got ${String(v)}`);
  }
}

/**
 * The package as a 2-port from the die (port 1) to the board (port 2): shunt `C_d`, the trace, shunt
 * `C_p`. A receiver's package runs the other way (board → die): the same network with its ports swapped.
 *
 * @param model - the package.
 * @param freqs_Hz - frequencies in Hz.
 * @param side - "tx" (die → board) or "rx" (board → die).
 * @see IEEE 802.3, Annex 93A.1.2 (the package model: C_d, a transmission line, C_p) [memory: recalled, not re-read].
 */
export function packageNetwork(model: PackageModel, freqs_Hz: ArrayLike<number>, side: "tx" | "rx"): NetworkData {
  checkPackageModel(model);
  const r0 = model.reference_Ohm ?? 50;
  const trace = { length_m: model.traceLength_m, impedance_Ohm: model.traceImpedance_Ohm, loss: model.traceLoss };
  const die = shuntCapacitance(model.dieCapacitance_F, freqs_Hz, r0);
  const pad = shuntCapacitance(model.padCapacitance_F, freqs_Hz, r0);
  const line = transmissionLine(trace, freqs_Hz, r0);
  return side === "tx"
    ? cascadeNetworks(cascadeNetworks(die, line), pad)
    : cascadeNetworks(cascadeNetworks(pad, line), die);
}

/** Γ of the die's termination against the reference: `(R_d − R_0)/(R_d + R_0)`. */
export function dieReflection(model: PackageModel): number {
  const r0 = model.reference_Ohm ?? 50;
  return (model.termination_Ohm - r0) / (model.termination_Ohm + r0);
}

/**
 * What the package does to the signal, with the channel on its board side taken as matched (`R_0`):
 * the transmitter's package from its die termination into `R_0`, or the receiver's from `R_0` into its
 * die termination ({@link terminatedTransfer} with the board side matched). Reflections that travel
 * through the channel between the two packages are left out (they are attenuated by the channel's
 * round trip); cascade S-parameter networks with {@link cascadeNetworks} where they matter.
 *
 * @param model - the package.
 * @param freqs_Hz - frequencies in Hz.
 * @param side - "tx" or "rx".
 */
export function packageTransfer(model: PackageModel, freqs_Hz: ArrayLike<number>, side: "tx" | "rx"): ComplexArray {
  const net = packageNetwork(model, freqs_Hz, side);
  const g = dieReflection(model);
  return side === "tx" ? terminatedTransfer(net, g, 0) : terminatedTransfer(net, 0, g);
}
