// Synthetic lossy line: loss at Nyquist, causal phase, realistic pulses from 5 to 40 dB at 10–56 GBd.
import { describe, expect, it } from "vitest";
import { lossModelS21, pulseFromLossModel } from "@lib/channel";
import { cursorsAt, pulseArea } from "@lib/pulse";

describe("lossModelS21", () => {
  it("analytic: the loss at Nyquist is the one asked for; skin and dielectric shares add; DC is lossless", () => {
    const fN = 14e9;
    for (const loss of [5, 20, 40]) {
      for (const skinFraction of [0, 0.35, 1]) {
        const h = lossModelS21([0, fN], { lossAtNyquist_dB: loss, skinFraction }, fN);
        expect(10 * Math.log10(h.re[1] ** 2 + h.im[1] ** 2)).toBeCloseTo(-loss, 10);
        expect(h.re[0]).toBe(1);
      }
    }
    // √f skin term: at 4·fN a pure skin line loses twice its Nyquist loss; a pure dielectric one four times.
    const skin = lossModelS21([4 * fN], { lossAtNyquist_dB: 10, skinFraction: 1 }, fN);
    expect(10 * Math.log10(skin.re[0] ** 2 + skin.im[0] ** 2)).toBeCloseTo(-20, 10);
    const diel = lossModelS21([4 * fN], { lossAtNyquist_dB: 10, skinFraction: 0 }, fN);
    expect(10 * Math.log10(diel.re[0] ** 2 + diel.im[0] ** 2)).toBeCloseTo(-40, 10);
  });

  it("identity: the skin term's phase equals its loss in nepers (the causal √(jf) form); delay adds −2πfτ", () => {
    const fN = 10e9;
    const f = 3e9;
    const h = lossModelS21([f], { lossAtNyquist_dB: 12, skinFraction: 1 }, fN);
    const lossNp = -Math.log(Math.hypot(h.re[0], h.im[0]));
    expect(Math.atan2(h.im[0], h.re[0])).toBeCloseTo(-lossNp, 12);
    const d = lossModelS21([f], { lossAtNyquist_dB: 0, delay_s: 20e-12 }, fN);
    expect(Math.atan2(d.im[0], d.re[0])).toBeCloseTo(-2 * Math.PI * f * 20e-12, 12);
  });

  it("edges: refuses out-of-range parameters by name", () => {
    expect(() => lossModelS21([1], { lossAtNyquist_dB: -1 }, 1)).toThrow(/lossAtNyquist_dB/);
    expect(() => lossModelS21([1], { lossAtNyquist_dB: 10, skinFraction: 1.5 }, 1)).toThrow(/skinFraction/);
    expect(() => lossModelS21([1], { lossAtNyquist_dB: 10, delay_s: -1 }, 1)).toThrow(/delay_s/);
    expect(() => lossModelS21([1], { lossAtNyquist_dB: 10 }, 0)).toThrow(/nyquist_Hz/);
    expect(() => lossModelS21([-1], { lossAtNyquist_dB: 10 }, 1)).toThrow(/freqs_Hz\[0\]/);
  });
});

describe("pulseFromLossModel — realistic demo pulses", () => {
  it.each([10e9, 25.78125e9, 56e9])(
    "at %d Bd: 5…40 dB give causal pulses of area UI (1 %), falling main cursor",
    (baud) => {
      const ui = 1 / baud;
      let lastMain = Number.POSITIVE_INFINITY;
      for (const loss of [5, 10, 20, 30, 40]) {
        const r = pulseFromLossModel({ lossAtNyquist_dB: loss, delay_s: 1e-9 }, { ui_s: ui, samplesPerUi: 32 });
        const p = r.pulse;
        expect(Math.abs(pulseArea(p) / ui - 1)).toBeLessThan(0.01);
        const main = p.values_V[p.mainIndex];
        expect(main).toBeLessThan(lastMain);
        lastMain = main;
        // The main cursor arrives after the delay and within a few UI of it.
        const tMain = r.start_s + p.mainIndex * (ui / 32);
        expect(tMain).toBeGreaterThan(1e-9);
        expect(tMain).toBeLessThan(1e-9 + 6 * ui);
        // Causal: nothing of note more than 2 UI before the delay.
        for (let i = 0; i < p.values_V.length; i++) {
          if (r.start_s + i * (ui / 32) < 1e-9 - 2 * ui) expect(Math.abs(p.values_V[i])).toBeLessThan(1e-3 * main);
        }
        // Long, positive post-cursor tail with the first post-cursor the largest.
        const c = cursorsAt(p, p.mainIndex, 1, 5).h;
        expect(c[2]).toBeGreaterThan(c[3]);
        expect(c[5]).toBeGreaterThan(0);
        expect(r.insertionLoss.magnitude_dB[100]).toBeCloseTo(-loss, 6); // point 100 of 0…baud is Nyquist
      }
    },
  );

  it("realism: at 5 dB the main cursor stays high; at 40 dB the ISI outweighs the main cursor three times", () => {
    const ui = 1 / 28e9;
    const p5 = pulseFromLossModel({ lossAtNyquist_dB: 5 }, { ui_s: ui, samplesPerUi: 16 }).pulse;
    const p40 = pulseFromLossModel({ lossAtNyquist_dB: 40 }, { ui_s: ui, samplesPerUi: 16 }).pulse;
    expect(p5.values_V[p5.mainIndex]).toBeGreaterThan(0.7);
    const c40 = cursorsAt(p40, p40.mainIndex, 2, 20).h;
    const isi = c40.reduce((s, v, i) => (i === 2 ? s : s + Math.abs(v)), 0);
    expect(isi).toBeGreaterThan(3 * c40[2]);
  });

  it("identity: more samples per UI give the same cursors (tol 1e-3)", () => {
    const ui = 1 / 25e9;
    const a = pulseFromLossModel({ lossAtNyquist_dB: 20, delay_s: 0.5e-9 }, { ui_s: ui, samplesPerUi: 16 });
    const b = pulseFromLossModel({ lossAtNyquist_dB: 20, delay_s: 0.5e-9 }, { ui_s: ui, samplesPerUi: 64 });
    const phaseA = a.pulse.mainIndex;
    const phaseB = phaseA * 4 + Math.round((a.start_s - b.start_s) / (ui / 64));
    const ca = cursorsAt(a.pulse, phaseA, 2, 8).h;
    const cb = cursorsAt(b.pulse, phaseB, 2, 8).h;
    for (let k = 0; k < ca.length; k++) expect(Math.abs(ca[k] - cb[k])).toBeLessThan(1e-3);
  });

  it("edges: a zero-loss line is a rectangle; bad grids are refused", () => {
    const ui = 1 / 25e9;
    const r = pulseFromLossModel({ lossAtNyquist_dB: 0 }, { ui_s: ui, samplesPerUi: 16 });
    expect(Math.abs(r.pulse.values_V[r.pulse.mainIndex] - 1)).toBeLessThan(0.1);
    expect(() => pulseFromLossModel({ lossAtNyquist_dB: 10 }, { ui_s: ui, samplesPerUi: 0 })).toThrow(/samplesPerUi/);
    expect(() =>
      pulseFromLossModel({ lossAtNyquist_dB: 10, delay_s: 1e-6 }, { ui_s: 1e-12, samplesPerUi: 1024 }),
    ).toThrow(/FFT of/);
  });
});
