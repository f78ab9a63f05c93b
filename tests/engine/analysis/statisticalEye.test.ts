// The statistical eye: closed forms of clean and one-post-cursor pulses, DFE, PAM4, a brute-force
// oracle, monotonicity properties and edges.
import erfc from "@stdlib/math-base-special-erfc";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { qFromBer } from "@lib/analysis/ber";
import { statisticalEye, symbolLevels } from "@lib/analysis/statisticalEye";
import { cursorPulse, enumerateIsi } from "./helpers.ts";

const BER = 1e-12;

/** Exact edge quantile: the v where P(level + ISI + noise < v) = tail, by bisection on enumerated sums (independent of lib). */
function enumeratedUpperEdge(level_V: number, isi: number[], alphabet: number[], sigma: number, tail: number): number {
  const { values, prob } = enumerateIsi(isi, alphabet);
  const below = (v: number) => values.reduce((s, x) => s + prob * normalTail((level_V + x - v) / sigma), 0);
  let lo = level_V - 2;
  let hi = level_V;
  for (let i = 0; i < 100; i++) {
    const m = (lo + hi) / 2;
    if (below(m) < tail) lo = m;
    else hi = m;
  }
  return lo;
}

/** Q(x) = P(N(0,1) > x) by erfc (the test's own, from @stdlib, not the engine's ber.ts). */
function normalTail(x: number): number {
  return 0.5 * erfc(x / Math.SQRT2);
}

describe("statisticalEye — analytic cases (BER = average over levels of the conditional error; NRZ edge tail 2·BER, PAM4 8·BER)", () => {
  it("a clean pulse of height A gives eyeHeight = 2A − 2·Q(2·BER)·σ [computed from BER = ½(P(e|+1) + P(e|−1)), Q from ½·erfc(Q/√2)], tol 1e-3·σ", () => {
    for (const sigma of [0.001, 0.005, 0.02]) {
      for (const ber of [1e-6, 1e-12, 1e-15]) {
        const eye = statisticalEye(cursorPulse([0, 0.4, 0], 1), {
          modulation: "nrz",
          noiseRms_V: sigma,
          targetBer: ber,
        });
        expect(Math.abs(eye.eyeHeight(0, ber) - (0.8 - 2 * qFromBer(2 * ber) * sigma))).toBeLessThan(1e-3 * sigma);
      }
    }
  });

  it("one post-cursor r without DFE: the edge solves ½Q((A−r−v)/σ) + ½Q((A+r−v)/σ) = 2·BER [computed], tol 1 µV", () => {
    const sigma = 0.01;
    const eye = statisticalEye(cursorPulse([0, 0.4, 0.1234, 0], 1), { modulation: "nrz", noiseRms_V: sigma });
    const top = enumeratedUpperEdge(0.4, [0.1234], [-1, 1], sigma, 2 * BER);
    expect(Math.abs(eye.eyeHeight(0, BER) - 2 * top)).toBeLessThan(1e-6);
  });

  it("one post-cursor r with a DFE tap equal to r: back to the clean eye 2A − 2·Q(2·BER)·σ", () => {
    const sigma = 0.01;
    const eye = statisticalEye(cursorPulse([0, 0.4, 0.1234, 0], 1), {
      modulation: "nrz",
      noiseRms_V: sigma,
      dfeTaps: [0.1234],
    });
    expect(Math.abs(eye.eyeHeight(0, BER) - (0.8 - 2 * qFromBer(2 * BER) * sigma))).toBeLessThan(1e-3 * sigma);
  });

  it("a clipped DFE tap leaves its residual (enumerated edge of the one residual cursor)", () => {
    const sigma = 0.01;
    const r = 0.2;
    const limit = 0.1517;
    const eye = statisticalEye(cursorPulse([0, 0.4, r, 0], 1), {
      modulation: "nrz",
      noiseRms_V: sigma,
      dfeTaps: [limit],
    });
    const top = enumeratedUpperEdge(0.4, [r - limit], [-1, 1], sigma, 2 * BER);
    expect(Math.abs(eye.eyeHeight(0, BER) - 2 * top)).toBeLessThan(1e-6);
  });

  it("PAM4 clean pulse: every eye is 2A/3 − 2·Q(8·BER)·σ (Gray coding: BER = SER/2, adjacent errors [Proakis, memory]); 20·log10 3 = 9.542 dB below NRZ without noise [practice]", () => {
    const pulse = cursorPulse([0, 0.45, 0], 1);
    const nrz = statisticalEye(pulse, { modulation: "nrz", noiseRms_V: 0 }).eyeHeight(0, BER);
    const pam4 = statisticalEye(pulse, { modulation: "pam4", noiseRms_V: 0 });
    expect(20 * Math.log10(nrz / pam4.eyeHeight(0, BER))).toBeCloseTo(9.542, 3);
    const ber = 1e-6;
    const noisy = statisticalEye(pulse, { modulation: "pam4", noiseRms_V: 0.004, targetBer: ber });
    for (const h of noisy.eyeHeights(0, ber))
      expect(Math.abs(h - (0.3 - 2 * qFromBer(8 * ber) * 0.004))).toBeLessThan(4e-6);
  });

  it("levels: NRZ ±1 and PAM4 ±1, ±1/3 (the engine's symbol convention); a mismatched transmitter moves the inner levels", () => {
    expect(Array.from(symbolLevels("nrz"))).toEqual([-1, 1]);
    expect(Array.from(symbolLevels("pam4"))).toEqual([-1, -1 / 3, 1 / 3, 1]);
    expect(Array.from(symbolLevels("pam4", 0.3))).toEqual([-1, -0.3, 0.3, 1]);
  });
});

describe("statisticalEye — oracle (brute-force enumeration of every symbol pattern, exact Gaussian tails)", () => {
  it("NRZ, 14 cursors (2^13 patterns), off-grid values: eye height within 0.01 mV at 1e-12", () => {
    const cursors = [
      0.031, -0.047, 0.5, 0.1213, -0.0587, 0.0311, 0.0207, -0.0149, 0.0103, 0.0079, -0.0051, 0.0037, 0.0023, -0.0011,
    ];
    const main = 2;
    const sigma = 0.007;
    const eye = statisticalEye(cursorPulse(cursors, main), { modulation: "nrz", noiseRms_V: sigma });
    const isi = cursors.filter((_, i) => i !== main);
    const top = enumeratedUpperEdge(0.5, isi, [-1, 1], sigma, 2 * BER);
    expect(Math.abs(eye.eyeHeight(0, BER) - 2 * top)).toBeLessThan(1e-5);
  });

  it("property: random off-grid cursors (NRZ ≤ 10, PAM4 ≤ 6) agree with enumeration within 0.01 mV", () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -0.06, max: 0.06, noNaN: true }), { minLength: 1, maxLength: 10 }),
        fc.double({ min: 0.002, max: 0.012, noNaN: true }),
        fc.constantFrom("nrz" as const, "pam4" as const),
        (raw, sigma, mod) => {
          const isi = mod === "pam4" ? raw.slice(0, 6) : raw;
          const ber = mod === "nrz" ? 1e-12 : 1e-6;
          const eye = statisticalEye(cursorPulse([0, 0.4, ...isi, 0], 1), {
            modulation: mod,
            noiseRms_V: sigma,
            targetBer: ber,
          });
          const alphabet = mod === "nrz" ? [-1, 1] : [-1, -1 / 3, 1 / 3, 1];
          const tail = mod === "nrz" ? 2 * ber : 8 * ber;
          const level = mod === "nrz" ? 0.4 : 0.4 / 3; // the top edge of the middle PAM4 eye
          const top = enumeratedUpperEdge(level, isi, alphabet, sigma, tail);
          const want = Math.max(0, 2 * top);
          const got = mod === "nrz" ? eye.eyeHeight(0, ber) : eye.eyeHeights(0, ber)[1];
          return Math.abs(got - want) < 1e-5;
        },
      ),
      { seed: 20261204, numRuns: 40 },
    );
  }, 120_000);

  it("PAM4 with level mismatch (inner levels ±0.3, RLM = 0.9 [IEEE 802.3 Clause 120D form, memory]): the middle eye is smaller than the outer two, each within 0.01 mV of enumeration", () => {
    const x = 0.3;
    const sigma = 0.004;
    const ber = 1e-6;
    const cursors = [0.0081, 0.45, 0.0307, -0.0123, 0.0051];
    const eye = statisticalEye(cursorPulse(cursors, 1), {
      modulation: "pam4",
      noiseRms_V: sigma,
      targetBer: ber,
      pam4InnerLevel: x,
    });
    const isi = [0.0081, 0.0307, -0.0123, 0.0051];
    const alphabet = [-1, -x, x, 1];
    const h = eye.eyeHeights(0, ber);
    // Outer eyes: between levels x and 1 (top edge of level 1, bottom edge of level x = mirror of the top edge of −x).
    const outer =
      enumeratedUpperEdge(0.45, isi, alphabet, sigma, 8 * ber) +
      enumeratedUpperEdge(-x * 0.45, isi, alphabet, sigma, 8 * ber);
    const middle = 2 * enumeratedUpperEdge(x * 0.45, isi, alphabet, sigma, 8 * ber);
    expect(Math.abs(h[0] - outer)).toBeLessThan(1e-5);
    expect(Math.abs(h[2] - outer)).toBeLessThan(1e-5);
    expect(Math.abs(h[1] - middle)).toBeLessThan(1e-5);
    expect(h[0] - h[1]).toBeGreaterThan(0.01);
  });

  it("PAM4 with DJ and asymmetric cursors: the outer and middle eyes differ; each within 0.01 mV of the enumerated dual-Dirac mixture", () => {
    const spu = 16;
    const sigma = 0.003;
    const ber = 1e-6;
    const pulse = cursorPulse([0, 0.021, 0.45, 0.063, 0.017, 0], 2, spu);
    const dj = 0.125; // ±1 sample, ½ each: the mixture of the phases −1 and +1
    const eye = statisticalEye(pulse, {
      modulation: "pam4",
      noiseRms_V: sigma,
      targetBer: ber,
      jitter: { rjRms_UI: 0, djPp_UI: dj },
    });
    const h = eye.eyeHeights(0, ber);
    const at = (p: number) => {
      const c = [0, 1, 2, 3, 4, 5].map((k) => {
        const i = 2 * spu + p + (k - 2) * spu;
        return i >= 0 && i < pulse.values_V.length ? pulse.values_V[i] : 0;
      });
      return { main: c[2], isi: c.filter((_, k) => k !== 2) };
    };
    const alphabet = [-1, -1 / 3, 1 / 3, 1];
    // Edge of a level's band under the mixture: bisection on ½·P(phase −2) + ½·P(phase +2).
    const mixedUpperEdge = (level: number) => {
      const laws = [at(-1), at(1)].map(({ main, isi }) => ({ main, ...enumerateIsi(isi, alphabet) }));
      const below = (v: number) =>
        laws.reduce(
          (s, l) => s + 0.5 * l.values.reduce((a, x) => a + l.prob * normalTail((level * l.main + x - v) / sigma), 0),
          0,
        );
      let lo = -1;
      let hi = 1;
      for (let i = 0; i < 100; i++) {
        const m = (lo + hi) / 2;
        if (below(m) < 8 * ber) lo = m;
        else hi = m;
      }
      return lo;
    };
    const outer = mixedUpperEdge(1) + mixedUpperEdge(-1 / 3);
    const middle = 2 * mixedUpperEdge(1 / 3);
    expect(Math.abs(h[0] - outer)).toBeLessThan(1e-5);
    expect(Math.abs(h[2] - outer)).toBeLessThan(1e-5);
    expect(Math.abs(h[1] - middle)).toBeLessThan(1e-5);
    expect(h[1] - h[0]).toBeGreaterThan(5e-5); // five times the tolerance: the eyes do differ
  });

  it("jitter mixes phases: with DJ alone of ±d samples the level tail is the mean of the two phase tails", () => {
    const pulse = cursorPulse([0, 0.1, 0.5, 0.2, 0.05, 0], 2, 16);
    const sigma = 0.005;
    const plain = statisticalEye(pulse, { modulation: "nrz", noiseRms_V: sigma });
    const jit = statisticalEye(pulse, { modulation: "nrz", noiseRms_V: sigma, jitter: { rjRms_UI: 0, djPp_UI: 0.25 } });
    for (const v of [0.1, 0.2, 0.3]) {
      const want = 0.5 * (plain.probBelow(1, -2, v) + plain.probBelow(1, 2, v));
      expect(jit.probBelow(1, 0, v)).toBeCloseTo(want, 14);
    }
    const top = jit.eyeEdges(0, BER)[1];
    expect((0.5 * (plain.probBelow(1, -2, top) + plain.probBelow(1, 2, top))) / (2 * BER)).toBeCloseTo(1, 6);
  });
});

describe("statisticalEye — identities and properties", () => {
  it("the BER of a threshold is f times the two neighbouring levels' conditional tails (PAM4 ⅛, NRZ ½); at an eye edge it is the target", () => {
    const eye = statisticalEye(cursorPulse([0.02, 0.4, 0.1, -0.03], 1), {
      modulation: "pam4",
      noiseRms_V: 0.01,
      targetBer: 1e-6,
    });
    const v = 0.05;
    const m = eye.main(0);
    expect(m).toBeCloseTo(0.4, 15);
    // v lies between the levels −1/3·m and +1/3·m (indices 1 and 2).
    expect(eye.ber(0, v)).toBeCloseTo((eye.probBelow(2, 0, v) + eye.probAbove(1, 0, v)) / 8, 15);
    const nrz = statisticalEye(cursorPulse([0.02, 0.4, 0.1, -0.03], 1), { modulation: "nrz", noiseRms_V: 0.01 });
    const top = nrz.eyeEdges(0, BER)[1];
    expect(nrz.ber(0, top) / BER).toBeCloseTo(1, 6);
  });

  it("property: a larger noise never raises the eye (beyond 0.02 mV of grid error) [NRZ and PAM4]", () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -0.08, max: 0.08, noNaN: true }), { minLength: 1, maxLength: 8 }),
        fc.double({ min: 0.001, max: 0.02, noNaN: true }),
        fc.double({ min: 1.05, max: 3, noNaN: true }),
        fc.constantFrom("nrz" as const, "pam4" as const),
        (isi, s1, factor, mod) => {
          const pulse = cursorPulse([0, 0.5, ...isi, 0], 1);
          const e1 = statisticalEye(pulse, { modulation: mod, noiseRms_V: s1 });
          const e2 = statisticalEye(pulse, { modulation: mod, noiseRms_V: s1 * factor });
          return e2.eyeHeight(0, BER) <= e1.eyeHeight(0, BER) + 2e-5;
        },
      ),
      { seed: 20261201, numRuns: 60 },
    );
  });

  it("property: cancelling one more post-cursor with a DFE tap never lowers the eye (beyond 0.02 mV of grid error)", () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -0.1, max: 0.1, noNaN: true }), { minLength: 2, maxLength: 8 }),
        fc.integer({ min: 0, max: 7 }),
        (post, n) => {
          const taps = post.slice(0, Math.min(n, post.length - 1));
          const more = post.slice(0, taps.length + 1);
          const pulse = cursorPulse([0, 0.5, ...post, 0], 1);
          const a = statisticalEye(pulse, { modulation: "nrz", noiseRms_V: 0.004, dfeTaps: taps });
          const b = statisticalEye(pulse, { modulation: "nrz", noiseRms_V: 0.004, dfeTaps: more });
          return b.eyeHeight(0, BER) >= a.eyeHeight(0, BER) - 2e-5;
        },
      ),
      { seed: 4, numRuns: 60 },
    );
  });

  it("extra independent parts (an aggressor's, say) act exactly as more cursors that no DFE cancels", () => {
    const base = { modulation: "nrz" as const, noiseRms_V: 0.004, dfeTaps: [0.1] };
    const withCursors = statisticalEye(cursorPulse([0.03, 0.4, 0.1, 0, 0.02, -0.015], 1), base);
    const withParts = statisticalEye(cursorPulse([0.03, 0.4, 0.1, 0], 1), {
      ...base,
      extraParts_V: Float64Array.of(0.02, 0.015),
    });
    expect(withParts.eyeHeight(0, BER)).toBeCloseTo(withCursors.eyeHeight(0, BER), 12);
  });

  it("the eye of a negated ISI pattern is the same (symmetric laws)", () => {
    const a = statisticalEye(cursorPulse([0.05, 0.4, 0.1, -0.02], 1), { modulation: "nrz", noiseRms_V: 0.006 });
    const b = statisticalEye(cursorPulse([-0.05, 0.4, -0.1, 0.02], 1), { modulation: "nrz", noiseRms_V: 0.006 });
    expect(a.eyeHeight(0, BER)).toBeCloseTo(b.eyeHeight(0, BER), 12);
  });
});

describe("statisticalEye — edges", () => {
  it("a closed eye reports 0 height; a negative main cursor closes every eye", () => {
    const eye = statisticalEye(cursorPulse([0, 0.1, 0.3, 0], 1), { modulation: "nrz", noiseRms_V: 0.01 });
    expect(eye.eyeHeight(0, BER)).toBe(0);
    const neg = statisticalEye(cursorPulse([0, -0.3, 0], 1), { modulation: "nrz", noiseRms_V: 0.01 });
    expect(neg.eyeHeight(0, BER)).toBe(0);
  });

  it("phases outside the record see a zero pulse; bad options throw naming the field", () => {
    const pulse = cursorPulse([0, 0.4, 0], 1, 8);
    const eye = statisticalEye(pulse, { modulation: "nrz", noiseRms_V: 0.01 });
    expect(eye.main(1000)).toBe(0);
    expect(() => statisticalEye(pulse, { modulation: "nrz", noiseRms_V: -1 })).toThrow(/noiseRms_V/);
    expect(() => statisticalEye(pulse, { modulation: "nrz", noiseRms_V: 0, dfeTaps: [Number.NaN] })).toThrow(
      /dfeTaps\[0\]/,
    );
    expect(() =>
      statisticalEye(pulse, { modulation: "nrz", noiseRms_V: 0, jitter: { rjRms_UI: 1, djPp_UI: 0 } }),
    ).toThrow(/rjRms_UI/);
    expect(() => eye.eyeHeight(0, 0.3)).toThrow(/ber/);
    expect(() => statisticalEye(pulse, { modulation: "pam4", noiseRms_V: 0, targetBer: 0.1 })).toThrow(/targetBer/);
    expect(() => statisticalEye(pulse, { modulation: "pam4", noiseRms_V: 0, pam4InnerLevel: 1.2 })).toThrow(
      /pam4InnerLevel/,
    );
    expect(() => statisticalEye(pulse, { modulation: "nrz", noiseRms_V: 0, refine: 0 })).toThrow(/refine/);
    expect(() =>
      statisticalEye(pulse, { modulation: "nrz", noiseRms_V: 0, extraParts_V: Float64Array.of(-1) }),
    ).toThrow(/extraParts_V/);
    expect(() => eye.probBelow(2, 0, 0)).toThrow(/level/);
    expect(() => statisticalEye({ ...pulse, mainIndex: 99 }, { modulation: "nrz", noiseRms_V: 0 })).toThrow(
      /mainIndex/,
    );
  });
});

describe("statisticalEye — noise-free laws whose design tail lies below the smallest atom", () => {
  it("a triangular victim (peak 0.2) with one extra part 0.05 and no noise: the eye is 2·(main − |neighbour| − 0.05) — 0.3 at the peak, 0.1 two samples off it [computed: worst case of three two-point parts]", () => {
    const victim = cursorPulse([0, 0.2, 0], 1, 8, 1e-10);
    const e = statisticalEye(victim, { modulation: "nrz", noiseRms_V: 0, extraParts_V: Float64Array.of(0.05) });
    expect(e.eyeHeight(0, 1e-12)).toBeCloseTo(0.3, 9);
    // Two samples off the peak the main cursor is 0.15 and a neighbour 0.05: 2·(0.15 − 0.05 − 0.05).
    for (const t of [-2, 2]) expect(e.eyeHeight(t, 1e-12)).toBeCloseTo(0.1, 9);
  });
});
