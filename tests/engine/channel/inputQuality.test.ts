// Judging S-parameter files: passivity, reciprocity, causality, band, step, DC point, mode conversion.
import { describe, expect, it } from "vitest";
import {
  formatTouchstone,
  INPUT_QUALITY_LIMITS,
  lossModelS21,
  maxSingularValues,
  pulseFromTouchstone,
  reciprocityErrors,
  type NetworkData,
} from "@lib/channel";
import { seededRandom } from "@lib/signal";

const UI = 1 / 25e9;
type C = [number, number];
const cis = (a: number): C => [Math.cos(a), Math.sin(a)];
const scale = ([a, b]: C, k: number): C => [a * k, b * k];
const times = (x: C, y: C): C => [x[0] * y[0] - x[1] * y[1], x[0] * y[1] + x[1] * y[0]];

/** An N-port over `freqs` whose entry (row, col), ports from 1, is `entry(f, row, col)`. */
const network = (
  ports: number,
  freqs: Float64Array,
  entry: (f: number, row: number, col: number) => C,
): NetworkData => {
  const s = new Float64Array(freqs.length * ports * ports * 2);
  freqs.forEach((f, k) => {
    for (let r = 1; r <= ports; r++) {
      for (let c = 1; c <= ports; c++) {
        const [re, im] = entry(f, r, c);
        const at = 2 * ((k * ports + r - 1) * ports + c - 1);
        s[at] = re;
        s[at + 1] = im;
      }
    }
  });
  return { ports, freqs_Hz: freqs, s, referenceOhms: new Float64Array(ports).fill(50) };
};
const grid = (step: number, stop: number, start = step) =>
  Float64Array.from({ length: Math.round((stop - start) / step) + 1 }, (_, i) => start + i * step);
/** A 2-port with S21 = S12 = `thru(f)` and S11 = S22 = `refl(f)`. */
const twoPort = (
  freqs: Float64Array,
  thru: (f: number) => C,
  refl: (f: number) => C = () => [0, 0],
  back?: (f: number) => C,
) => network(2, freqs, (f, r, c) => (r === c ? refl(f) : r === 2 ? thru(f) : (back ?? thru)(f)));
const judge = (net: NetworkData, extra: object = {}) =>
  pulseFromTouchstone(formatTouchstone(net, { version: 2, format: "RI" }), {
    ui_s: UI,
    samplesPerUi: 16,
    ports: net.ports,
    ...extra,
  }).quality;
const codes = (q: { warnings: { code: string }[] }) => q.warnings.map((w) => w.code);
const delayLine =
  (tau: number, gain = 1) =>
  (f: number) =>
    scale(cis(-2 * Math.PI * f * tau), gain);

describe("inputQuality — passivity [source: Pozar, Microwave Engineering, ch. 4: passive ⇔ every singular value of S ≤ 1]", () => {
  // S = [[a, b], [b, a]] real has singular values |a + b| and |a − b| [computed: a symmetric matrix's eigenvalues].
  it("analytic: S = [[0.3, 0.8], [0.8, 0.3]] has σmax = 1.1 and is named not passive; [[0.3, 0.6], [0.6, 0.3]] has 0.9 and passes", () => {
    const f = grid(10e6, 40e9);
    const hot = judge(
      twoPort(
        f,
        () => [0.8, 0],
        () => [0.3, 0],
      ),
    );
    expect(hot.maxSingularValue).toBeCloseTo(1.1, 12);
    expect(hot.passive).toBe(false);
    expect(hot.warnings.find((w) => w.code === "not-passive")?.message).toMatch(
      /largest singular value of S reaches 1\.1000 at 0\.01 GHz/,
    );
    const ok = judge(
      twoPort(
        f,
        () => [0.6, 0],
        () => [0.3, 0],
      ),
    );
    expect(ok.maxSingularValue).toBeCloseTo(0.9, 12);
    expect(ok.passive).toBe(true);
  });

  it("edges: a lossless matched line (σ = 1 exactly) passes; 1 + 1e-5 of gain does not (the limit is 1 + 1e-6)", () => {
    const f = grid(10e6, 40e9);
    expect(judge(twoPort(f, delayLine(1e-9))).passive).toBe(true);
    const q = judge(twoPort(f, delayLine(1e-9, 1 + 1e-5)));
    expect(q.passive).toBe(false);
    expect(INPUT_QUALITY_LIMITS.maxSingularValue).toBe(1 + 1e-6);
  });

  it("oracle: σmax equals √(largest eigenvalue of SᴴS) by power iteration in complex arithmetic (random 4-ports, seed 9, tol 1e-9)", () => {
    const rnd = seededRandom(9);
    const net = network(4, grid(1e9, 5e9), () => [rnd.normal() * 0.3, rnd.normal() * 0.3]);
    const got = maxSingularValues(net);
    for (let k = 0; k < 5; k++) {
      const S = (r: number, c: number): C => [net.s[2 * ((k * 4 + r) * 4 + c)], net.s[2 * ((k * 4 + r) * 4 + c) + 1]];
      let v: C[] = [
        [1, 0],
        [0.5, 0.1],
        [-0.2, 0.3],
        [0.7, -0.4],
      ];
      let lambda = 0;
      for (let it = 0; it < 2000; it++) {
        const sv = [0, 1, 2, 3].map((r) =>
          v.reduce<C>(
            (acc, x, c) => {
              const p = times(S(r, c), x);
              return [acc[0] + p[0], acc[1] + p[1]];
            },
            [0, 0],
          ),
        );
        const w = [0, 1, 2, 3].map((c) =>
          sv.reduce<C>(
            (acc, y, r) => {
              const p = times([S(r, c)[0], -S(r, c)[1]], y);
              return [acc[0] + p[0], acc[1] + p[1]];
            },
            [0, 0],
          ),
        );
        lambda = Math.hypot(...w.flat());
        v = w.map((x) => scale(x, 1 / lambda));
      }
      expect(Math.abs(got[k] - Math.sqrt(lambda))).toBeLessThan(1e-9);
    }
  });

  it("identities: σmax(c·S) = c·σmax(S), and a lossless 4-port permutation with phases has σ = 1 at every frequency", () => {
    const rnd = seededRandom(3);
    const f = grid(1e9, 4e9);
    const a = network(4, f, () => [rnd.normal(), rnd.normal()]);
    const b = { ...a, s: a.s.map((x) => 0.37 * x) };
    const sa = maxSingularValues(a);
    const sb = maxSingularValues(b);
    sa.forEach((x, i) => expect(sb[i]).toBeCloseTo(0.37 * x, 12));
    const perm = network(4, f, (x, r, c) => (Math.abs(r - c) === 2 ? cis(-2 * Math.PI * x * 1e-9 * r) : [0, 0]));
    for (const x of maxSingularValues(perm)) expect(x).toBeCloseTo(1, 12);
  });
});

describe("inputQuality — reciprocity [source: Pozar, Microwave Engineering, ch. 4: reciprocal ⇔ S = Sᵀ]", () => {
  it("analytic: S21 = 0.9, S12 = 0.1 (an isolator-like file) differs from its transpose by 0.8 and is named; a line is reciprocal", () => {
    const f = grid(10e6, 40e9);
    const q = judge(
      twoPort(
        f,
        () => [0.9, 0],
        () => [0, 0],
        () => [0.1, 0],
      ),
    );
    expect(q.maxReciprocityError).toBeCloseTo(0.8, 12);
    expect(q.reciprocal).toBe(false);
    expect(q.warnings.find((w) => w.code === "not-reciprocal")?.message).toMatch(/differ by up to 0\.800/);
    expect(judge(twoPort(f, delayLine(1e-9, 0.5))).reciprocal).toBe(true);
  });

  it("identities: the error is symmetric in the port order and zero for S + Sᵀ (random 5-port, seed 4)", () => {
    const rnd = seededRandom(4);
    const net = network(5, grid(1e9, 3e9), () => [rnd.normal(), rnd.normal()]);
    const t = network(5, net.freqs_Hz, (f, r, c) => {
      const k = net.freqs_Hz.indexOf(f);
      const at = 2 * ((k * 5 + c - 1) * 5 + r - 1);
      return [net.s[at], net.s[at + 1]];
    });
    const sym = { ...net, s: net.s.map((x, i) => x + t.s[i]) };
    const e = reciprocityErrors(net);
    reciprocityErrors(t).forEach((x, i) => expect(x).toBeCloseTo(e[i], 14));
    for (const x of reciprocityErrors(sym)) expect(x).toBeLessThan(1e-15);
  });
});

describe("inputQuality — causality, band, step, DC point", () => {
  const f = grid(10e6, 40e9);
  const line = lossModelS21(f, { lossAtNyquist_dB: 20, delay_s: 2e-9 }, 12.5e9);
  const lineAt = (x: number) => {
    const i = Math.round(x / 10e6) - 1;
    return [line.re[i], line.im[i]] as C;
  };

  it("analytic: a lossy line (causal model) passes, with the phase's delay within 2 % of its 2 ns", () => {
    const q = judge(twoPort(f, lineAt));
    expect(q.causal).toBe(true);
    expect(q.preOnsetEnergy).toBeLessThan(1e-5);
    expect(Math.abs(q.phaseDelay_s / 2e-9 - 1)).toBeLessThan(0.02);
    expect(q.warnings).toEqual([]);
  });

  // An echo of 0.3 arriving 2 ns *before* the main response carries 0.09/1.09 ≈ 8.3 % of the energy [computed].
  it("analytic: an echo 2 ns before the arrival holds ≈ 8.3 % of the energy and is named not causal", () => {
    const q = judge(
      twoPort(f, (x) => {
        const h = lineAt(x);
        const e = times(h, scale(cis(2 * Math.PI * x * 2e-9), 0.3));
        return [h[0] + e[0], h[1] + e[1]];
      }),
    );
    expect(q.causal).toBe(false);
    expect(Math.abs(q.preOnsetEnergy - 0.09 / 1.09)).toBeLessThan(0.01);
    expect(q.warnings.find((w) => w.code === "not-causal")?.message).toMatch(
      /carries 8\.\d\d % of its energy before its onset/,
    );
  });

  it("edges: a file written with the opposite phase sign (a 2 ns advance) is named with the convention to use", () => {
    const q = judge(
      twoPort(f, (x) => {
        const [a, b] = lineAt(x);
        return [a, -b];
      }),
    );
    expect(q.causal).toBe(false);
    expect(q.warnings.find((w) => w.code === "not-causal")?.message).toMatch(
      /phase rises with frequency \(a delay of -2\.\d+ ns\).*exp\(−j2πfτ\)/,
    );
  });

  it("edges: data stopping at 15 GHz (0.6× of 25 GBd) and a 200 MHz step under an 8 ns delay are each named", () => {
    const short = judge(twoPort(grid(10e6, 15e9), delayLine(0.5e-9, 0.7)));
    expect(short.bandCoverage.baudRatio).toBeCloseTo(0.6, 12);
    expect(short.bandCoverage.fmax_Hz).toBe(15e9);
    expect(short.warnings.find((w) => w.code === "band-below-baud")?.message).toMatch(
      /stop at 15 GHz, 0\.60× the baud rate: the pulse is band-limited by the file, not the channel/,
    );
    const coarse = judge(twoPort(grid(200e6, 40e9, 0), delayLine(4.8e-9, 0.7)));
    expect(coarse.frequencyStep.df_Hz).toBeCloseTo(200e6, 3);
    expect(coarse.frequencyStep.maxDelay_s).toBeCloseTo(5e-9, 18);
    expect(codes(coarse)).toContain("window-short");
  });

  it("edges: data from 300 MHz name the extrapolated DC point; data from 10 MHz do not; a 0 Hz point is 'measured'", () => {
    const late = judge(twoPort(grid(10e6, 40e9, 300e6), delayLine(1e-9, 0.8)));
    expect(late.dcPoint).toBe("extrapolated");
    expect(late.warnings.find((w) => w.code === "dc-extrapolated")?.message).toMatch(/start at 300 MHz/);
    expect(codes(judge(twoPort(f, delayLine(1e-9, 0.8))))).not.toContain("dc-extrapolated");
    expect(judge(twoPort(grid(10e6, 40e9, 0), delayLine(1e-9, 0.8))).dcPoint).toBe("measured");
  });
});

// SCD21 = ½(S31 − S32 + S41 − S42) for pairs (1,2) → (3,4) [source: Bockelman & Eisenstadt, IEEE T-MTT 43(7), 1995].
describe("inputQuality — mode conversion of 4-ports", () => {
  it("analytic: 10 ps of skew between the wires gives |SCD21| = 0.7·|sin(πfδ)|, −6.1 dB at 25 GHz, and is named; a balanced pair is not", () => {
    const f = grid(10e6, 40e9);
    const pair = (skew: number) =>
      network(4, f, (x, r, c) => {
        const key = `${Math.min(r, c)}${Math.max(r, c)}`;
        return key === "13"
          ? scale(cis(-2 * Math.PI * x * 1e-9), 0.7)
          : key === "24"
            ? scale(cis(-2 * Math.PI * x * (1e-9 + skew)), 0.7)
            : [0, 0];
      });
    const skewed = judge(pair(10e-12));
    // Largest up to the baud rate: at 25 GHz, 0.7·sin(π/4) = 0.495 → −6.1 dB.
    const expected = 20 * Math.log10(0.7 * Math.sin(Math.PI * 25e9 * 10e-12));
    expect(Math.abs(skewed.modeConversion_dB! - expected)).toBeLessThan(0.01);
    expect(skewed.warnings.find((w) => w.code === "mode-conversion")?.message).toMatch(
      /\|SCD21\| reaches -6\.1 dB at 25 GHz/,
    );
    expect(codes(skewed)).toContain("mode-conversion");
    const balanced = judge(pair(0));
    expect(balanced.modeConversion_dB!).toBeLessThan(-200);
    expect(codes(balanced)).not.toContain("mode-conversion");
    expect(judge(twoPort(f, delayLine(1e-9, 0.5))).modeConversion_dB).toBeNull();
  });
});
