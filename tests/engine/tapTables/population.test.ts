// Population defaults (minimax) and architecture studies: the minimax guarantees, a brute-force
// oracle, the noise-enhancement identity of a receive FFE, ordering by complexity, edges.
import { describe, expect, it } from "vitest";
import { enumerateTxFirs } from "@lib/equalizers/enumerateTxFirs";
import { firNoiseGain } from "@lib/equalizers/firNoiseGain";
import { evaluateSetting } from "@lib/optimize/evaluateSetting";
import { prepareChannels } from "@lib/optimize/prepareChannels";
import { searchSpace } from "@lib/optimize/searchSpace";
import { zeroForcing } from "@lib/solvers/zeroForcing";
import { architectureComplexity, evaluateArchitectures } from "@lib/tapTables/architectureEvaluation";
import { commonGrid, populationDefault } from "@lib/tapTables/populationDefault";
import type { RegisterField } from "@lib/tapTables/registerMap";
import { stepwisePulse } from "../optimize/fixtures.ts";

const pulses = [
  stepwisePulse([0, 0.03, 1, 0.25, 0.1, 0.04, 0], 2),
  stepwisePulse([0, 0.06, 0.9, 0.4, 0.2, 0.09, 0.03, 0], 2),
  stepwisePulse([0, 0.1, 0.8, 0.5, 0.3, 0.16, 0.08, 0.03, 0], 2),
];
const budget = {
  txSwing_Vppd: 0.8,
  noiseRms_V: 0.003,
  limiterSensitivity_V: 0.01,
  tx: { pre: 1, post: 1, step: 0.05 },
  ctle: { gDc_dB: [-6, 0, 3] as [number, number, number], fz_Hz: 2e9, fp1_Hz: 2e9, fp2_Hz: 1e10 },
  dfe: { taps: 1, limits_V: 0.15 },
};

describe("populationDefault", () => {
  it("oracle: the worst channel's headroom equals the brute-force minimax over the grid", () => {
    const r = populationDefault(pulses, budget);
    const space = searchSpace(pulses[0], budget);
    const prepared = pulses.map((p) => prepareChannels(p, space));
    let best = Number.NEGATIVE_INFINITY;
    for (let k = 0; k < space.ctleSettings.length; k++) {
      for (const f of enumerateTxFirs(space.firSpec)) {
        const worst = Math.min(...prepared.map((pc) => evaluateSetting(pc.channels[k], space, f, 1).limiterHeadroom_V));
        best = Math.max(best, worst);
      }
    }
    expect(r.worstHeadroom_V).toBe(best);
    expect(r.channels[r.worstChannel].defaultHeadroom_V).toBe(r.worstHeadroom_V);
  });

  it("the default is never worse for the worst channel than any channel's own optimum applied to the class; own ≥ default", () => {
    const r = populationDefault(pulses, budget);
    const space = searchSpace(pulses[0], budget);
    for (const c of r.channels) {
      expect(c.ownHeadroom_V).toBeGreaterThanOrEqual(c.defaultHeadroom_V);
      const k = space.ctleSettings.findIndex((s) => s.gDc_dB === c.own.ctle.gDc_dB && s.gDc2_dB === c.own.ctle.gDc2_dB);
      const applied = Math.min(
        ...pulses.map(
          (p) => evaluateSetting(prepareChannels(p, space).channels[k], space, c.own.tx, 1).limiterHeadroom_V,
        ),
      );
      expect(r.worstHeadroom_V).toBeGreaterThanOrEqual(applied);
    }
  });

  it("quantized: codes decode to the reported values, inside every field's range, and the guarantee still holds", () => {
    const map: RegisterField[] = [
      { name: "tx_pre1", parameter: "tx[-1]", bits: 5, signed: true, lsb: 0.05, unit: "fraction", min: -0.5, max: 0 },
      { name: "tx_main", parameter: "tx[0]", bits: 5, signed: false, lsb: 0.05, unit: "fraction", min: 0, max: 1 },
      { name: "tx_post1", parameter: "tx[1]", bits: 5, signed: true, lsb: 0.1, unit: "fraction", min: -0.5, max: 0 },
      { name: "ctle_gdc", parameter: "ctle.gDc_dB", bits: 5, signed: true, lsb: 1, unit: "dB", min: -12, max: 0 },
      { name: "dfe1", parameter: "dfe[1]", bits: 6, signed: true, lsb: 0.01, unit: "V", min: -0.15, max: 0.15 },
    ];
    const r = populationDefault(pulses, budget, { registerMap: map });
    expect(r.codes).not.toBeNull();
    for (const f of map) {
      const code = (r.codes as Record<string, number>)[f.name];
      const value = (r.values as Record<string, number>)[f.name];
      expect(value).toBeCloseTo(code * f.lsb, 12);
      expect(value).toBeGreaterThanOrEqual(f.min - 1e-12);
      expect(value).toBeLessThanOrEqual(f.max + 1e-12);
    }
    expect(r.setting.tx.taps.reduce((s, c) => s + Math.abs(c), 0)).toBeLessThanOrEqual(1 + 1e-9);
    expect(r.setting.tx.taps[2] / 0.1).toBeCloseTo(Math.round(r.setting.tx.taps[2] / 0.1), 9);
    for (const c of r.channels) expect(r.worstHeadroom_V).toBeLessThanOrEqual(c.defaultHeadroom_V);
  });

  it("edges: no pulses, or pulses of different bit rates, throw; other sampling is resampled", () => {
    expect(() => populationDefault([], budget)).toThrow(/pulses/);
    expect(() => commonGrid([pulses[0], { ...pulses[1], ui_s: 2e-10 }])).toThrow(/pulses\[1\]\.ui_s/);
    const coarse = stepwisePulse([0, 0.03, 1, 0.25, 0.1, 0.04, 0], 2, 4);
    const g = commonGrid([pulses[0], coarse]);
    expect(g[1].samplesPerUi).toBe(8);
  });
});

describe("evaluateArchitectures", () => {
  it("identity: a receive linear ZF equalizer on 1 + a·z⁻¹ enhances noise by 1/(1 − a²): 1.249 dB at 0.5, 7.212 dB at 0.9 (Barry, Lee & Messerschmitt [memory])", () => {
    for (const [a, dB] of [
      [0.5, 1.249],
      [0.9, 7.212],
    ]) {
      const zf = zeroForcing({ h: Float64Array.of(1, a), main: 0 }, 0, 120);
      expect(10 * Math.log10(firNoiseGain(zf.taps))).toBeCloseTo(dB, 3);
    }
  });

  it("on 1 + 0.9·z⁻¹ with noise, a DFE beats a receive FFE (no noise enhancement), and more DFE taps never lose", () => {
    const ch = [stepwisePulse([0, 0, 1, 0.9, 0, 0, 0, 0, 0, 0], 2)];
    const b = { ...budget, noiseRms_V: 0.02, tx: { pre: 0, post: 1, step: 0.05 }, dfe: { taps: 2, limits_V: 1 } };
    const out = evaluateArchitectures(ch, b, [
      { key: "ffe", tx: null, ctle: false, dfeTaps: 0, ffe: { pre: 0, post: 6 } },
      { key: "dfe1", tx: null, ctle: false, dfeTaps: 1, ffe: null },
      { key: "dfe2", tx: null, ctle: false, dfeTaps: 2, ffe: null },
    ]);
    const by = Object.fromEntries(out.map((o) => [o.key, o]));
    expect(by.dfe1.worstHeadroom_V).toBeGreaterThan(by.ffe.worstHeadroom_V);
    expect(by.dfe2.worstHeadroom_V).toBeGreaterThanOrEqual(by.dfe1.worstHeadroom_V - 2e-4);
  });

  it("worst and median over the channels; complexity counts side taps, the CTLE, DFE and FFE taps", () => {
    const out = evaluateArchitectures(pulses, budget, [
      { key: "a", tx: { pre: 1, post: 1 }, ctle: true, dfeTaps: 1, ffe: null },
      { key: "b", tx: null, ctle: true, dfeTaps: 0, ffe: null },
    ]);
    const a = out[0];
    expect(a.headroom_V.length).toBe(3);
    expect(a.worstHeadroom_V).toBe(Math.min(...a.headroom_V));
    expect(a.medianHeadroom_V).toBe([...a.headroom_V].sort((x, y) => x - y)[1]);
    expect(a.headroom_V[a.worstChannel]).toBe(a.worstHeadroom_V);
    expect(
      architectureComplexity({ key: "x", tx: { pre: 1, post: 2 }, ctle: true, dfeTaps: 3, ffe: { pre: 1, post: 3 } }),
    ).toBe(11);
    expect(out[1].complexity).toBe(1);
    // The richer architecture is never worse on any channel than the CTLE alone.
    a.headroom_V.forEach((v, i) => expect(v).toBeGreaterThanOrEqual(out[1].headroom_V[i] - 2e-4));
  });

  it("edges: no candidates, or a malformed one, throw naming it", () => {
    expect(() => evaluateArchitectures(pulses, budget, [])).toThrow(/candidates/);
    expect(() =>
      evaluateArchitectures(pulses, budget, [
        { key: "x", tx: { pre: -1, post: 0 }, ctle: true, dfeTaps: 0, ffe: null },
      ]),
    ).toThrow(/candidates\[0\]\.tx/);
  });
});
