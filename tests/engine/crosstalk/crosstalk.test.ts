// Aggressors: pair selection in multi-port files, the synthetic coupling forms, the worst sampling
// phase and the rms an aggressor adds, and integrated crosstalk noise (ICN).
import { describe, expect, it } from "vitest";
import {
  differentialNetwork,
  formatTouchstone,
  lossModelS21,
  pulseFromS21,
  sdd21,
  sParameter,
  type NetworkData,
} from "@lib/channel";
import {
  couplingTransfer,
  crosstalkRms,
  crosstalkTransfers,
  linkFromTouchstone,
  integratedCrosstalkNoise,
  integratedCrosstalkNoiseOfPulses,
  pulseFromCoupling,
  symbolPower,
  worstPhaseSampling,
} from "@lib/crosstalk";
import { pulseArea } from "@lib/pulse";
import { seededRandom } from "@lib/signal";
import type { Pulse } from "@lib/types";

const randomNet = (seed: number, ports: number): NetworkData => {
  const r = seededRandom(seed);
  return {
    ports,
    freqs_Hz: Float64Array.of(1e9, 2e9, 3e9),
    s: Float64Array.from({ length: 2 * 3 * ports * ports }, r.normal),
    referenceOhms: new Float64Array(ports).fill(50),
  };
};

describe("crosstalkTransfers", () => {
  // [source] Bockelman & Eisenstadt, IEEE T-MTT 43(7), 1995: the differential-mode term between two
  // pairs is ½(S[op][ip] − S[op][in] − S[on][ip] + S[on][in]); the victim's is its SDD21.
  it("16 ports: the victim is its SDD21; each aggressor is the mixed-mode term from its pair to the victim's output [Bockelman & Eisenstadt 1995]", () => {
    const net = randomNet(7, 16);
    const victim = { inP: 1, inN: 2, outP: 9, outN: 10 };
    const got = crosstalkTransfers(net, victim, [
      { kind: "next", p: 11, n: 12, name: "lane 2 NEXT" },
      { kind: "fext", p: 5, n: 6 },
    ]);
    const v = sdd21(net, victim);
    const S = (o: number, i: number) => sParameter(net, o, i);
    for (let f = 0; f < 3; f++) {
      expect(got.victim.re[f]).toBeCloseTo(v.re[f], 14);
      expect(got.victim.im[f]).toBeCloseTo(v.im[f], 14);
      for (const [k, p, n] of [
        [0, 11, 12],
        [1, 5, 6],
      ]) {
        const want = 0.5 * (S(9, p).re[f] - S(9, n).re[f] - S(10, p).re[f] + S(10, n).re[f]);
        expect(got.aggressors[k].transfer.re[f]).toBeCloseTo(want, 14);
      }
    }
    expect(got.aggressors.map((a) => [a.name, a.kind])).toEqual([
      ["lane 2 NEXT", "next"],
      ["FEXT 5/6", "fext"],
    ]);
  });

  it("identity: differentialNetwork's entries are SDD21 for every ordered pair of pairs; its reference is 100 Ω", () => {
    const net = randomNet(3, 8);
    const pairs = [
      { p: 1, n: 2 },
      { p: 3, n: 4 },
      { p: 5, n: 6 },
      { p: 7, n: 8 },
    ];
    const dd = differentialNetwork(net, pairs);
    expect(Array.from(dd.referenceOhms)).toEqual([100, 100, 100, 100]);
    for (let i = 0; i < 4; i++) {
      for (let j = 0; j < 4; j++) {
        if (i === j) continue;
        const want = sdd21(net, { inP: pairs[j].p, inN: pairs[j].n, outP: pairs[i].p, outN: pairs[i].n });
        expect(dd.s[2 * ((2 * 4 + i) * 4 + j)]).toBeCloseTo(want.re[2], 14);
      }
    }
  });

  it("edges: too few ports, a port in two pairs, an unknown kind or a port beyond the file", () => {
    const victim = { inP: 1, inN: 2, outP: 3, outN: 4 };
    expect(() => crosstalkTransfers(randomNet(1, 4), victim, [])).toThrow(/6 or more ports/);
    expect(() => crosstalkTransfers(randomNet(1, 8), victim, [{ kind: "next", p: 3, n: 5 }])).toThrow(
      /port 3 appears in more than one pair/,
    );
    expect(() => crosstalkTransfers(randomNet(1, 8), victim, [{ kind: "side" as "next", p: 5, n: 6 }])).toThrow(
      /aggressors\[0\]\.kind/,
    );
    expect(() => crosstalkTransfers(randomNet(1, 8), victim, [{ kind: "fext", p: 5, n: 9 }])).toThrow(
      /pairs\[2\]\.n must be a port 1…8/,
    );
  });
});

describe("linkFromTouchstone", () => {
  it("an 8-port file: the victim's pulse and each aggressor's crosstalk pulse come from their mixed-mode terms", () => {
    // Left ports 1–4, right ports 5–8; the victim runs (1,2) → (5,6). The neighbour's pair (7,8) is driven
    // beside the victim's receiver (NEXT), its pair (3,4) at the far end (FEXT).
    const fN = 14e9;
    const freqs = Float64Array.from({ length: 1200 }, (_, k) => (k + 1) * 25e6);
    const thru = lossModelS21(freqs, { lossAtNyquist_dB: 15, delay_s: 1e-9 }, fN);
    const next = couplingTransfer(
      { kind: "next", backwardCoefficient: 0.02, line: { lossAtNyquist_dB: 1, delay_s: 1e-10 } },
      freqs,
      fN,
    );
    const fext = couplingTransfer(
      { kind: "fext", forwardCoupling_s: 2e-12, line: { lossAtNyquist_dB: 15, delay_s: 1e-9 } },
      freqs,
      fN,
    );
    const n = 8;
    const sm = new Float64Array(freqs.length * n * n * 2);
    const put = (f: number, o: number, i: number, re: number, im: number) => {
      for (const [a, b] of [
        [o, i],
        [i, o],
      ]) {
        sm[2 * ((f * n + a - 1) * n + b - 1)] = re;
        sm[2 * ((f * n + a - 1) * n + b - 1) + 1] = im;
      }
    };
    for (let f = 0; f < freqs.length; f++) {
      for (const [o, i, x] of [
        [5, 1, thru],
        [6, 2, thru],
        [7, 3, thru],
        [8, 4, thru],
        [5, 7, next],
        [6, 8, next],
        [5, 3, fext],
        [6, 4, fext],
      ] as const) {
        put(f, o, i, x.re[f], x.im[f]);
      }
    }
    const text = formatTouchstone(
      { ports: n, freqs_Hz: freqs, s: sm, referenceOhms: new Float64Array(n).fill(50) },
      { version: 2 },
    );
    const grid = { ui_s: 1 / 28e9, samplesPerUi: 8 };
    const link = linkFromTouchstone(text, {
      ...grid,
      victim: { inP: 1, inN: 2, outP: 5, outN: 6 },
      aggressors: [
        { kind: "next", p: 7, n: 8, name: "lane B NEXT" },
        { kind: "fext", p: 3, n: 4 },
      ],
    });
    const want = (x: { re: Float64Array; im: Float64Array }) => pulseFromS21(freqs, x, grid).pulse.values_V;
    const close = (a: Float64Array, b: Float64Array) => a.forEach((v, i) => expect(v).toBeCloseTo(b[i], 6));
    close(link.victim.pulse.values_V, want(thru));
    close(link.aggressors[0].pulse.values_V, want(next));
    close(link.aggressors[1].pulse.values_V, want(fext));
    expect(link.aggressors.map((a) => [a.name, a.kind])).toEqual([
      ["lane B NEXT", "next"],
      ["FEXT 3/4", "fext"],
    ]);
    expect(link.aggressors[0].insertionLoss.magnitude_dB[600]).toBeCloseTo(
      20 * Math.log10(Math.hypot(next.re[600], next.im[600])),
      3,
    );
  });
});

describe("couplingTransfer and pulseFromCoupling", () => {
  const fN = 14e9;
  const lossless = (delay_s: number) => ({ lossAtNyquist_dB: 0, delay_s });

  // [memory] Paul, Analysis of Multiconductor Transmission Lines; Bogatin, Signal and Power Integrity —
  // Simplified: weak coupling gives NEXT = K_b·[v(t) − v(t − 2T_D)] and FEXT = −K_f·T_D·dv/dt(t − T_D).
  it("analytic: lossless NEXT is K_b(1 − e^{−i4πfT_D}), |X| = 2K_b|sin 2πfT_D|, peaking at 2K_b [Paul; Bogatin, memory]", () => {
    const td = 100e-12;
    const freqs = [0, 1e9, 1 / (4 * td), 3.3e9];
    const x = couplingTransfer({ kind: "next", backwardCoefficient: 0.05, line: lossless(td) }, freqs, fN);
    freqs.forEach((f, k) =>
      expect(Math.hypot(x.re[k], x.im[k])).toBeCloseTo(2 * 0.05 * Math.abs(Math.sin(2 * Math.PI * f * td)), 14),
    );
    expect(Math.hypot(x.re[2], x.im[2])).toBeCloseTo(0.1, 14);
  });

  it("analytic: FEXT is −i2πf·K_f·T_D times the line's transfer (grows with f, zero at DC) [Paul; Bogatin, memory]", () => {
    const line = { lossAtNyquist_dB: 20, delay_s: 2e-9 };
    const freqs = [0, 3e9, 14e9];
    const x = couplingTransfer({ kind: "fext", forwardCoupling_s: 5e-12, line }, freqs, fN);
    const h = lossModelS21(freqs, line, fN);
    freqs.forEach((f, k) => {
      const w = -2 * Math.PI * f * 5e-12;
      expect(x.re[k]).toBeCloseTo(-w * h.im[k], 14);
      expect(x.im[k]).toBeCloseTo(w * h.re[k], 14);
    });
    expect(20 * Math.log10(Math.hypot(x.re[2], x.im[2]))).toBeCloseTo(
      20 * Math.log10(2 * Math.PI * 14e9 * 5e-12) - 20,
      10,
    );
  });

  it("analytic: a long lossless NEXT section's pulse is K_b·p(t) then −K_b·p(t − 2T_D); crosstalk pulses have zero area (to the tail trimmed off, 0.5 % of peak·UI)", () => {
    const ui = 1 / 28e9;
    const td = 10 * ui;
    const next = pulseFromCoupling(
      { kind: "next", backwardCoefficient: 0.04, line: lossless(td) },
      { ui_s: ui, samplesPerUi: 16 },
    ).pulse;
    let max = 0;
    let min = 0;
    for (const v of next.values_V) {
      max = Math.max(max, v);
      min = Math.min(min, v);
    }
    expect(max).toBeCloseTo(0.04, 3);
    expect(min).toBeCloseTo(-0.04, 3);
    expect(Math.abs(pulseArea(next))).toBeLessThan(1e-4 * ui);
    const fext = pulseFromCoupling(
      { kind: "fext", forwardCoupling_s: 3e-12, line: { lossAtNyquist_dB: 15, delay_s: 1e-9 } },
      { ui_s: ui, samplesPerUi: 16 },
    ).pulse;
    expect(Math.abs(pulseArea(fext))).toBeLessThan(1e-2 * ui * Math.max(...fext.values_V.map(Math.abs)));
  });

  it("edges: coefficients out of range and unknown kinds are refused, naming the field", () => {
    const line = lossless(1e-10);
    expect(() => couplingTransfer({ kind: "next", backwardCoefficient: 0.6, line }, [1e9], fN)).toThrow(
      /backwardCoefficient/,
    );
    expect(() => couplingTransfer({ kind: "fext", forwardCoupling_s: 1e-6, line }, [1e9], fN)).toThrow(
      /forwardCoupling_s/,
    );
    expect(() => couplingTransfer({ kind: "mid" } as never, [1e9], fN)).toThrow(/kind/);
  });
});

describe("worstPhaseSampling and crosstalkRms", () => {
  const pulseOf = (values: number[], spu: number, mainIndex = 0): Pulse => ({
    ui_s: 1e-10,
    samplesPerUi: spu,
    values_V: Float64Array.from(values),
    mainIndex,
  });

  it("the worst-phase rule: the phase with the largest Σ_k x(t + k·UI)² wins [IEEE 802.3 Annex 93A, memory]", () => {
    // Phase 0 samples 0.1, 0.1, 0.1 (energy 0.03); phase 1 samples 0.15, −0.05, 0 (0.025); phase 2 samples 0, 0.17, 0 (0.0289).
    const p = pulseOf([0.1, 0.15, 0, 0.1, -0.05, 0.17, 0.1, 0, 0], 3, 5);
    const s = worstPhaseSampling(p);
    expect(s.phase).toBe(0);
    expect(Array.from(s.cursors)).toEqual([0.1, 0.1, 0.1]);
    expect(s.energy_V2).toBeCloseTo(0.03, 15);
    expect(s.phase_UI).toBeCloseTo(1 / 3, 15); // (0 − 5)/3 = −5/3 → +1/3 after wrapping into [−½, ½)
    const q = pulseOf([0, 0, 0.3, 0, 0, 0.1, 0, 0, 0], 3, 2);
    const t = worstPhaseSampling(q);
    expect(t.phase).toBe(2);
    expect(Array.from(t.cursors)).toEqual([0.3, 0.1]); // the zero after the last cursor is dropped
    expect(t.phase_UI).toBe(0);
  });

  it("identity: crosstalk rms² equals the sampled pulse's energy for NRZ and 5/9 of it for PAM4", () => {
    const r = seededRandom(4);
    const cursors = Float64Array.from({ length: 40 }, () => 0.01 * r.normal());
    let e = 0;
    for (const x of cursors) e += x * x;
    expect(crosstalkRms(cursors, "nrz") ** 2).toBeCloseTo(e, 15);
    expect(crosstalkRms(cursors, "pam4") ** 2).toBeCloseTo((5 / 9) * e, 15);
    expect(symbolPower("pam4")).toBeCloseTo((1 + 1 + 1 / 9 + 1 / 9) / 4, 15);
  });

  it("oracle: the rms matches the standard deviation of Σ a_k·x_k over 200000 random NRZ symbols (seed 9)", () => {
    const x = [0.02, -0.011, 0.006, 0.003];
    const r = seededRandom(9);
    let s2 = 0;
    const n = 200_000;
    for (let i = 0; i < n; i++) {
      let v = 0;
      for (const c of x) v += r.sign() * c;
      s2 += v * v;
    }
    expect(Math.sqrt(s2 / n) / crosstalkRms(x, "nrz")).toBeCloseTo(1, 2);
  });

  it("edges: a bad pulse or a non-finite cursor is refused", () => {
    expect(() => worstPhaseSampling(pulseOf([], 2))).toThrow(/values_V/);
    expect(() => crosstalkRms([Number.NaN], "nrz")).toThrow(/cursors\[0\]/);
    expect(() => crosstalkRms([1], "pam8" as "nrz")).toThrow(/modulation/);
  });
});

describe("integratedCrosstalkNoise", () => {
  // [computed] from the ICN formula of IEEE 802.3 Annex 85A (same form in 69B), recalled from memory:
  // f_b = 10 GBd, A = 0.5 V, f_nt = f_b/4, f_r = 0.75·f_b, |X| = 0.01 (−40 dB) at 1 and 2 GHz, Δf = 1 GHz.
  // W(1 GHz) = (0.25/1e10)·sinc²(0.1)·1/(1 + 0.4⁴)·1/(1 + (1/7.5)⁸)
  //          = 2.5e-11 · 0.9675312 · 0.9750390 · 0.9999999 = 2.358451e-11 V²/Hz
  // W(2 GHz) = 2.5e-11 · 0.8751402 · 0.7094211 · 0.9999744 = 1.552068e-11 V²/Hz
  // σ² = 2·1e9·1e-4·(2.358451e-11 + 1.552068e-11) = 7.821038e-6 V², σ = 2.796612 mV.
  it("hand-computed example from the published formula: σ = 2.7966 mV [computed, IEEE 802.3 Annex 85A, memory]", () => {
    const x = { re: Float64Array.of(0.01, 0), im: Float64Array.of(0, -0.01) };
    const r = integratedCrosstalkNoise(Float64Array.of(1e9, 2e9), [{ kind: "next", transfer: x, amplitude_V: 0.5 }], {
      baud_Hz: 10e9,
    });
    expect(r.rms_V * 1000).toBeCloseTo(2.796612, 5);
    expect(r.next_V).toBe(r.rms_V);
    expect(r.fext_V).toBe(0);
  });

  it("identities: powers add over aggressors; NEXT and FEXT combine in quadrature; amplitude scales linearly", () => {
    const freqs = Float64Array.from({ length: 50 }, (_, i) => (i + 1) * 2e8);
    const r = seededRandom(2);
    const xt = () => ({
      re: Float64Array.from(freqs, () => 0.01 * r.normal()),
      im: Float64Array.from(freqs, () => 0.01 * r.normal()),
    });
    const a = { kind: "next" as const, transfer: xt(), amplitude_V: 0.4 };
    const b = { kind: "fext" as const, transfer: xt(), amplitude_V: 0.4 };
    const both = integratedCrosstalkNoise(freqs, [a, b], { baud_Hz: 1e10 });
    const one = integratedCrosstalkNoise(freqs, [a], { baud_Hz: 1e10 });
    const two = integratedCrosstalkNoise(freqs, [b], { baud_Hz: 1e10 });
    expect(both.rms_V ** 2).toBeCloseTo(one.rms_V ** 2 + two.rms_V ** 2, 18);
    expect(both.perAggressor_V).toEqual([one.rms_V, two.rms_V]);
    const loud = integratedCrosstalkNoise(freqs, [{ ...a, amplitude_V: 0.8 }], { baud_Hz: 1e10 });
    expect(loud.rms_V / one.rms_V).toBeCloseTo(2, 14);
    expect(integratedCrosstalkNoise(freqs, [], { baud_Hz: 1e10 }).rms_V).toBe(0);
  });

  it("oracle: from the crosstalk pulses (|P|²/UI² for sinc²·|X|²) it equals the transfer form on a fine grid", () => {
    const fb = 28e9;
    const ui = 1 / fb;
    const next = { kind: "next" as const, backwardCoefficient: 0.03, line: { lossAtNyquist_dB: 3, delay_s: 150e-12 } };
    const fext = { kind: "fext" as const, forwardCoupling_s: 4e-12, line: { lossAtNyquist_dB: 20, delay_s: 2e-9 } };
    const freqs = Float64Array.from({ length: 3001 }, (_, k) => k * 1e7);
    const byTransfer = integratedCrosstalkNoise(
      freqs,
      [
        { kind: "next", transfer: couplingTransfer(next, freqs, fb / 2), amplitude_V: 0.4 },
        { kind: "fext", transfer: couplingTransfer(fext, freqs, fb / 2), amplitude_V: 0.5 },
      ],
      { baud_Hz: fb },
    );
    const grid = { ui_s: ui, samplesPerUi: 16 };
    const byPulse = integratedCrosstalkNoiseOfPulses(
      [
        { kind: "next", pulse: pulseFromCoupling(next, grid).pulse, amplitude_V: 0.4 },
        { kind: "fext", pulse: pulseFromCoupling(fext, grid).pulse, amplitude_V: 0.5 },
      ],
      { baud_Hz: fb },
    );
    expect(byPulse.next_V / byTransfer.next_V).toBeCloseTo(1, 2);
    expect(byPulse.fext_V / byTransfer.fext_V).toBeCloseTo(1, 2);
    expect(() =>
      integratedCrosstalkNoiseOfPulses([{ kind: "next", pulse: pulseFromCoupling(next, grid).pulse, amplitude_V: 1 }], {
        baud_Hz: 25e9,
      }),
    ).toThrow(/does not match/);
  });

  it("edges: a non-uniform grid, mismatched lengths or a bad baud rate are refused", () => {
    const x = { re: Float64Array.of(0.01, 0.01, 0.01), im: new Float64Array(3) };
    const ok = [{ kind: "next" as const, transfer: x, amplitude_V: 0.5 }];
    expect(() => integratedCrosstalkNoise(Float64Array.of(1e9, 2e9, 4e9), ok, { baud_Hz: 1e10 })).toThrow(
      /uniform grid/,
    );
    expect(() => integratedCrosstalkNoise(Float64Array.of(1e9, 2e9), ok, { baud_Hz: 1e10 })).toThrow(
      /must hold 2 values/,
    );
    expect(() => integratedCrosstalkNoise(Float64Array.of(1e9, 2e9, 3e9), ok, { baud_Hz: 0 })).toThrow(/baud_Hz/);
  });
});
