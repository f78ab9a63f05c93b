// S21 → pulse: delay line, attenuator, first-order low-pass, area = S21(0)·UI, DC extrapolation, grids, taper.
import { describe, expect, it } from "vitest";
import {
  formatTouchstone,
  pulseFromS21,
  pulseFromTouchstone,
  pulseFromSamples,
  s21OnFftGrid,
  type NetworkData,
} from "@lib/channel";
import { pulseArea } from "@lib/pulse";

const UI = 1 / 25e9;
const linspace = (a: number, b: number, n: number) =>
  Float64Array.from({ length: n }, (_, i) => a + ((b - a) * i) / (n - 1));
const sample = (f: Float64Array, h: (f: number) => [number, number]) => {
  const re = new Float64Array(f.length);
  const im = new Float64Array(f.length);
  f.forEach((x, i) => ([re[i], im[i]] = h(x)));
  return { re, im };
};
const delay =
  (tau: number, gain = 1) =>
  (f: number): [number, number] => [gain * Math.cos(-2 * Math.PI * f * tau), gain * Math.sin(-2 * Math.PI * f * tau)];
const lowPass =
  (tau: number) =>
  (f: number): [number, number] => {
    const w = 2 * Math.PI * f * tau; // 1/(1 + jw) = (1 − jw)/(1 + w²)
    return [1 / (1 + w * w), -w / (1 + w * w)];
  };
const timeOf = (r: { start_s: number; pulse: { samplesPerUi: number; ui_s: number } }, i: number) =>
  r.start_s + (i * r.pulse.ui_s) / r.pulse.samplesPerUi;

describe("pulseFromS21 — analytic cases [source: shared/references.md, 'From S21 to a pulse']", () => {
  it("lossless delay exp(−j2πfτ): a one-UI rectangle starting at τ (phase sign: the delay is positive)", () => {
    const f = linspace(0, 100e9, 10001);
    const tau = 1.5e-9;
    const r = pulseFromS21(f, sample(f, delay(tau)), { ui_s: UI, samplesPerUi: 32 });
    const p = r.pulse.values_V;
    const at = (t: number) => p[Math.round((t - r.start_s) / (UI / 32))];
    expect(Math.abs(at(tau + UI / 2) - 1)).toBeLessThan(0.05);
    expect(Math.abs(at(tau - UI))).toBeLessThan(0.02);
    expect(Math.abs(at(tau + 2 * UI))).toBeLessThan(0.02);
    expect(Math.abs(timeOf(r, r.pulse.mainIndex) - (tau + UI / 2))).toBeLessThan(UI / 2);
    expect(pulseArea(r.pulse) / UI).toBeCloseTo(1, 2);
  });

  it("attenuator S21 = 0.3: a rectangle of height 0.3, area 0.3·UI within 1 %", () => {
    const f = linspace(0, 200e9, 2001);
    const r = pulseFromS21(
      f,
      sample(f, () => [0.3, 0]),
      { ui_s: UI, samplesPerUi: 16 },
    );
    expect(Math.abs(pulseArea(r.pulse) / (0.3 * UI) - 1)).toBeLessThan(0.01);
    expect(Math.abs(r.pulse.values_V[r.pulse.mainIndex] - 0.3)).toBeLessThan(0.03);
  });

  // The data must reach far above 1/(2πτ): a band cut at fc rings the step by about 1/(π·2πfc·τ).
  it("first-order low-pass 1/(1 + j2πfτ): the step reaches 63.2 % at τ (pulse = step while t < UI) [source]", () => {
    const tau = 50e-12;
    const ui = 1e-9; // UI ≫ τ, so the pulse equals the step response for t < UI
    const f = linspace(0, 500e9, 50001);
    const r = pulseFromS21(f, sample(f, lowPass(tau)), { ui_s: ui, samplesPerUi: 1024 });
    const dt = ui / 1024;
    const at = (t: number) => r.pulse.values_V[Math.round((t - r.start_s) / dt)];
    expect(Math.abs(at(tau) - (1 - Math.exp(-1)))).toBeLessThan(0.01);
    for (const k of [0.5, 2, 4]) expect(Math.abs(at(k * tau) - (1 - Math.exp(-k)))).toBeLessThan(0.01);
    expect(Math.abs(pulseArea(r.pulse) / ui - 1)).toBeLessThan(0.01);
  });

  it("area = S21(0)·UI within 1 % for delays, attenuators and low-pass channels, with and without a DC point", () => {
    const cases: [number, (f: number) => [number, number]][] = [
      [0.8, delay(0.7e-9, 0.8)],
      [1, lowPass(30e-12)],
      [
        0.5,
        (x) => {
          const [a, b] = lowPass(20e-12)(x);
          const [c, d] = delay(1e-9, 0.5)(x);
          return [a * c - b * d, a * d + b * c];
        },
      ],
    ];
    for (const [dc, h] of cases) {
      for (const f of [linspace(0, 50e9, 5001), linspace(10e6, 50e9, 5000)]) {
        const r = pulseFromS21(f, sample(f, h), { ui_s: UI, samplesPerUi: 32 });
        expect(Math.abs(pulseArea(r.pulse) / (dc * UI) - 1)).toBeLessThan(0.01);
      }
    }
  });
});

describe("pulseFromS21 — pitfalls and identities", () => {
  it("missing DC: extrapolation from 50 MHz gives nearly the same pulse as data with the DC point", () => {
    const h = (x: number): [number, number] => {
      const [a, b] = lowPass(25e-12)(x);
      const [c, d] = delay(0.4e-9)(x);
      return [a * c - b * d, a * d + b * c];
    };
    const withDc = linspace(0, 40e9, 801);
    const noDc = linspace(50e6, 40e9, 800);
    const a = pulseFromS21(withDc, sample(withDc, h), { ui_s: UI, samplesPerUi: 16 });
    const b = pulseFromS21(noDc, sample(noDc, h), { ui_s: UI, samplesPerUi: 16 });
    const n = Math.min(a.pulse.values_V.length, b.pulse.values_V.length, 1000);
    for (let i = 0; i < n; i++) expect(Math.abs(a.pulse.values_V[i] - b.pulse.values_V[i])).toBeLessThan(0.01);
  });

  it("an inverted channel (S21(0) = −0.9 from extrapolation) keeps its sign", () => {
    const f = linspace(100e6, 40e9, 400);
    const r = pulseFromS21(f, sample(f, delay(0.2e-9, -0.9)), { ui_s: UI, samplesPerUi: 16 });
    expect(pulseArea(r.pulse) / UI).toBeCloseTo(-0.9, 2);
    expect(r.pulse.values_V[r.pulse.mainIndex]).toBeLessThan(-0.8);
  });

  it("non-uniform grid: logarithmic frequency points give the same pulse as a uniform grid (tol 0.01)", () => {
    const uniform = linspace(0, 60e9, 6001);
    const log = Float64Array.from({ length: 600 }, (_, i) => 10e6 * 6000 ** (i / 599));
    const h = lowPass(20e-12);
    const a = pulseFromS21(uniform, sample(uniform, h), { ui_s: UI, samplesPerUi: 16, minWindow_UI: 4096 });
    const b = pulseFromS21(log, sample(log, h), { ui_s: UI, samplesPerUi: 16, minWindow_UI: 4096 });
    const n = Math.min(a.pulse.values_V.length, b.pulse.values_V.length);
    expect(n).toBeGreaterThan(200);
    for (let i = 0; i < n; i++) expect(Math.abs(a.pulse.values_V[i] - b.pulse.values_V[i])).toBeLessThan(0.01);
  });

  it("frequency spacing sets the window: a 5 ns delay needs Δf < 200 MHz (10 MHz is the usual ceiling)", () => {
    const f = linspace(0, 40e9, 401); // Δf = 100 MHz → window 10 ns
    const r = pulseFromS21(f, sample(f, delay(5e-9)), { ui_s: UI, samplesPerUi: 8 });
    expect(Math.abs(timeOf(r, r.pulse.mainIndex) - 5e-9)).toBeLessThan(UI);
  });

  it("taper: rolling off the top of the band lowers the truncation ringing of a delay line", () => {
    const f = linspace(0, 30e9, 3001);
    const s = sample(f, delay(1e-9));
    const hard = pulseFromS21(f, s, { ui_s: UI, samplesPerUi: 32, taperFraction: 0 });
    const soft = pulseFromS21(f, s, { ui_s: UI, samplesPerUi: 32, taperFraction: 0.3 });
    // Largest ringing from 3 to 20 UI after the pulse.
    const ringing = (r: typeof hard) => {
      let m = 0;
      for (let i = 0; i < r.pulse.values_V.length; i++) {
        const t = r.start_s + (i * UI) / 32;
        if (t > 1e-9 + 4 * UI && t < 1e-9 + 20 * UI) m = Math.max(m, Math.abs(r.pulse.values_V[i]));
      }
      return m;
    };
    expect(ringing(soft)).toBeLessThan(ringing(hard) / 3);
  });

  // Exact up to what the circular shift carries from the window's end into its negative-time guard.
  it("identity: a delay Δ later in S21 moves the pulse Δ later, sample for sample (tol 1e-5)", () => {
    const f = linspace(0, 50e9, 5001);
    const dt = UI / 16;
    const a = pulseFromS21(f, sample(f, delay(1e-9)), { ui_s: UI, samplesPerUi: 16 });
    const b = pulseFromS21(f, sample(f, delay(1e-9 + 10 * dt)), { ui_s: UI, samplesPerUi: 16 });
    const n = Math.min(a.pulse.values_V.length, b.pulse.values_V.length - 10);
    expect(n).toBeGreaterThan(500);
    for (let i = 0; i < n; i++) expect(Math.abs(b.pulse.values_V[i + 10] - a.pulse.values_V[i])).toBeLessThan(1e-5);
  });

  it("identity: the rise-time filter acts alike on a flat S21 and on a sampled rectangle", () => {
    const f = linspace(0, 400e9, 4001);
    const viaS21 = pulseFromS21(f, sample(f, delay(0)), {
      ui_s: UI,
      samplesPerUi: 16,
      riseTime_s: 15e-12,
      taperFraction: 0,
    });
    const rect = Float64Array.from({ length: 16 * 8 }, (_, i) => (i >= 64 && i < 80 ? 1 : 0));
    const viaSamples = pulseFromSamples(
      { response: "pulse", values: rect, dt_s: UI / 16 },
      { ui_s: UI, samplesPerUi: 16, riseTime_s: 15e-12 },
    );
    const peakA = viaS21.pulse.values_V[viaS21.pulse.mainIndex];
    const peakB = viaSamples.pulse.values_V[viaSamples.pulse.mainIndex];
    expect(Math.abs(peakA - peakB)).toBeLessThan(0.03);
  });

  it("oracle: the Touchstone route (write a .s4p, read it, SDD21) equals S21 given directly", () => {
    const f = linspace(10e6, 40e9, 400);
    const thru = sample(f, (x) => {
      const [a, b] = lowPass(15e-12)(x);
      const [c, d] = delay(0.5e-9)(x);
      return [a * c - b * d, a * d + b * c];
    });
    const n = 4;
    const s = new Float64Array(f.length * n * n * 2);
    for (let k = 0; k < f.length; k++) {
      for (const [o, i] of [
        [3, 1],
        [1, 3],
        [4, 2],
        [2, 4],
      ]) {
        const at = 2 * ((k * n + (o - 1)) * n + (i - 1));
        s[at] = thru.re[k];
        s[at + 1] = thru.im[k];
      }
    }
    const net: NetworkData = { ports: 4, freqs_Hz: f, s, referenceOhms: new Float64Array(4).fill(50) };
    const text = formatTouchstone(net, { version: 2, format: "RI" });
    const a = pulseFromTouchstone(text, { ui_s: UI, samplesPerUi: 16 });
    const b = pulseFromS21(f, thru, { ui_s: UI, samplesPerUi: 16 });
    expect(a.pulse.values_V.length).toBe(b.pulse.values_V.length);
    for (let i = 0; i < a.pulse.values_V.length; i++)
      expect(Math.abs(a.pulse.values_V[i] - b.pulse.values_V[i])).toBeLessThan(1e-12);
    expect(a.insertionLoss.magnitude_dB[0]).toBeCloseTo(0, 3);
  });

  it("edges: too few points, non-ascending, non-finite, huge FFTs and bad options are refused by name", () => {
    const f = Float64Array.of(0, 1e9);
    const s = { re: Float64Array.of(1, 1), im: Float64Array.of(0, 0) };
    const g = { ui_s: UI, samplesPerUi: 8 };
    expect(() => pulseFromS21(Float64Array.of(1e9), { re: Float64Array.of(1), im: Float64Array.of(0) }, g)).toThrow(
      /at least 2/,
    );
    expect(() => pulseFromS21(Float64Array.of(1e9, 1e9), s, g)).toThrow(/ascend/);
    expect(() => pulseFromS21(f, { re: Float64Array.of(1, Number.NaN), im: Float64Array.of(0, 0) }, g)).toThrow(
      /s21\[1\]/,
    );
    expect(() => pulseFromS21(f, { re: Float64Array.of(1), im: Float64Array.of(0) }, g)).toThrow(/2 values/);
    expect(() => pulseFromS21(Float64Array.of(0, 1), s, { ui_s: UI, samplesPerUi: 1024 })).toThrow(/FFT of/);
    expect(() => pulseFromS21(f, s, { ...g, taperFraction: 2 })).toThrow(/taperFraction/);
    expect(() => pulseFromS21(f, s, { ...g, guard_UI: -1 })).toThrow(/guard_UI/);
  });
});

describe("pulseFromS21 — the DC bin, the time window and the band (input checks)", () => {
  // A real impulse response has a real spectrum at 0 Hz (Hermitian symmetry) [common practice]; only
  // that bin may be corrected. Rotating every bin by the DC point's phase distorts the whole pulse.
  it("analytic: a measured DC point with a 0.3 rad phase error leaves the delay line's pulse unchanged (tol 0.01)", () => {
    const f = linspace(0, 50e9, 5001);
    const clean = sample(f, delay(0.5e-9));
    const bad = sample(f, delay(0.5e-9));
    bad.re[0] = Math.cos(0.3);
    bad.im[0] = Math.sin(0.3);
    const a = pulseFromS21(f, clean, { ui_s: UI, samplesPerUi: 16 });
    const b = pulseFromS21(f, bad, { ui_s: UI, samplesPerUi: 16 });
    expect(b.pulse.values_V.length).toBe(a.pulse.values_V.length);
    for (let i = 0; i < a.pulse.values_V.length; i++)
      expect(Math.abs(a.pulse.values_V[i] - b.pulse.values_V[i])).toBeLessThan(0.01);
    expect(b.dcExtrapolated).toBe(false);
  });

  it("identities: on the FFT grid the DC bin is real with the sign of Re S21(0), and every other bin keeps the data's phase", () => {
    const f = linspace(0, 20e9, 201); // bins fall on the data's points: size·dt = 1/Δf
    const h = (x: number): [number, number] => {
      const [a, b] = delay(0.3e-9, -0.7)(x);
      return [a, b + (x === 0 ? 0.05 : 0)];
    };
    const s = sample(f, h);
    const dt = 1 / (2 * 20e9);
    const { spectrum, dcExtrapolated } = s21OnFftGrid(f, s, 400, dt, 0);
    expect(dcExtrapolated).toBe(false);
    expect(spectrum.im[0]).toBe(0);
    expect(spectrum.re[0]).toBeCloseTo(-Math.hypot(0.7, 0.05), 12);
    for (const k of [1, 7, 50, 123]) {
      expect(spectrum.re[k]).toBeCloseTo(s.re[k], 9);
      expect(spectrum.im[k]).toBeCloseTo(s.im[k], 9);
    }
  });

  // Interpolating data spaced Δf repeats the response every 1/Δf [common practice: sampling in
  // frequency aliases in time], so delay plus ring-down must fit in 1/Δf.
  it("analytic: a 5 ns ring-down (single pole) is named in the 20 ns window of a 50 MHz step, and fits the 200 ns of a 5 MHz step", () => {
    const coarse = linspace(0, 40e9, 801);
    const r = pulseFromS21(coarse, sample(coarse, lowPass(5e-9)), { ui_s: UI, samplesPerUi: 8, minWindow_UI: 1 });
    const w = r.warnings.find((x) => x.code === "window-short");
    expect(w?.message).toMatch(
      /not died out within the 20\.5 ns time window that the data's 50 MHz frequency step allows/,
    );
    expect(w?.message).toMatch(/frequency step of at most 24\.4 MHz/);
    const fine = linspace(0, 40e9, 8001);
    const ok = pulseFromS21(fine, sample(fine, lowPass(5e-9)), { ui_s: UI, samplesPerUi: 8, minWindow_UI: 1 });
    expect(ok.warnings).toEqual([]);
    expect(Math.abs(pulseArea(ok.pulse) / UI - 1)).toBeLessThan(0.01);
  });

  it("edges: a 9.5 ns delay in the 10 ns window of a 100 MHz step is named; a 5 ns delay is not", () => {
    const f = linspace(0, 40e9, 401);
    const h =
      (tau: number) =>
      (x: number): [number, number] => {
        const [a, b] = lowPass(10e-12)(x);
        const [c, d] = delay(tau)(x);
        return [a * c - b * d, a * d + b * c];
      };
    expect(pulseFromS21(f, sample(f, h(9.5e-9)), { ui_s: UI, samplesPerUi: 8 }).warnings.map((x) => x.code)).toEqual([
      "window-short",
    ]);
    expect(pulseFromS21(f, sample(f, h(5e-9)), { ui_s: UI, samplesPerUi: 8 }).warnings).toEqual([]);
  });

  it("edges: data stopping at 0.8× the baud rate are named, with what the pulse assumed above them; data to 1.2× are not", () => {
    const short = linspace(0, 20e9, 201);
    const r = pulseFromS21(short, sample(short, delay(0.2e-9)), { ui_s: UI, samplesPerUi: 8 });
    const w = r.warnings.find((x) => x.code === "band-below-baud");
    expect(w?.message).toMatch(/stop at 20 GHz, 0\.80× the baud rate/);
    expect(w?.message).toMatch(/taken as zero above 20 GHz, rolled off over its top 10 %/);
    const full = linspace(0, 30e9, 301);
    expect(pulseFromS21(full, sample(full, delay(0.2e-9)), { ui_s: UI, samplesPerUi: 8 }).warnings).toEqual([]);
    const noDc = linspace(10e6, 30e9, 300);
    expect(pulseFromS21(noDc, sample(noDc, delay(0.2e-9)), { ui_s: UI, samplesPerUi: 8 }).dcExtrapolated).toBe(true);
  });
});

describe("pulseFromTouchstone — port reference impedances", () => {
  // A lossless 100 Ω line of delay τ seen from 50 Ω: S21 = 2z / (2z·cosθ + j(z² + 1)·sinθ), z = 2,
  // θ = 2πfτ [computed from the line's ABCD matrix and Pozar's ABCD→S table, from memory].
  it("oracle: a matched 100 Ω line stated with [Reference] 100 100 gives the pulse of its 50 Ω closed form, reflections included (tol 1e-9)", () => {
    const f = linspace(0, 40e9, 4001);
    const tau = 0.3e-9;
    const n = 2;
    const s = new Float64Array(f.length * n * n * 2);
    f.forEach((x, k) => {
      for (const [o, i] of [
        [2, 1],
        [1, 2],
      ]) {
        const at = 2 * ((k * n + (o - 1)) * n + (i - 1));
        s[at] = Math.cos(2 * Math.PI * x * tau);
        s[at + 1] = -Math.sin(2 * Math.PI * x * tau);
      }
    });
    const text = formatTouchstone(
      { ports: 2, freqs_Hz: f, s, referenceOhms: Float64Array.of(100, 100) },
      { version: 2, format: "RI" },
    );
    const viaFile = pulseFromTouchstone(text, { ui_s: UI, samplesPerUi: 16 });
    const z = 2;
    const closed = sample(f, (x) => {
      const th = 2 * Math.PI * x * tau;
      const [dr, di] = [2 * z * Math.cos(th), (z * z + 1) * Math.sin(th)];
      const d2 = dr * dr + di * di;
      return [(2 * z * dr) / d2, (-2 * z * di) / d2];
    });
    const direct = pulseFromS21(f, closed, { ui_s: UI, samplesPerUi: 16 });
    expect(viaFile.pulse.values_V.length).toBe(direct.pulse.values_V.length);
    for (let i = 0; i < direct.pulse.values_V.length; i++)
      expect(Math.abs(viaFile.pulse.values_V[i] - direct.pulse.values_V[i])).toBeLessThan(1e-9);
    // The first arrival is (1 − Γ²) = 8/9 of the 50 Ω thru's, Γ = 1/3.
    expect(viaFile.pulse.values_V[viaFile.pulse.mainIndex]).toBeGreaterThan(0.8);
    expect(viaFile.pulse.values_V[viaFile.pulse.mainIndex]).toBeLessThan(0.95);
  });
});
