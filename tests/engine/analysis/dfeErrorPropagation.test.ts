// DFE error propagation: the Markov chain of decision errors against its closed form for one tap,
// against a Monte-Carlo of a DFE feeding back its own decisions (NRZ and PAM4), and its edges.
import { describe, expect, it } from "vitest";
import { dfeErrorPropagation, MAX_ERROR_STATES } from "@lib/analysis/dfeErrorPropagation";
import { statisticalEye } from "@lib/analysis/statisticalEye";
import { seededRandom } from "@lib/signal/seededRandom";
import type { Pulse } from "@lib/types";
import { normalCdfOracle } from "./helpers.ts";

/** A symbol-spaced pulse: `cursors[0]` the main cursor, then post-cursors. */
function symbolPulse(cursors: number[]): Pulse {
  return { ui_s: 1e-10, samplesPerUi: 1, values_V: Float64Array.from(cursors), mainIndex: 0 };
}

/** A DFE of `taps` (volts) deciding on `main·a + Σ h_k·a_{−k} − Σ d_k·â_{−k} + noise`; its symbol error ratio. */
function simulateDfe(
  levels: number[],
  cursors: number[],
  taps: number[],
  sigma: number,
  n: number,
  seed: number,
): number {
  const rng = seededRandom(seed);
  const L = cursors.length - 1;
  const sent = new Float64Array(L + 1);
  const decided = new Float64Array(L + 1);
  let errors = 0;
  for (let s = 0; s < n; s++) {
    const a = levels[Math.floor(rng.uniform() * levels.length)];
    let y = cursors[0] * a + sigma * rng.normal();
    for (let k = 1; k <= L; k++) {
      const j = (s - k + (L + 1) * 4) % (L + 1);
      y += cursors[k] * sent[j] - (k <= taps.length ? taps[k - 1] * decided[j] : 0);
    }
    // Nearest level (the eye-centre thresholds).
    let best = levels[0];
    for (const l of levels) if (Math.abs(y - l * cursors[0]) < Math.abs(y - best * cursors[0])) best = l;
    sent[s % (L + 1)] = a;
    decided[s % (L + 1)] = best;
    if (best !== a) errors++;
  }
  return errors / n;
}

describe("dfeErrorPropagation — analytic", () => {
  it("one NRZ tap, noise only: the two-state chain's closed form π = p₀/(1 + p₀ − p₁) [computed: stationary law of a two-state Markov chain]", () => {
    for (const [main, d, sigma] of [
      [1, 0.3, 0.3],
      [1, 0.45, 0.25],
      [0.05, 0.02, 0.008],
    ]) {
      const eye = statisticalEye(symbolPulse([main, d]), { modulation: "nrz", noiseRms_V: sigma, dfeTaps: [d] });
      const r = dfeErrorPropagation(eye, 0);
      if (!r.modelled) throw new Error("expected a modelled chain");
      const Qf = (x: number) => normalCdfOracle(-x);
      const p0 = Qf(main / sigma);
      // After an error of +2 (a +1 read as −1), the sample moves by +2d: ½ of the +1s and ½ of the −1s.
      const p1 = 0.5 * Qf((main + 2 * d) / sigma) + 0.5 * Qf((main - 2 * d) / sigma);
      const want = p0 / (1 + p0 - p1);
      // The law interpolates its tail between grid nodes (log-linear): a few 1e-4 relative.
      expect(Math.abs(r.berWithout / p0 - 1)).toBeLessThan(5e-4);
      expect(Math.abs(r.berWith / want - 1)).toBeLessThan(5e-4);
      expect(r.factor).toBeGreaterThan(1);
      // Duttweiler–Mazo–Messerschmitt's bound for binary signalling, N taps: at most 2^N [memory].
      expect(r.factor as number).toBeLessThanOrEqual(2);
    }
  });
});

describe("dfeErrorPropagation — oracle: Monte-Carlo of a DFE fed its own decisions", () => {
  it("NRZ, two taps (seed 11, 4·10⁶ symbols): the chain's BER within 6 % (≈ 4σ with bursts)", () => {
    const cursors = [1, 0.5, 0.3];
    const sigma = 0.3;
    const eye = statisticalEye(symbolPulse(cursors), { modulation: "nrz", noiseRms_V: sigma, dfeTaps: [0.5, 0.3] });
    const r = dfeErrorPropagation(eye, 0);
    if (!r.modelled) throw new Error("expected a modelled chain");
    const mc = simulateDfe([-1, 1], cursors, [0.5, 0.3], sigma, 4_000_000, 11);
    expect(Math.abs(mc / r.berWith - 1)).toBeLessThan(0.06);
    // Propagation is visible: the simulated ratio is well above the correct-feedback one.
    expect(mc / r.berWithout).toBeGreaterThan(1.2);
    expect(r.factor as number).toBeLessThanOrEqual(4);
  });

  it("Gray-coded PAM4, one tap (seed 12, 4·10⁶ symbols): BER = SER/2 within 6 %", () => {
    const cursors = [1, 0.4];
    const sigma = 0.09;
    const eye = statisticalEye(symbolPulse(cursors), { modulation: "pam4", noiseRms_V: sigma, dfeTaps: [0.4] });
    const r = dfeErrorPropagation(eye, 0);
    if (!r.modelled) throw new Error("expected a modelled chain");
    const ser = simulateDfe([-1, -1 / 3, 1 / 3, 1], cursors, [0.4], sigma, 4_000_000, 12);
    expect(Math.abs(ser / 2 / r.berWith - 1)).toBeLessThan(0.06);
    expect(r.factor as number).toBeGreaterThan(1.1);
  });
});

describe("dfeErrorPropagation — identities and edges", () => {
  it("without DFE taps the factor is 1 and the BER is the eye's BER at the centre threshold", () => {
    const eye = statisticalEye(symbolPulse([1, 0.2, 0.1]), { modulation: "nrz", noiseRms_V: 0.3 });
    const r = dfeErrorPropagation(eye, 0);
    if (!r.modelled) throw new Error("expected a modelled chain");
    expect(r.factor).toBe(1);
    expect(r.berWith).toBe(r.berWithout);
    expect(Math.abs(r.berWithout / eye.ber(0, 0) - 1)).toBeLessThan(1e-12);
  });

  it("a clean eye: the ratio underflows to 0 and the factor is null, not NaN", () => {
    const eye = statisticalEye(symbolPulse([1, 0.3]), { modulation: "nrz", noiseRms_V: 0.01, dfeTaps: [0.3] });
    const r = dfeErrorPropagation(eye, 0);
    if (!r.modelled) throw new Error("expected a modelled chain");
    expect(r.berWithout).toBe(0);
    expect(r.factor).toBeNull();
  });

  it("too many taps for the chain: says so rather than guessing", () => {
    const cursors = [1, ...Array.from({ length: 9 }, () => 0.01)];
    const eye = statisticalEye(symbolPulse(cursors), { modulation: "nrz", noiseRms_V: 0.3, dfeTaps: cursors.slice(1) });
    const r = dfeErrorPropagation(eye, 0);
    expect(r.modelled).toBe(false);
    if (!r.modelled) expect(r.reason).toContain(String(MAX_ERROR_STATES));
    expect(() => dfeErrorPropagation(eye, Number.NaN)).toThrow(RangeError);
  });
});
