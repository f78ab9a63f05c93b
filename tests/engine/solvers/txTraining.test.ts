// Back-channel transmit training: requests, statuses, limits, convergence.
import { describe, expect, it } from "vitest";
import { enumerateTxFirs, isLegalTxFir, type TxFirSpec } from "@lib/equalizers";
import { convolveCursors } from "@lib/equalizers";
import { txTraining } from "@lib/solvers";

const channel = { h: Float64Array.of(0.06, 0.55, 0.3, 0.12, 0.05), main: 1 };
const spec: TxFirSpec = { pre: 1, post: 1, step: 0.025 };

const merit = (taps: Float64Array, noise: number) => {
  const g = convolveCursors(channel, taps, spec.pre);
  let isi = 0;
  g.h.forEach((v, i) => {
    if (i !== g.main) isi += v * v;
  });
  return (isi + noise * noise) / g.h[g.main] ** 2;
};

describe("txTraining", () => {
  it("converges from the preset to a legal setting and lowers the receiver's figure", () => {
    const r = txTraining(channel, { spec, noiseRms_V: 0.01 });
    expect(r.converged).toBe(true);
    expect(isLegalTxFir(r.taps, spec)).toBe(true);
    expect(r.objective).toBeLessThan(r.objectiveStart / 2);
    expect(r.taps[0]).toBeLessThan(0);
    expect(r.taps[2]).toBeLessThan(0);
    expect(r.objective).toBeCloseTo(merit(r.taps, 0.01), 12);
  });

  it("oracle: ends within 10 % of the best full-swing grid setting found by exhaustive search", () => {
    const r = txTraining(channel, { spec, noiseRms_V: 0.01 });
    let best = Number.POSITIVE_INFINITY;
    for (const t of enumerateTxFirs(spec)) best = Math.min(best, merit(t, 0.01));
    expect(r.objective).toBeLessThan(best * 1.1);
  });

  it("identities: one step per asked tap; a pair is a side tap with the main tap; statuses per Clause 72.6.10.2", () => {
    const r = txTraining(channel, { spec, noiseRms_V: 0.01 });
    let prev: Float64Array = Float64Array.of(0, 1, 0);
    let prevObjective = r.objectiveStart;
    for (const round of r.rounds) {
      const asked = round.requests.flatMap((q, j) => (q === "hold" ? [] : [j]));
      expect(asked.length === 1 || (asked.length === 2 && asked.includes(spec.pre))).toBe(true);
      // Applied together or not at all.
      const updated = round.status.filter((q) => q === "updated").length;
      expect(updated === 0 || updated === asked.length).toBe(true);
      round.requests.forEach((q, j) => {
        const delta = Math.round((round.taps[j] - prev[j]) / spec.step);
        if (round.status[j] === "updated") expect(delta).toBe(q === "increment" ? 1 : -1);
        else expect(delta).toBe(0);
        if (q === "hold") expect(round.status[j]).toBe("not_updated");
      });
      expect(round.objective).toBeLessThanOrEqual(prevObjective);
      prev = round.taps;
      prevObjective = round.objective;
    }
  });

  it("limits: narrow post-tap and main ranges saturate at their minimum and say so", () => {
    const narrow: TxFirSpec = {
      pre: 1,
      post: 1,
      step: 0.025,
      ranges: [
        [-0.5, 0],
        [0.7, 1],
        [-0.1, 0],
      ],
    };
    const r = txTraining(channel, { spec: narrow, noiseRms_V: 0.01 });
    expect(r.converged).toBe(true);
    expect(r.taps[2]).toBeCloseTo(-0.1, 12);
    expect(r.saturation[2]).toBe("minimum");
    expect(isLegalTxFir(r.taps, narrow)).toBe(true);
    expect(r.rounds.some((q) => q.status[2] === "minimum")).toBe(true);
    // The DFE takes care of post-cursors: then the post tap is not needed.
    const withDfe = txTraining(channel, { spec, noiseRms_V: 0.01, dfeTaps: 3 });
    expect(Math.abs(withDfe.taps[2])).toBeLessThan(Math.abs(txTraining(channel, { spec, noiseRms_V: 0.01 }).taps[2]));
  });

  it("edges: zero rounds, illegal initial taps, bad options", () => {
    const r = txTraining(channel, { spec, maxRounds: 0 });
    expect(r.converged).toBe(false);
    expect(r.rounds.length).toBe(0);
    expect(Array.from(r.taps)).toEqual([0, 1, 0]);
    expect(() => txTraining(channel, { spec, initial: [0.1, 1, 0] })).toThrow(/not a legal/);
    expect(() => txTraining(channel, { spec, initial: [0.01, 0.9, 0] })).toThrow(/multiple of the step/);
    expect(() => txTraining(channel, { spec, noiseRms_V: -1 })).toThrow(/noiseRms_V/);
    expect(() => txTraining(channel, { spec, dfeTaps: 1.5 })).toThrow(/dfeTaps/);
    expect(() => txTraining(channel, { spec: { ...spec, step: 0 } })).toThrow(/spec.step/);
  });
});
