// Pulse from sampled pulse, step and impulse responses; resampling; rise-time filter.
import { describe, expect, it } from "vitest";
import { pulseFromSamples, readCsvResponse, riseTimeKernel, riseTimeResponse, riseTimeSigma } from "@lib/channel";
import { pulseArea } from "@lib/pulse";

const UI = 40e-12;

describe("pulseFromSamples", () => {
  it("analytic: an RC step response 1 − e^(−t/τ) gives the pulse (1 − e^(−t/τ)) − (1 − e^(−(t−UI)/τ))", () => {
    const tau = 15e-12;
    const dtIn = 0.05e-12;
    const values = Float64Array.from({ length: 8001 }, (_, i) => 1 - Math.exp((-i * dtIn) / tau));
    const { pulse, start_s } = pulseFromSamples(
      { response: "step", values, dt_s: dtIn },
      { ui_s: UI, samplesPerUi: 16 },
    );
    expect(start_s).toBe(0);
    const dt = UI / 16;
    for (const j of [3, 10, 16, 20, 40]) {
      const t = j * dt;
      const s = (x: number) => (x <= 0 ? 0 : 1 - Math.exp(-x / tau));
      expect(Math.abs(pulse.values_V[j] - (s(t) - s(t - UI)))).toBeLessThan(1e-5);
    }
    expect(pulse.mainIndex).toBe(16);
  });

  it("identities: the same channel as pulse, step and impulse records gives the same pulse (tol 2e-3)", () => {
    // Channel: a Gaussian impulse response of unit area centred at 100 ps, σ = 12 ps.
    const sigma = 12e-12;
    const dtIn = 0.25e-12;
    const n = 1601;
    const t = Float64Array.from({ length: n }, (_, i) => i * dtIn);
    const erf = (x: number) => {
      // Abramowitz & Stegun 7.1.26 (|error| < 1.5e-7), enough for a 2e-3 check.
      const s = Math.sign(x);
      const a = Math.abs(x);
      const k = 1 / (1 + 0.3275911 * a);
      const y =
        1 -
        ((((1.061405429 * k - 1.453152027) * k + 1.421413741) * k - 0.284496736) * k + 0.254829592) *
          k *
          Math.exp(-a * a);
      return s * y;
    };
    const step = t.map((x) => 0.5 * (1 + erf((x - 100e-12) / (sigma * Math.SQRT2))));
    const impulse = t.map((x) => Math.exp(-0.5 * ((x - 100e-12) / sigma) ** 2) / (sigma * Math.sqrt(2 * Math.PI)));
    const pulseVals = t.map(
      (x, i) => step[i] - (x - UI < 0 ? 0 : 0.5 * (1 + erf((x - UI - 100e-12) / (sigma * Math.SQRT2)))),
    );
    const grid = { ui_s: UI, samplesPerUi: 32 };
    const a = pulseFromSamples({ response: "pulse", values: pulseVals, dt_s: dtIn }, grid).pulse;
    const b = pulseFromSamples({ response: "step", values: step, time_s: t }, grid).pulse;
    const c = pulseFromSamples({ response: "impulse", values: impulse, dt_s: dtIn }, grid).pulse;
    for (let j = 0; j < a.values_V.length; j++) {
      expect(Math.abs(b.values_V[j] - a.values_V[j])).toBeLessThan(2e-3);
      expect(Math.abs(c.values_V[j] - a.values_V[j])).toBeLessThan(2e-3);
    }
    expect(pulseArea(b) / UI).toBeCloseTo(1, 3);
    expect(pulseArea(c) / UI).toBeCloseTo(1, 2);
  });

  it("oracle: a step with an offset baseline and a non-uniform time axis from CSV", () => {
    const csv = "time_s,v\n0,0.2\n10e-12,0.2\n25e-12,0.7\n30e-12,1.2\n80e-12,1.2\n";
    const rec = readCsvResponse(csv);
    const { pulse } = pulseFromSamples(
      { response: "step", values: rec.values, time_s: rec.time_s },
      { ui_s: UI, samplesPerUi: 8 },
    );
    // Baseline 0.2 cancels: the pulse starts at 0 and its height is the step's 1.0.
    expect(pulse.values_V[0]).toBe(0);
    expect(Math.max(...pulse.values_V)).toBeCloseTo(1, 12);
    expect(pulseArea(pulse) / UI).toBeCloseTo(1, 12);
    // Linear interpolation at 15 ps (dt = 5 ps, index 3): 0.2 + 0.5·(5/15).
    expect(pulse.values_V[3]).toBeCloseTo(0.5 / 3, 12);
  });

  it("rise-time filter: 10–90 % of a Gaussian step in the given time; unit DC gain; widened pulse keeps its area", () => {
    // [computed] Gaussian step Φ(t/σ): 10 % at −1.2816σ, 90 % at +1.2816σ, so tr = 2.5631σ.
    expect(riseTimeSigma(25.631e-12)).toBeCloseTo(10e-12, 15);
    expect(riseTimeResponse(0, 20e-12)).toBe(1);
    const sigma = riseTimeSigma(20e-12);
    const fc = 1 / (2 * Math.PI * sigma); // exp(−2π²σ²f²) = exp(−½) at f = 1/(2πσ)
    expect(riseTimeResponse(fc, 20e-12)).toBeCloseTo(Math.exp(-0.5), 14);
    const { kernel, half } = riseTimeKernel(20e-12, 1e-12);
    expect(kernel.reduce((s, v) => s + v, 0)).toBeCloseTo(1, 14);
    expect(kernel[half]).toBe(Math.max(...kernel));
    const rect = Float64Array.from({ length: 64 }, (_, i) => (i >= 16 && i < 32 ? 1 : 0));
    const sharp = pulseFromSamples({ response: "pulse", values: rect, dt_s: UI / 16 }, { ui_s: UI, samplesPerUi: 16 });
    const soft = pulseFromSamples(
      { response: "pulse", values: rect, dt_s: UI / 16 },
      { ui_s: UI, samplesPerUi: 16, riseTime_s: 20e-12 },
    );
    expect(pulseArea(soft.pulse)).toBeCloseTo(pulseArea(sharp.pulse), 20);
    expect(soft.start_s).toBeLessThan(0);
    expect(Math.max(...soft.pulse.values_V)).toBeLessThan(1);
    expect(riseTimeKernel(0, 1e-12).kernel.length).toBe(1);
  });

  it("edges: bad grids, short or non-finite records, missing time step", () => {
    const v = Float64Array.of(0, 1, 0);
    expect(() => pulseFromSamples({ response: "pulse", values: v, dt_s: 1e-12 }, { ui_s: 0, samplesPerUi: 8 })).toThrow(
      /ui_s/,
    );
    expect(() =>
      pulseFromSamples({ response: "pulse", values: v, dt_s: 1e-12 }, { ui_s: UI, samplesPerUi: 0 }),
    ).toThrow(/samplesPerUi/);
    expect(() =>
      pulseFromSamples({ response: "pulse", values: v, dt_s: 1e-12 }, { ui_s: UI, samplesPerUi: 8, riseTime_s: -1 }),
    ).toThrow(/riseTime_s/);
    expect(() => pulseFromSamples({ response: "pulse", values: v }, { ui_s: UI, samplesPerUi: 8 })).toThrow(/dt_s/);
    expect(() =>
      pulseFromSamples({ response: "pulse", values: Float64Array.of(1), dt_s: 1e-12 }, { ui_s: UI, samplesPerUi: 8 }),
    ).toThrow(/at least 2/);
    expect(() =>
      pulseFromSamples(
        { response: "pulse", values: Float64Array.of(1, Number.NaN), dt_s: 1e-12 },
        { ui_s: UI, samplesPerUi: 8 },
      ),
    ).toThrow(/values\[1\]/);
    expect(() =>
      pulseFromSamples({ response: "ramp" as "pulse", values: v, dt_s: 1e-12 }, { ui_s: UI, samplesPerUi: 8 }),
    ).toThrow(/response/);
    expect(() =>
      pulseFromSamples(
        { response: "pulse", values: v, time_s: Float64Array.of(0, 2, 1) },
        { ui_s: UI, samplesPerUi: 8 },
      ),
    ).toThrow(/ascend/);
    expect(() =>
      pulseFromSamples({ response: "pulse", values: v, dt_s: 1 }, { ui_s: 1e-12, samplesPerUi: 1024 }),
    ).toThrow(/at most/);
  });
});
