// Minimum phase from the magnitude (folded real cepstrum): analytic one-pole filter, a random
// minimum-phase FIR as oracle, causality and magnitude identities, edges.
import { describe, expect, it } from "vitest";
import { createFftPlan, minimumPhaseSpectrum, seededRandom } from "@lib/signal";

const N = 1024;
const half = N / 2 + 1;
const omega = (k: number) => (2 * Math.PI * k) / N;

describe("minimumPhaseSpectrum", () => {
  it("analytic: the one-pole filter 1/(1 − a·z⁻¹) gets its phase −atan(a·sin ω / (1 − a·cos ω)) (tol 1e-9) [computed; Oppenheim & Schafer, DTSP §13]", () => {
    for (const a of [0.5, -0.7, 0.9]) {
      const logMag = Float64Array.from(
        { length: half },
        (_, k) => -0.5 * Math.log(1 - 2 * a * Math.cos(omega(k)) + a * a),
      );
      const g = minimumPhaseSpectrum(logMag, N);
      for (let k = 0; k < half; k++) {
        const want = -Math.atan2(a * Math.sin(omega(k)), 1 - a * Math.cos(omega(k)));
        expect(Math.abs(g.phase_rad[k] - want)).toBeLessThan(1e-9);
        expect(Math.hypot(g.re[k], g.im[k])).toBeCloseTo(Math.exp(logMag[k]), 12);
      }
    }
  });

  it("oracle: a random FIR with every zero inside the unit circle is its own minimum-phase version (tol 1e-8)", () => {
    const rnd = seededRandom(2024);
    // h = Π (1 − z_i z⁻¹) with |z_i| < 0.8: minimum phase by construction.
    let h = [1];
    for (let i = 0; i < 6; i++) {
      const z = (rnd.uniform() * 2 - 1) * 0.8;
      const next = new Array(h.length + 1).fill(0);
      h.forEach((c, j) => {
        next[j] += c;
        next[j + 1] -= z * c;
      });
      h = next;
    }
    const H = createFftPlan(N).realForward(Float64Array.from(h));
    const logMag = Float64Array.from({ length: half }, (_, k) => Math.log(Math.hypot(H.re[k], H.im[k])));
    const g = minimumPhaseSpectrum(logMag, N);
    for (let k = 0; k < half; k++) {
      expect(Math.abs(g.re[k] - H.re[k])).toBeLessThan(1e-8);
      expect(Math.abs(g.im[k] - H.im[k])).toBeLessThan(1e-8);
    }
  });

  it("identities: a smooth gain curve gives a causal impulse response; zero log-magnitude gives 1", () => {
    // A lowpass gain smooth around the circle: −1.5·(1 − cos ω) nepers (its cepstrum decays fast).
    const logMag = Float64Array.from({ length: half }, (_, k) => -1.5 * (1 - Math.cos(omega(k))));
    const g = minimumPhaseSpectrum(logMag, N);
    const impulse = createFftPlan(N).realInverse(g);
    const peak = impulse.reduce((m, v) => Math.max(m, Math.abs(v)), 0);
    for (let n = N / 2; n < N; n++) expect(Math.abs(impulse[n])).toBeLessThan(1e-9 * peak);
    const flat = minimumPhaseSpectrum(new Float64Array(half), N);
    for (let k = 0; k < half; k++) {
      expect(flat.re[k]).toBeCloseTo(1, 14);
      expect(flat.im[k]).toBeCloseTo(0, 14);
    }
  });

  it("edges: refuses a size that is not a power of two, a wrong length and non-finite values", () => {
    expect(() => minimumPhaseSpectrum(new Float64Array(5), 6)).toThrow(/size/);
    expect(() => minimumPhaseSpectrum(new Float64Array(4), 8)).toThrow(/logMagnitude/);
    expect(() => minimumPhaseSpectrum(Float64Array.of(0, Number.NaN, 0, 0, 0), 8)).toThrow(/logMagnitude\[1\]/);
  });
});
