// Package and termination (IEEE 802.3 Annex 93A form), the receiver's bandwidth filter, network
// cascading and the front end applied to pulses.
import { inverse, Matrix } from "ml-matrix";
import { describe, expect, it } from "vitest";
import type { NetworkData } from "@lib/channel";
import { pulseFromLossModel } from "@lib/channel";
import {
  ANNEX_93A_PACKAGE,
  applyFrontEnd,
  cascadeNetworks,
  dieReflection,
  frontEndLoss_dB,
  frontEndTransfer,
  packageNetwork,
  packageTransfer,
  receiverFilter,
  reflectionCoefficient,
  shuntCapacitance,
  terminatedTransfer,
  transmissionLine,
  type LineSegment,
} from "@lib/package";
import { pulseArea } from "@lib/pulse";
import { seededRandom } from "@lib/signal";

type C = [number, number];
const cmul = (a: C, b: C): C => [a[0] * b[0] - a[1] * b[1], a[0] * b[1] + a[1] * b[0]];
const cadd = (a: C, b: C): C => [a[0] + b[0], a[1] + b[1]];
const cdiv = (a: C, b: C): C => {
  const d = b[0] * b[0] + b[1] * b[1];
  return [(a[0] * b[0] + a[1] * b[1]) / d, (a[1] * b[0] - a[0] * b[1]) / d];
};
const s = (net: NetworkData, f: number, row: number, col: number): C => {
  const at = 2 * ((f * net.ports + row) * net.ports + col);
  return [net.s[at], net.s[at + 1]];
};

describe("shuntCapacitance", () => {
  // [practice] an RC low-pass: a shunt C between a source R0 and a load R0 sees R0/2, so
  // |H|² = 1/(1 + (πfR0C)²), −3.010 dB at f = 1/(πR0C), phase −atan(πfR0C).
  it("analytic: a pure capacitance between matched terminations is a single pole at 1/(π·R0·C)", () => {
    const C = 0.5e-12;
    const R0 = 50;
    const f3 = 1 / (Math.PI * R0 * C);
    const freqs = [0, f3 / 10, f3, 3 * f3];
    const net = shuntCapacitance(C, freqs, R0);
    const h = terminatedTransfer(net, 0, 0);
    freqs.forEach((f, k) => {
      const x = Math.PI * f * R0 * C;
      expect(h.re[k] ** 2 + h.im[k] ** 2).toBeCloseTo(1 / (1 + x * x), 14);
      expect(Math.atan2(h.im[k], h.re[k])).toBeCloseTo(-Math.atan(x), 14);
    });
    expect(10 * Math.log10(h.re[2] ** 2 + h.im[2] ** 2)).toBeCloseTo(-3.0103, 4);
  });

  it("identities: lossless (|S11|² + |S21|² = 1) and reciprocal; C = 0 is a thru", () => {
    const net = shuntCapacitance(0.3e-12, [1e9, 1e10, 5e10], 50);
    for (let f = 0; f < 3; f++) {
      const [a, b] = [s(net, f, 0, 0), s(net, f, 1, 0)];
      expect(a[0] ** 2 + a[1] ** 2 + b[0] ** 2 + b[1] ** 2).toBeCloseTo(1, 14);
      expect(s(net, f, 0, 1)).toEqual(s(net, f, 1, 0));
    }
    const thru = shuntCapacitance(0, [1e9], 50);
    [0, 0, 1, 0, 1, 0, 0, 0].forEach((v, i) => expect(thru.s[i]).toBeCloseTo(v, 15));
  });

  it("edges: negative capacitance, bad reference or frequencies are refused", () => {
    expect(() => shuntCapacitance(-1e-12, [1e9], 50)).toThrow(/capacitance_F/);
    expect(() => shuntCapacitance(1e-12, [1e9], 0)).toThrow(/reference_Ohm/);
    expect(() => shuntCapacitance(1e-12, [Number.NaN], 50)).toThrow(/freqs_Hz\[0\]/);
    expect(() => shuntCapacitance(1e-12, [], 50)).toThrow(/at least one/);
  });
});

describe("reflectionCoefficient and terminatedTransfer", () => {
  // [source] Pozar, Microwave Engineering: Γ = (Z − Z0)/(Z + Z0) [memory].
  it("analytic: Γ = (Z − Z0)/(Z + Z0) for real and complex loads [Pozar, memory]", () => {
    expect(reflectionCoefficient([75, 0], 50)).toEqual([0.2, 0]);
    const [r, i] = reflectionCoefficient([55, 0], 50);
    expect(r).toBeCloseTo(1 / 21, 15);
    expect(i).toBe(0);
    const g = reflectionCoefficient([50, 50], 50); // 50j/(100 + 50j) = 0.2 + 0.4j
    expect(g[0]).toBeCloseTo(0.2, 15);
    expect(g[1]).toBeCloseTo(0.4, 15);
    expect(reflectionCoefficient([0, 0], 50)).toEqual([-1, 0]);
    expect(dieReflection(ANNEX_93A_PACKAGE)).toBeCloseTo(5 / 105, 15);
  });

  it("analytic: a mismatched termination reflects Γ — the input reflection of a thru into R is (R − R0)/(R + R0)", () => {
    // Γin = S11 + S12·S21·ΓL/(1 − S22·ΓL); for a thru (S11 = S22 = 0, S21 = S12 = 1) it is ΓL.
    const R = 80;
    const thru = transmissionLine({ length_m: 0, impedance_Ohm: 50, loss: ANNEX_93A_PACKAGE.traceLoss }, [1e9], 50);
    const gl = reflectionCoefficient([R, 0], 50)[0];
    const [a, b, c, d] = [s(thru, 0, 0, 0), s(thru, 0, 0, 1), s(thru, 0, 1, 0), s(thru, 0, 1, 1)];
    const gin = cadd(a, cdiv(cmul(cmul(b, c), [gl, 0]), [1 - d[0] * gl, -d[1] * gl]));
    expect(gin[0]).toBeCloseTo((R - 50) / (R + 50), 15);
    expect(gin[1]).toBeCloseTo(0, 15);
  });

  it("analytic: a thru between equal terminations gives 1; into a load R it gives 1 + Γ = 2R/(R0 + R)", () => {
    const thru = transmissionLine(
      { length_m: 0, impedance_Ohm: 50, loss: ANNEX_93A_PACKAGE.traceLoss },
      [1e9, 2e9],
      50,
    );
    const g = 0.3;
    expect(terminatedTransfer(thru, g, g).re[1]).toBeCloseTo(1, 15);
    const R = 70;
    expect(terminatedTransfer(thru, 0, (R - 50) / (R + 50)).re[0]).toBeCloseTo((2 * R) / (50 + R), 15);
  });

  it("edges: a 4-port, |Γ| ≥ 1 and negative resistance are refused", () => {
    const thru = shuntCapacitance(0, [1e9], 50);
    expect(() => terminatedTransfer(thru, 1, 0)).toThrow(/sourceGamma/);
    expect(() => terminatedTransfer(thru, 0, Number.NaN)).toThrow(/loadGamma/);
    const four: NetworkData = {
      ports: 4,
      freqs_Hz: Float64Array.of(1e9),
      s: new Float64Array(32),
      referenceOhms: new Float64Array(4).fill(50),
    };
    expect(() => terminatedTransfer(four, 0, 0)).toThrow(/2-port/);
    expect(() => reflectionCoefficient([-1, 0], 50)).toThrow(/z_Ohm/);
  });
});

describe("transmissionLine", () => {
  const lossless: LineSegment = {
    length_m: 0.01,
    impedance_Ohm: 50,
    loss: { skinAt1GHz_NpPerM: 0, dielectricAt1GHz_NpPerM: 0, delay_sPerM: 6e-9 },
  };

  it("analytic: a matched lossless line is a pure delay e^{−i2πfτz}", () => {
    const freqs = [0, 1e9, 7.3e9];
    const net = transmissionLine(lossless, freqs, 50);
    freqs.forEach((f, k) => {
      const t = s(net, k, 1, 0);
      expect(t[0]).toBeCloseTo(Math.cos(2 * Math.PI * f * 6e-11), 14);
      expect(t[1]).toBeCloseTo(-Math.sin(2 * Math.PI * f * 6e-11), 14);
      expect(s(net, k, 0, 0)[0]).toBe(0);
    });
  });

  it("analytic: a mismatched lossless quarter-wave line reflects (Zc² − R0²)/(Zc² + R0²)", () => {
    // [source] Pozar: a λ/4 line transforms R0 into Zc²/R0, so Γin = (Zc²/R0 − R0)/(Zc²/R0 + R0).
    const line = { ...lossless, impedance_Ohm: 78.2 };
    const f = 1 / (4 * 6e-11);
    const g = s(transmissionLine(line, [f], 50), 0, 0, 0);
    const zc2 = 78.2 ** 2;
    expect(Math.hypot(g[0], g[1])).toBeCloseTo((zc2 - 2500) / (zc2 + 2500), 13);
  });

  it("identity: two cascaded segments equal one of the summed length (lossy, mismatched)", () => {
    const line = { ...ANNEX_93A_PACKAGE, length_m: 0.005, impedance_Ohm: 78.2, loss: ANNEX_93A_PACKAGE.traceLoss };
    const freqs = [0, 1e8, 5e9, 2.6e10, 5e10];
    const a = transmissionLine({ ...line, length_m: 0.005 }, freqs, 50);
    const b = transmissionLine({ ...line, length_m: 0.007 }, freqs, 50);
    const ab = transmissionLine({ ...line, length_m: 0.012 }, freqs, 50);
    const got = cascadeNetworks(a, b);
    for (let i = 0; i < got.s.length; i++) expect(got.s[i]).toBeCloseTo(ab.s[i], 13);
  });

  it("edges: negative length, zero impedance or delay are refused", () => {
    expect(() => transmissionLine({ ...lossless, length_m: -1 }, [1e9], 50)).toThrow(/length_m/);
    expect(() => transmissionLine({ ...lossless, impedance_Ohm: 0 }, [1e9], 50)).toThrow(/impedance_Ohm/);
    expect(() => transmissionLine({ ...lossless, loss: { ...lossless.loss, delay_sPerM: 0 } }, [1e9], 50)).toThrow(
      /delay_sPerM/,
    );
  });
});

/** Oracle: the T-parameter (transfer scattering) cascade with complex blocks done separately here. */
function tCascadeOracle(a: NetworkData, b: NetworkData): NetworkData {
  const P = a.ports;
  const N = P / 2;
  const block = (net: NetworkData, f: number, r0: number, c0: number) => {
    const re = new Matrix(N, N);
    const im = new Matrix(N, N);
    for (let i = 0; i < N; i++) {
      for (let j = 0; j < N; j++) {
        const [x, y] = s(net, f, r0 + i, c0 + j);
        re.set(i, j, x);
        im.set(i, j, y);
      }
    }
    return { re, im };
  };
  type CM = { re: Matrix; im: Matrix };
  const mul = (x: CM, y: CM): CM => ({
    re: x.re.mmul(y.re).sub(x.im.mmul(y.im)),
    im: x.re.mmul(y.im).add(x.im.mmul(y.re)),
  });
  const sub = (x: CM, y: CM): CM => ({ re: Matrix.sub(x.re, y.re), im: Matrix.sub(x.im, y.im) });
  const neg = (x: CM): CM => ({ re: x.re.clone().mul(-1), im: x.im.clone().mul(-1) });
  // complex inverse via (A + iB)⁻¹ = (A + B·A⁻¹·B)⁻¹ − i·A⁻¹·B·(A + B·A⁻¹·B)⁻¹
  const inv = (x: CM): CM => {
    const ai = inverse(x.re);
    const m = inverse(Matrix.add(x.re, x.im.mmul(ai).mmul(x.im)));
    return { re: m, im: ai.mmul(x.im).mmul(m).mul(-1) };
  };
  const toT = (net: NetworkData, f: number) => {
    const [s11, s12, s21, s22] = [block(net, f, 0, 0), block(net, f, 0, N), block(net, f, N, 0), block(net, f, N, N)];
    const i21 = inv(s21);
    return { t11: sub(s12, mul(mul(s11, i21), s22)), t12: mul(s11, i21), t21: neg(mul(i21, s22)), t22: i21 };
  };
  const out = new Float64Array(a.s.length);
  for (let f = 0; f < a.freqs_Hz.length; f++) {
    const x = toT(a, f);
    const y = toT(b, f);
    const t11 = {
      re: mul(x.t11, y.t11).re.add(mul(x.t12, y.t21).re),
      im: mul(x.t11, y.t11).im.add(mul(x.t12, y.t21).im),
    };
    const t12 = {
      re: mul(x.t11, y.t12).re.add(mul(x.t12, y.t22).re),
      im: mul(x.t11, y.t12).im.add(mul(x.t12, y.t22).im),
    };
    const t21 = {
      re: mul(x.t21, y.t11).re.add(mul(x.t22, y.t21).re),
      im: mul(x.t21, y.t11).im.add(mul(x.t22, y.t21).im),
    };
    const t22 = {
      re: mul(x.t21, y.t12).re.add(mul(x.t22, y.t22).re),
      im: mul(x.t21, y.t12).im.add(mul(x.t22, y.t22).im),
    };
    const s21 = inv(t22);
    const s11 = mul(t12, s21);
    const s22 = neg(mul(s21, t21));
    const s12 = sub(t11, mul(mul(t12, s21), t21));
    const put = (m: CM, r0: number, c0: number) => {
      for (let i = 0; i < N; i++) {
        for (let j = 0; j < N; j++) {
          const at = 2 * ((f * P + r0 + i) * P + c0 + j);
          out[at] = m.re.get(i, j);
          out[at + 1] = m.im.get(i, j);
        }
      }
    };
    put(s11, 0, 0);
    put(s12, 0, N);
    put(s21, N, 0);
    put(s22, N, N);
  }
  return { ...a, s: out };
}

describe("cascadeNetworks", () => {
  const randomNet = (seed: number, ports: number): NetworkData => {
    const r = seededRandom(seed);
    // Small reflections, strong thru terms: a plausible (and invertible) network.
    const s = new Float64Array(2 * 3 * ports * ports);
    const N = ports / 2;
    for (let f = 0; f < 3; f++) {
      for (let i = 0; i < ports; i++) {
        for (let j = 0; j < ports; j++) {
          const thru = Math.abs(i - j) === N;
          const at = 2 * ((f * ports + i) * ports + j);
          s[at] = (thru ? 0.7 : 0) + 0.1 * r.normal();
          s[at + 1] = 0.1 * r.normal();
        }
      }
    }
    return { ports, freqs_Hz: Float64Array.of(1e9, 2e9, 3e9), s, referenceOhms: new Float64Array(ports).fill(50) };
  };

  it.each([2, 4, 8])("oracle: the Redheffer star product equals the T-parameter cascade (%i ports)", (ports) => {
    const a = randomNet(11 + ports, ports);
    const b = randomNet(29 + ports, ports);
    const got = cascadeNetworks(a, b);
    const want = tCascadeOracle(a, b);
    for (let i = 0; i < got.s.length; i++) expect(got.s[i]).toBeCloseTo(want.s[i], 11);
  });

  it("identities: a thru on either side changes nothing; two uncoupled lanes as a 4-port cascade lane by lane", () => {
    const a = randomNet(3, 2);
    const thru: NetworkData = {
      ports: 2,
      freqs_Hz: a.freqs_Hz,
      s: Float64Array.from({ length: 24 }, (_, i) => (i % 8 === 2 || i % 8 === 4 ? 1 : 0)),
      referenceOhms: a.referenceOhms,
    };
    const left = cascadeNetworks(thru, a);
    const right = cascadeNetworks(a, thru);
    for (let i = 0; i < a.s.length; i++) {
      expect(left.s[i]).toBeCloseTo(a.s[i], 14);
      expect(right.s[i]).toBeCloseTo(a.s[i], 14);
    }
    const b = randomNet(5, 2);
    // Lane 1 is ports 1 → 3, lane 2 ports 2 → 4 of a 4-port built from two 2-ports.
    const lanes = (x: NetworkData, y: NetworkData): NetworkData => {
      const out = new Float64Array(2 * 3 * 16);
      const map = [
        [0, 2],
        [1, 3],
      ];
      for (let f = 0; f < 3; f++) {
        [x, y].forEach((net, lane) => {
          for (let i = 0; i < 2; i++) {
            for (let j = 0; j < 2; j++) {
              const at = 2 * ((f * 4 + map[lane][i]) * 4 + map[lane][j]);
              const [re, im] = s(net, f, i, j);
              out[at] = re;
              out[at + 1] = im;
            }
          }
        });
      }
      return { ports: 4, freqs_Hz: x.freqs_Hz, s: out, referenceOhms: new Float64Array(4).fill(50) };
    };
    const four = cascadeNetworks(lanes(a, b), lanes(b, a));
    const ab = cascadeNetworks(a, b);
    expect(s(four, 1, 2, 0)[0]).toBeCloseTo(s(ab, 1, 1, 0)[0], 14);
    expect(s(four, 1, 2, 0)[1]).toBeCloseTo(s(ab, 1, 1, 0)[1], 14);
    expect(s(four, 2, 2, 1)[0]).toBe(0);
  });

  it("edges: odd port counts, different grids, sizes or connected references are refused", () => {
    const a = randomNet(1, 2);
    const three: NetworkData = {
      ports: 3,
      freqs_Hz: a.freqs_Hz,
      s: new Float64Array(54),
      referenceOhms: new Float64Array(3).fill(50),
    };
    expect(() => cascadeNetworks(three, three)).toThrow(/even number/);
    expect(() => cascadeNetworks(a, randomNet(2, 4))).toThrow(/as many ports/);
    expect(() => cascadeNetworks(a, { ...a, freqs_Hz: Float64Array.of(1e9, 2e9, 4e9) })).toThrow(
      /share their frequencies/,
    );
    expect(() => cascadeNetworks(a, { ...a, referenceOhms: Float64Array.of(25, 50) })).toThrow(/renormalize/);
    expect(() => cascadeNetworks(a, { ...a, s: new Float64Array(3) })).toThrow(/b\.s must hold/);
  });
});

describe("packageNetwork and packageTransfer", () => {
  /** Oracle: ABCD (chain) matrices of the same circuit, source R_d and load R0 — a separate method. */
  const abcdOracle = (f: number, side: "tx" | "rx"): C => {
    const m = ANNEX_93A_PACKAGE;
    const w = 2 * Math.PI * f;
    const shunt = (c: number): [C, C, C, C] => [
      [1, 0],
      [0, 0],
      [0, w * c],
      [1, 0],
    ];
    const x = f / 1e9;
    const L = m.traceLength_m;
    const a1 = m.traceLoss.skinAt1GHz_NpPerM;
    const a2 = m.traceLoss.dielectricAt1GHz_NpPerM;
    const gl: C = [
      (a1 * Math.sqrt(x) + a2 * x) * L,
      (a1 * Math.sqrt(x) - (x > 0 ? a2 * x * (2 / Math.PI) * Math.log(x) : 0) + w * m.traceLoss.delay_sPerM) * L,
    ];
    const ep: C = [Math.exp(gl[0]) * Math.cos(gl[1]), Math.exp(gl[0]) * Math.sin(gl[1])];
    const em: C = cdiv([1, 0], ep);
    const ch: C = [(ep[0] + em[0]) / 2, (ep[1] + em[1]) / 2];
    const sh: C = [(ep[0] - em[0]) / 2, (ep[1] - em[1]) / 2];
    const zc = m.traceImpedance_Ohm;
    const line: [C, C, C, C] = [ch, [sh[0] * zc, sh[1] * zc], [sh[0] / zc, sh[1] / zc], ch];
    const mm = (p: [C, C, C, C], q: [C, C, C, C]): [C, C, C, C] => [
      cadd(cmul(p[0], q[0]), cmul(p[1], q[2])),
      cadd(cmul(p[0], q[1]), cmul(p[1], q[3])),
      cadd(cmul(p[2], q[0]), cmul(p[3], q[2])),
      cadd(cmul(p[2], q[1]), cmul(p[3], q[3])),
    ];
    const chain =
      side === "tx"
        ? mm(mm(shunt(m.dieCapacitance_F), line), shunt(m.padCapacitance_F))
        : mm(mm(shunt(m.padCapacitance_F), line), shunt(m.dieCapacitance_F));
    const [rs, rl] = side === "tx" ? [m.termination_Ohm, 50] : [50, m.termination_Ohm];
    // V2/Vs = 1/(A + B/RL + Rs·(C + D/RL)); the transfer is relative to half the source voltage.
    const [A, B, Cc, D] = chain;
    const den = cadd(cadd(A, [B[0] / rl, B[1] / rl]), cmul([rs, 0], cadd(Cc, [D[0] / rl, D[1] / rl])));
    return cdiv([2, 0], den);
  };

  it.each(["tx", "rx"] as const)(
    "oracle: the %s package's transfer equals the chain-matrix analysis of the same circuit",
    (side) => {
      const freqs = [1e6, 1e9, 7e9, 14e9, 26.5e9, 53e9];
      const h = packageTransfer(ANNEX_93A_PACKAGE, freqs, side);
      freqs.forEach((f, k) => {
        const want = abcdOracle(f, side);
        expect(h.re[k]).toBeCloseTo(want[0], 12);
        expect(h.im[k]).toBeCloseTo(want[1], 12);
      });
    },
  );

  it("identities: the rx package is the tx package with its ports swapped; at DC the pair passes 1 − Γ²", () => {
    const freqs = [0, 5e9, 2e10];
    const tx = packageNetwork(ANNEX_93A_PACKAGE, freqs, "tx");
    const rx = packageNetwork(ANNEX_93A_PACKAGE, freqs, "rx");
    for (let f = 0; f < 3; f++) {
      for (const [i, j] of [
        [0, 0],
        [0, 1],
        [1, 0],
        [1, 1],
      ]) {
        expect(s(rx, f, i, j)[0]).toBeCloseTo(s(tx, f, 1 - i, 1 - j)[0], 14);
        expect(s(rx, f, i, j)[1]).toBeCloseTo(s(tx, f, 1 - i, 1 - j)[1], 14);
      }
    }
    const g = dieReflection(ANNEX_93A_PACKAGE);
    const both = frontEndTransfer({ txPackage: ANNEX_93A_PACKAGE, rxPackage: ANNEX_93A_PACKAGE }, [0]);
    expect(both.re[0]).toBeCloseTo(1 - g * g, 14);
    expect(frontEndLoss_dB({ txPackage: ANNEX_93A_PACKAGE, rxPackage: ANNEX_93A_PACKAGE }, 14e9)).toBeGreaterThan(0);
  });

  it("edges: a package with a negative capacitance or no trace delay is refused, naming the field", () => {
    expect(() => packageNetwork({ ...ANNEX_93A_PACKAGE, dieCapacitance_F: -1 }, [1e9], "tx")).toThrow(
      /package\.dieCapacitance_F/,
    );
    expect(() => packageTransfer({ ...ANNEX_93A_PACKAGE, termination_Ohm: 0 }, [1e9], "rx")).toThrow(/termination_Ohm/);
    expect(() => frontEndTransfer({ rxBandwidth_Hz: -1 }, [1e9])).toThrow(/rxBandwidth_Hz/);
  });
});

describe("receiverFilter", () => {
  // [computed] IEEE 802.3 eq. 93A-20 (memory): |H|² = 1/(1 + x⁸), −3.010 dB at f_r.
  it("analytic: |H_r|² = 1/(1 + (f/f_r)⁸), −3.010 dB at f_r, unit DC gain [93A-20, memory]", () => {
    const fr = 0.75 * 25.78125e9;
    const freqs = [0, fr / 2, fr, 2 * fr];
    const h = receiverFilter(fr, freqs);
    freqs.forEach((f, k) => expect(h.re[k] ** 2 + h.im[k] ** 2).toBeCloseTo(1 / (1 + (f / fr) ** 8), 14));
    expect(10 * Math.log10(h.re[2] ** 2 + h.im[2] ** 2)).toBeCloseTo(-3.0103, 4);
  });

  it("oracle: equals the 4th-order Butterworth as two biquads, s² + 2·sin(π/8)·s + 1 and s² + 2·sin(3π/8)·s + 1", () => {
    const fr = 1e10;
    const freqs = [1e9, 7e9, 1.3e10, 4e10];
    const h = receiverFilter(fr, freqs);
    freqs.forEach((f, k) => {
      const x = f / fr;
      const q = (d: number): C => [1 - x * x, d * x];
      const want = cdiv([1, 0], cmul(q(2 * Math.sin(Math.PI / 8)), q(2 * Math.sin((3 * Math.PI) / 8))));
      expect(h.re[k]).toBeCloseTo(want[0], 14);
      expect(h.im[k]).toBeCloseTo(want[1], 14);
    });
  });

  it("edges: bandwidth must be positive and frequencies finite", () => {
    expect(() => receiverFilter(0, [1])).toThrow(/bandwidth_Hz/);
    expect(() => receiverFilter(1e9, [-1])).toThrow(/freqs_Hz\[0\]/);
  });
});

describe("applyFrontEnd", () => {
  const ui = 1 / 28e9;
  const pulse = pulseFromLossModel({ lossAtNyquist_dB: 10 }, { ui_s: ui, samplesPerUi: 16 }).pulse;

  it("identities: no front end returns the pulse; a bandwidth filter keeps the area (unit DC gain); packages scale it by 1 − Γ²", () => {
    expect(applyFrontEnd(pulse, undefined)).toBe(pulse);
    expect(applyFrontEnd(pulse, {})).toBe(pulse);
    const filtered = applyFrontEnd(pulse, { rxBandwidth_Hz: 0.75 * 28e9 });
    expect(pulseArea(filtered) / pulseArea(pulse)).toBeCloseTo(1, 6);
    const g = dieReflection(ANNEX_93A_PACKAGE);
    // Without skin loss (whose √f term has a slow tail beyond the filtered record) the area is exact.
    const smooth = { ...ANNEX_93A_PACKAGE, traceLoss: { ...ANNEX_93A_PACKAGE.traceLoss, skinAt1GHz_NpPerM: 0 } };
    const packaged = applyFrontEnd(pulse, { txPackage: smooth, rxPackage: smooth });
    expect(pulseArea(packaged) / pulseArea(pulse)).toBeCloseTo(1 - g * g, 4);
  });

  it("analytic: the packages delay the pulse by about two traces (2·z_p·τ) and lower its peak", () => {
    const packaged = applyFrontEnd(pulse, { txPackage: ANNEX_93A_PACKAGE, rxPackage: ANNEX_93A_PACKAGE });
    const delay = ((packaged.mainIndex - pulse.mainIndex) * ui) / 16;
    const trace = 2 * ANNEX_93A_PACKAGE.traceLength_m * ANNEX_93A_PACKAGE.traceLoss.delay_sPerM;
    expect(Math.abs(delay - trace)).toBeLessThan(0.5 * trace);
    expect(packaged.values_V[packaged.mainIndex]).toBeLessThan(pulse.values_V[pulse.mainIndex]);
  });
});
