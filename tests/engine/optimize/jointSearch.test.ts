// The branch-and-bound joint search against exhaustive evaluation of the grid (the oracle, on a short
// analytic channel and on a realistic lane whose 250+ cursors are mostly below the eye's grid step), its
// bounds against exact eyes (fast-check), starting points and edges.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { enumerateTxFirs } from "@lib/equalizers/enumerateTxFirs";
import { isLegalTxFir } from "@lib/equalizers/txFirConstraints";
import { evaluateSetting, heavyPhaseBound, lightPhaseBound, phaseEye, prepareEye } from "@lib/optimize/evaluateSetting";
import { createBoundScratch } from "@lib/optimize/bound/boundScratch";
import { boundSetup } from "@lib/optimize/bound/boundSetup";
import { boxBound } from "@lib/optimize/bound/boxBound";
import { BoxRanges } from "@lib/optimize/bound/boxRanges";
import { leafBound } from "@lib/optimize/bound/leafBound";
import { phaseCoefficients } from "@lib/optimize/bound/phaseCoefficients";
import { createTapBox } from "@lib/optimize/bound/tapBox";
import { jointSearch } from "@lib/optimize/jointSearch";
import { prepareChannels } from "@lib/optimize/prepareChannels";
import { startingPoints } from "@lib/optimize/search/startingPoints";
import { searchSpace } from "@lib/optimize/searchSpace";
import { pulseFromLossModel } from "@lib/channel/lossModel";
import { trimPulse } from "@lib/pulse/trimPulse";
import { cursorPulse } from "../analysis/helpers.ts";

const ui = 1e-10;
const channel = cursorPulse([0, 0.04, 0.12, 0.55, 0.3, 0.16, 0.09, 0.05, 0.03, 0.02, 0.01, 0], 3, 8, ui);

function budget(policy: "centre" | "max-height" | "mueller-muller", mod: "nrz" | "pam4", jitter: boolean) {
  return {
    modulation: mod,
    txSwing_Vppd: 0.8,
    noiseRms_V: 0.003,
    limiterSensitivity_V: 0.01,
    targetBer: 1e-10,
    jitter: jitter ? { rjRms_UI: 0.02, djPp_UI: 0.1 } : undefined,
    tx: {
      pre: 1,
      post: 1,
      step: 0.05,
      ranges: [
        [-0.25, 0],
        [0.5, 1],
        [-0.35, 0.1],
      ] as [number, number][],
    },
    ctle: { gDc_dB: [-6, 0, 3] as [number, number, number], fz_Hz: 2.5e9, fp1_Hz: 2.5e9, fp2_Hz: 1e10 },
    dfe: { taps: 2, limits_V: [0.08, 0.03] },
    clocking: { policy },
  };
}

describe("jointSearch — oracle: exhaustive evaluation of the grid", () => {
  it.each([
    ["centre", "nrz", false],
    ["centre", "nrz", true],
    ["mueller-muller", "pam4", false],
    ["max-height", "nrz", true],
    ["max-height", "pam4", false],
  ] as const)(
    "%s / %s / jitter %s: best, every CTLE's optimum or bound, and the top 5 match",
    (policy, mod, jit) => {
      const space = searchSpace(channel, budget(policy, mod, jit));
      const prepared = prepareChannels(channel, space);
      const r = jointSearch(channel, space, { dfeCounts: [2, 0], topCount: 5 }, prepared);
      const firs = [...enumerateTxFirs(space.firSpec)];
      for (const [o, n] of [
        [0, 2],
        [1, 0],
      ]) {
        const all: number[] = [];
        prepared.channels.forEach((ch, ci) => {
          let local = Number.NEGATIVE_INFINITY;
          for (const f of firs) {
            const v = evaluateSetting(ch, space, f, n).limiterHeadroom_V;
            all.push(v);
            local = Math.max(local, v);
          }
          const out = r.perCtle[o][ci];
          if (out.exact) expect(out.best?.limiterHeadroom_V).toBe(local);
          expect(local).toBeLessThanOrEqual(out.upperBound_V);
        });
        all.sort((a, b) => b - a);
        expect(r.best[o]?.limiterHeadroom_V).toBe(all[0]);
        if (o === 0) expect(r.top.map((c) => c.limiterHeadroom_V)).toEqual(all.slice(0, 5));
      }
    },
    30_000,
  ); // the exhaustive oracle takes seconds (more on a busy machine): not a speed check

  it("a given CTLE order and extra starting points change the work, not the answer", () => {
    const space = searchSpace(channel, budget("centre", "nrz", true));
    const prepared = prepareChannels(channel, space);
    const plain = jointSearch(channel, space, { dfeCounts: [2, 0], topCount: 3 }, prepared);
    const order = space.ctleSettings.map((_, i) => i).reverse();
    const seeds = space.ctleSettings.map(() => [Float64Array.of(-0.05, 0.9, -0.05)]);
    const hinted = jointSearch(channel, space, { dfeCounts: [2, 0], topCount: 3, order, seeds }, prepared);
    expect(hinted.best.map((b) => b?.limiterHeadroom_V)).toEqual(plain.best.map((b) => b?.limiterHeadroom_V));
    expect(hinted.top.map((c) => c.limiterHeadroom_V)).toEqual(plain.top.map((c) => c.limiterHeadroom_V));
    expect(() => jointSearch(channel, space, { dfeCounts: [0], order: [0, 0, 1] }, prepared)).toThrow(/order/);
    expect(() => jointSearch(channel, space, { dfeCounts: [0], order: [0, 1] }, prepared)).toThrow(/order/);
    expect(() => jointSearch(channel, space, { dfeCounts: [0], seeds: [] }, prepared)).toThrow(/seeds/);
  });

  it("feasibility mode finds a setting reaching the target, and none above the optimum", () => {
    const space = searchSpace(channel, budget("centre", "nrz", false));
    const full = jointSearch(channel, space, { dfeCounts: [2] });
    const best = full.best[0]?.limiterHeadroom_V as number;
    const yes = jointSearch(channel, space, { dfeCounts: [2], target_V: best - 0.005 });
    expect(yes.best[0]?.limiterHeadroom_V).toBeGreaterThanOrEqual(best - 0.005);
    const no = jointSearch(channel, space, { dfeCounts: [2], target_V: best + 1e-6 });
    expect(no.best[0]).toBeNull();
  });
});

describe("jointSearch — oracle on a realistic lane (250+ cursors, most of them below the law's step)", () => {
  // The demo's 27 in lane at 28 Gb/s (synthetic loss model, invented data), kept as the app stores it.
  const ui = 1 / 28e9;
  const raw = pulseFromLossModel({ lossAtNyquist_dB: 28, delay_s: 3.8e-9 }, { ui_s: ui, samplesPerUi: 32 }).pulse;
  const lane = trimPulse(
    raw,
    Math.min(16, Math.floor(raw.mainIndex / 32)),
    Math.min(240, Math.floor((raw.values_V.length - 1 - raw.mainIndex) / 32)),
  );
  const laneBudget = (jitter: boolean) => ({
    modulation: "nrz" as const,
    txSwing_Vppd: 0.8,
    noiseRms_V: 0.0015,
    limiterSensitivity_V: 0.015,
    targetBer: 1e-12,
    jitter: jitter ? { rjRms_UI: 0.01, djPp_UI: 0.05 } : undefined,
    tx: { pre: 1, post: 1, step: 0.1 },
    ctle: { gDc_dB: [-6, 0, 3] as [number, number, number], fz_Hz: 7e9, fp1_Hz: 7e9, fp2_Hz: 28e9 },
    dfe: { taps: 5, limits_V: [0.1, 0.05, 0.05, 0.02, 0.02] },
  });

  it.each([false, true])(
    "jitter %s: the best setting, every CTLE's optimum and the top 5 are those of exhaustive evaluation",
    (jit) => {
      const space = searchSpace(lane, laneBudget(jit));
      const prepared = prepareChannels(lane, space);
      const r = jointSearch(lane, space, { dfeCounts: [5], topCount: 5 }, prepared);
      const firs = [...enumerateTxFirs(space.firSpec)];
      const all: number[] = [];
      prepared.channels.forEach((ch, ci) => {
        let local = Number.NEGATIVE_INFINITY;
        for (const f of firs) {
          const v = evaluateSetting(ch, space, f, 5).limiterHeadroom_V;
          all.push(v);
          local = Math.max(local, v);
        }
        const out = r.perCtle[0][ci];
        if (out.exact) expect(out.best?.limiterHeadroom_V).toBe(local);
        expect(local).toBeLessThanOrEqual(out.upperBound_V);
      });
      all.sort((a, b) => b - a);
      expect(r.best[0]?.limiterHeadroom_V).toBe(all[0]);
      expect(r.top.map((c) => c.limiterHeadroom_V)).toEqual(all.slice(0, 5));
    },
    120_000,
  ); // the exhaustive oracle takes seconds on a busy machine: not a speed check
});

describe("headroom bounds", () => {
  it("property: the leaf bound never falls below the exact headroom (NRZ/PAM4, jitter, DFE limits)", () => {
    fc.assert(
      fc.property(
        fc.constantFrom("nrz" as const, "pam4" as const),
        fc.boolean(),
        fc.integer({ min: 0, max: 2 }),
        fc.integer({ min: -4, max: 4 }),
        fc.integer({ min: 0, max: 5 }),
        fc.integer({ min: 0, max: 7 }),
        (mod, jit, n, phase, kPre, kPost) => {
          const space = searchSpace(channel, budget("centre", mod, jit));
          const ch = prepareChannels(channel, space).channels[1];
          const setup = boundSetup(space, ch, 2);
          const taps = Float64Array.of(-kPre * 0.05, 0, 0.1 - kPost * 0.05);
          taps[1] = Math.min(1, 1 - Math.abs(taps[0]) - Math.abs(taps[2]));
          const coef = (p: number) => phaseCoefficients(setup, space, ch, p);
          const ub = leafBound(setup, coef, phase, taps, n, createBoundScratch(setup)).bound_V;
          const exact = phaseEye(ch, space, taps, n, phase).limiterHeadroom_V;
          return ub >= exact;
        },
      ),
      { seed: 77, numRuns: 60 },
    );
  });
});

describe("box bound", () => {
  it("property: never below the exact headroom of any setting in the box (jitter, clipped and unclipped DFE taps)", () => {
    fc.assert(
      fc.property(
        fc.constantFrom("nrz" as const, "pam4" as const),
        fc.boolean(),
        fc.integer({ min: 0, max: 2 }),
        fc.integer({ min: -3, max: 3 }),
        fc.integer({ min: 0, max: 4 }),
        fc.integer({ min: 0, max: 4 }),
        fc.integer({ min: 0, max: 6 }),
        fc.integer({ min: 0, max: 3 }),
        fc.integer({ min: 0, max: 2 }),
        fc.boolean(),
        (mod, jit, n, t, preLo, preSpan, postLo, postSpan, ci, limited) => {
          const b = budget("centre", mod, jit);
          const space = searchSpace(channel, limited ? b : { ...b, dfe: { taps: 2 } });
          const ch = prepareChannels(channel, space).channels[ci];
          const setup = boundSetup(space, ch, 2);
          const coef = (p: number) => phaseCoefficients(setup, space, ch, p);
          const ranges = new BoxRanges(setup, coef, -12, 12);
          // Side taps −k·0.05 on [a, b] (both ≤ 0): the main tap is 1 + pre + post, affine with slope +1.
          const pre = [-(preLo + preSpan) * 0.05, -preLo * 0.05];
          const post = [-(postLo + postSpan) * 0.05, -postLo * 0.05];
          const box = createTapBox(3, 1);
          box.base.set([0, 1, 0]);
          let c = 0;
          for (const [j, [a, b]] of [
            [0, pre],
            [2, post],
          ] as const) {
            if (a === b) {
              box.base[j] = a;
              box.base[1] += a;
              continue;
            }
            box.free[c] = j;
            box.lo[c] = a;
            box.hi[c] = b;
            box.mainSlope[c] = 1;
            c++;
          }
          box.count = c;
          box.mainLo = 0;
          ranges.reset(box);
          const bound = boxBound(setup, ranges, t, n, createBoundScratch(setup)).bound_V;
          for (let x = pre[0]; x <= pre[1] + 1e-9; x += 0.05) {
            for (let y = post[0]; y <= post[1] + 1e-9; y += 0.05) {
              const taps = Float64Array.of(x, 1 + x + y, y);
              if (phaseEye(ch, space, taps, n, t).limiterHeadroom_V > bound) return false;
            }
          }
          return true;
        },
      ),
      { seed: 79, numRuns: 80 },
    );
  });
});

describe("BoxRanges", () => {
  it("oracle: each cursor's range, its change between a sampling and a jitter phase, and the joint figure hold every setting of the box, with the ends reached", () => {
    const space = searchSpace(channel, budget("centre", "nrz", true));
    const ch = prepareChannels(channel, space).channels[1];
    const setup = boundSetup(space, ch, 2);
    const coef = (p: number) => phaseCoefficients(setup, space, ch, p);
    const ranges = new BoxRanges(setup, coef, -12, 12);
    const box = createTapBox(3, 1);
    box.base.set([0, 1, 0]);
    box.free.set([0, 2]);
    box.lo.set([-0.2, -0.3]);
    box.hi.set([-0.05, -0.1]);
    box.mainSlope.set([1, 1]);
    box.count = 2;
    box.mainLo = 0;
    ranges.reset(box);
    const F = setup.offsets.length;
    const t = 1;
    for (let jj = 0; jj < setup.shifts.length; jj++) {
      const p = t + setup.shifts[jj];
      const o = ranges.at(p);
      const d = ranges.diff(t, jj);
      for (let f = 0; f < F; f++) {
        const k = setup.offsets[f];
        const dfe = k >= 1 && k <= setup.limits_V.length;
        const seen = [
          Number.POSITIVE_INFINITY,
          Number.NEGATIVE_INFINITY,
          Number.POSITIVE_INFINITY,
          Number.NEGATIVE_INFINITY,
        ];
        for (const x of [-0.2, -0.15, -0.1, -0.05]) {
          for (const y of [-0.3, -0.25, -0.2, -0.15, -0.1]) {
            const taps = [x, 1 + x + y, y];
            const at = (q: number) => taps.reduce((s, c, j) => s + c * coef(q).v[f * 3 + j], 0);
            const v = at(p);
            const change = at(p) - at(t);
            seen[0] = Math.min(seen[0], v);
            seen[1] = Math.max(seen[1], v);
            seen[2] = Math.min(seen[2], change);
            seen[3] = Math.max(seen[3], change);
          }
        }
        expect(Math.abs(seen[0] - ranges.values[o + 2 * f])).toBeLessThan(1e-12);
        expect(Math.abs(seen[1] - ranges.values[o + 2 * f + 1])).toBeLessThan(1e-12);
        if (dfe) {
          expect(Math.abs(seen[2] - ranges.diffs[d + 2 * f])).toBeLessThan(1e-12);
          expect(Math.abs(seen[3] - ranges.diffs[d + 2 * f + 1])).toBeLessThan(1e-12);
        }
      }
      // The joint figure gap·g₀ − 2·Σ s_i·r_i: its largest value over the box, reached at a corner.
      const fs = Int32Array.of(1, F - 1, 4);
      const signs = Float64Array.of(1, -1, 1);
      const change = Uint8Array.of(0, 0, 1);
      const best = [Number.NEGATIVE_INFINITY, Number.NEGATIVE_INFINITY, Number.NEGATIVE_INFINITY];
      for (const x of [-0.2, -0.15, -0.1, -0.05]) {
        for (const y of [-0.3, -0.25, -0.2, -0.15, -0.1]) {
          const taps = [x, 1 + x + y, y];
          const cur = (q: number, f: number) => taps.reduce((s, c, j) => s + c * coef(q).v[f * 3 + j], 0);
          const r = [cur(p, 1), -cur(p, F - 1), cur(p, 4) - cur(t, 4)];
          let joint = 2 * cur(p, 0);
          for (let k = 0; k < 3; k++) {
            joint -= 2 * r[k];
            best[k] = Math.max(best[k], joint);
          }
        }
      }
      const maxima = new Float64Array(3);
      ranges.jointMax(t, jj, 2, fs, signs, change, 3, maxima);
      for (let k = 0; k < 3; k++) expect(Math.abs(maxima[k] - best[k])).toBeLessThan(1e-12);
    }
  });
});

describe("light bound", () => {
  it("property: the light bound (no law built) never falls below the exact headroom, and the heavy bound sits between", () => {
    fc.assert(
      fc.property(
        fc.constantFrom("nrz" as const, "pam4" as const),
        fc.boolean(),
        fc.integer({ min: 0, max: 2 }),
        fc.integer({ min: -4, max: 4 }),
        fc.integer({ min: 0, max: 5 }),
        fc.integer({ min: 0, max: 7 }),
        fc.integer({ min: 0, max: 2 }),
        (mod, jit, n, phase, kPre, kPost, ci) => {
          const space = searchSpace(channel, budget("centre", mod, jit));
          const ch = prepareChannels(channel, space).channels[ci];
          const setup = boundSetup(space, ch, 2);
          const taps = Float64Array.of(-kPre * 0.05, 0, 0.1 - kPost * 0.05);
          taps[1] = Math.min(1, 1 - Math.abs(taps[0]) - Math.abs(taps[2]));
          const exact = phaseEye(ch, space, taps, n, phase).limiterHeadroom_V;
          for (let j = 0; j < setup.shifts.length; j++) {
            const light = lightPhaseBound(
              space,
              prepareEye(ch, space, taps, n, phase),
              setup.shifts[j],
              setup.weights[j],
            );
            const heavy = heavyPhaseBound(
              space,
              prepareEye(ch, space, taps, n, phase),
              setup.shifts[j],
              setup.weights[j],
            );
            if (!(light >= heavy && heavy >= exact)) return false;
          }
          return true;
        },
      ),
      { seed: 78, numRuns: 60 },
    );
  });
});

describe("startingPoints", () => {
  it("plain, MMSE and zero-forcing starts are legal settings of the FIR grid; the plain one comes first", () => {
    const space = searchSpace(channel, budget("centre", "nrz", false));
    for (const ch of prepareChannels(channel, space).channels) {
      const s = startingPoints(ch, space);
      expect(s.length).toBeGreaterThan(1);
      for (const t of s) expect(isLegalTxFir(t, space.firSpec)).toBe(true);
      // The side tap ranges [−0.25, 0] and [−0.35, 0.1] hold 0, so the plain FIR has no side taps.
      expect(Array.from(s[0])).toEqual([0, 1, 0]);
    }
  });

  it("a side tap whose range excludes 0 starts at the grid value nearest 0", () => {
    const b = budget("centre", "nrz", false);
    const space = searchSpace(channel, {
      ...b,
      tx: {
        ...b.tx,
        ranges: [
          [-0.25, -0.1],
          [0.5, 1],
          [-0.35, 0.1],
        ],
      },
    });
    const s = startingPoints(prepareChannels(channel, space).channels[0], space)[0];
    expect(Array.from(s).map((c) => Math.round(c * 1e9) / 1e9)).toEqual([-0.1, 0.9, 0]);
  });
});

describe("jointSearch — edges", () => {
  it("rejects DFE counts beyond the budget and empty objectives", () => {
    const space = searchSpace(channel, budget("centre", "nrz", false));
    expect(() => jointSearch(channel, space, { dfeCounts: [3] })).toThrow(/dfeCounts/);
    expect(() => jointSearch(channel, space, { dfeCounts: [] })).toThrow(/dfeCounts/);
    expect(() => jointSearch(channel, space, { dfeCounts: [0], topCount: 0 })).toThrow(/topCount/);
  });

  it("a FIR grid with no legal setting yields no best", () => {
    const b = budget("centre", "nrz", false);
    const space = searchSpace(channel, {
      ...b,
      tx: {
        pre: 0,
        post: 1,
        step: 0.1,
        ranges: [
          [0.5, 1],
          [-0.9, -0.8],
        ],
      },
    });
    const r = jointSearch(channel, space, { dfeCounts: [0] });
    expect(r.best[0]).toBeNull();
  });
});
