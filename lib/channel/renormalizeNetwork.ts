// Port reference impedances: S-parameters re-referenced to the system's impedance before use.
import { inverse, Matrix } from "ml-matrix";
import { complexEmbedding } from "./complexEmbedding.ts";
import type { NetworkData } from "./networkData.ts";

/** Tapwright's reference impedance per single-ended port in ohms (100 Ω per differential pair). */
export const SYSTEM_REFERENCE_OHMS = 50;

/**
 * The network re-referenced from its ports' real reference impedances `r` to `r'`:
 * `S' = K·(S − Γ)·(I − Γ·S)⁻¹·K⁻¹` with diagonal `Γᵢ = (r'ᵢ − rᵢ)/(r'ᵢ + rᵢ)` and
 * `Kᵢ = (rᵢ + r'ᵢ)/(2·√(rᵢ·r'ᵢ))`, from the waves `a = (V + rI)/(2√r)`, `b = (V − rI)/(2√r)`
 * at each port. A one-port load Z goes from `(Z − r)/(Z + r)` to `(Z − r')/(Z + r')`. Returns the
 * same object when every port already has its target.
 *
 * @param net - S-parameters with `referenceOhms` per port (Touchstone `R` or `[Reference]`).
 * @param referenceOhms - the target impedance in ohms (> 0): one for every port (default 50 Ω) or one per port.
 * @see Kurokawa, "Power waves and the scattering matrix", IEEE Trans. Microwave Theory Tech. 13(2),
 *   1965 (real references, where power and pseudo-waves agree); IBIS Open Forum, Touchstone 2.0 `[Reference]`.
 */
export function renormalizeNetwork(
  net: NetworkData,
  referenceOhms: number | ArrayLike<number> = SYSTEM_REFERENCE_OHMS,
): NetworkData {
  const n = net.ports;
  const target =
    typeof referenceOhms === "number" ? new Float64Array(n).fill(referenceOhms) : Float64Array.from(referenceOhms);
  if (target.length !== n)
    throw new RangeError(`referenceOhms must hold ${n} impedances (one per port), got ${target.length}`);
  for (const r of target) {
    if (!(r > 0) || !Number.isFinite(r))
      throw new RangeError(`referenceOhms must be finite numbers > 0, got ${String(r)}`);
  }
  if (net.referenceOhms.every((r, i) => r === target[i])) return net;
  const gamma = Array.from(net.referenceOhms, (r, i) => (target[i] - r) / (target[i] + r));
  const k = Array.from(net.referenceOhms, (r, i) => (r + target[i]) / (2 * Math.sqrt(r * target[i])));
  const out = new Float64Array(net.s.length);
  const count = net.freqs_Hz.length;
  for (let f = 0; f < count; f++) {
    const s = complexEmbedding(net.s, n, f);
    // (S − Γ) and (I − Γ·S); Γ is real and diagonal, so its embedding is diag(Γ, Γ).
    const top = s.clone();
    const bottom = Matrix.eye(2 * n, 2 * n);
    for (let r = 0; r < 2 * n; r++) {
      const g = gamma[r % n];
      top.set(r, r, top.get(r, r) - g);
      for (let c = 0; c < 2 * n; c++) bottom.set(r, c, bottom.get(r, c) - g * s.get(r, c));
    }
    const x = top.mmul(inverse(bottom));
    for (let r = 0; r < n; r++) {
      for (let c = 0; c < n; c++) {
        const at = 2 * ((f * n + r) * n + c);
        const scale = k[r] / k[c];
        out[at] = scale * x.get(r, c);
        out[at + 1] = scale * x.get(r + n, c);
      }
    }
  }
  return { ports: n, freqs_Hz: net.freqs_Hz, s: out, referenceOhms: target };
}
