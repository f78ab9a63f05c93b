// A uniform lossy transmission-line segment as a 2-port: the trace inside a package (or any short line).
import type { NetworkData } from "../channel/networkData.ts";
import { twoPortNetwork } from "./twoPortNetwork.ts";

/** Loss and delay of a line per metre, the form of IEEE 802.3 Annex 93A's package trace. */
export interface LineLoss {
  /** Skin-effect loss at 1 GHz in nepers per metre (scales as √f), ≥ 0. */
  readonly skinAt1GHz_NpPerM: number;
  /** Dielectric loss at 1 GHz in nepers per metre (scales as f), ≥ 0. */
  readonly dielectricAt1GHz_NpPerM: number;
  /** Propagation delay in seconds per metre, > 0. */
  readonly delay_sPerM: number;
}

/** A line segment: its length, characteristic impedance and loss. */
export interface LineSegment {
  readonly length_m: number;
  readonly impedance_Ohm: number;
  readonly loss: LineLoss;
}

const F0 = 1e9;

/** Throws RangeError naming the field unless `line` is a usable segment. */
export function checkLineSegment(line: LineSegment, name = "line"): void {
  if (line === null || typeof line !== "object") throw new TypeError(`${name} must be a line segment`);
  if (!(Number.isFinite(line.length_m) && line.length_m >= 0 && line.length_m <= 10)) {
    throw new RangeError(`${name}.length_m must be a number 0…10 m, got ${String(line.length_m)}`);
  }
  if (!(Number.isFinite(line.impedance_Ohm) && line.impedance_Ohm > 0)) {
    throw new RangeError(`${name}.impedance_Ohm must be a finite number > 0, got ${String(line.impedance_Ohm)}`);
  }
  const l = line.loss;
  if (l === null || typeof l !== "object") throw new TypeError(`${name}.loss must be an object`);
  for (const key of ["skinAt1GHz_NpPerM", "dielectricAt1GHz_NpPerM"] as const) {
    if (!(Number.isFinite(l[key]) && l[key] >= 0))
      throw new RangeError(`${name}.loss.${key} must be a finite number ≥ 0, got ${String(l[key])}`);
  }
  if (!(Number.isFinite(l.delay_sPerM) && l.delay_sPerM > 0)) {
    throw new RangeError(`${name}.loss.delay_sPerM must be a finite number > 0, got ${String(l.delay_sPerM)}`);
  }
}

/**
 * `γ(f)·z` of the segment (re, im into `out`): with `x = f/1 GHz`,
 * `γ(f) = a1·√x·(1 + i) + a2·x·(1 − i·(2/π)·ln x) + i·2πf·τ` — the causal skin term (equal loss and
 * phase), the dielectric term with its minimum-phase partner, and the delay.
 */
export function linePropagationAt(line: LineSegment, f: number, out: Float64Array): void {
  const x = f / F0;
  const sq = Math.sqrt(x);
  const a1 = line.loss.skinAt1GHz_NpPerM;
  const a2 = line.loss.dielectricAt1GHz_NpPerM;
  const re = a1 * sq + a2 * x;
  const im = a1 * sq - (x > 0 ? a2 * x * (2 / Math.PI) * Math.log(x) : 0) + 2 * Math.PI * f * line.loss.delay_sPerM;
  out[0] = re * line.length_m;
  out[1] = im * line.length_m;
}

/**
 * The segment as a 2-port referred to `R0`: with `ρ = (Zc − R0)/(Zc + R0)` and `E = e^{−γz}`,
 * `S11 = S22 = ρ·(1 − E²)/(1 − ρ²E²)` and `S21 = S12 = (1 − ρ²)·E/(1 − ρ²E²)`.
 *
 * @param line - length, characteristic impedance (real) and loss per metre.
 * @param freqs_Hz - frequencies in Hz.
 * @param reference_Ohm - reference impedance in ohms.
 * @see Pozar, *Microwave Engineering* (S-parameters of a mismatched line section); IEEE 802.3,
 *   Annex 93A, eqs. 93A-9 to 93A-12 (the package trace and its propagation constant) [memory:
 *   recalled, not re-read].
 */
export function transmissionLine(line: LineSegment, freqs_Hz: ArrayLike<number>, reference_Ohm: number): NetworkData {
  checkLineSegment(line);
  const rho = (line.impedance_Ohm - reference_Ohm) / (line.impedance_Ohm + reference_Ohm);
  const r2 = rho * rho;
  const g = new Float64Array(2);
  return twoPortNetwork(freqs_Hz, reference_Ohm, (f, out) => {
    linePropagationAt(line, f, g);
    const mag = Math.exp(-g[0]);
    const er = mag * Math.cos(g[1]); // E = e^{−γz}
    const ei = -mag * Math.sin(g[1]);
    const e2r = er * er - ei * ei;
    const e2i = 2 * er * ei;
    const dr = 1 - r2 * e2r; // 1 − ρ²E²
    const di = -r2 * e2i;
    const den = dr * dr + di * di;
    // ρ(1 − E²)/D and (1 − ρ²)E/D
    const nr = rho * (1 - e2r);
    const ni = -rho * e2i;
    const s11r = (nr * dr + ni * di) / den;
    const s11i = (ni * dr - nr * di) / den;
    const tr = ((1 - r2) * (er * dr + ei * di)) / den;
    const ti = ((1 - r2) * (ei * dr - er * di)) / den;
    out.set([s11r, s11i, tr, ti, tr, ti, s11r, s11i]);
  });
}
