// DFE: taps equal to the post-cursors, clipped to per-tap limits, with the residual ISI.
import { describe, expect, it } from "vitest";
import { dfeTaps } from "@lib/equalizers";

const cursors = { h: Float64Array.of(0.05, 0.6, 0.3, -0.12, 0.08, 0.02), main: 1 };

describe("dfeTaps", () => {
  it("analytic: unlimited taps cancel the first post-cursors exactly", () => {
    const r = dfeTaps(cursors, 3);
    expect(Array.from(r.taps)).toEqual([0.3, -0.12, 0.08]);
    expect(Array.from(r.residual)).toEqual([0, 0, 0]);
    expect(Array.from(r.cursors.h)).toEqual([0.05, 0.6, 0, 0, 0, 0.02]);
    expect(r.clipped).toEqual([false, false, false]);
  });
  it("analytic: per-tap limits clip and leave the rest as residual ISI", () => {
    const r = dfeTaps(cursors, 3, [0.2, 0.2, 0.05]);
    expect(Array.from(r.taps)).toEqual([0.2, -0.12, 0.05]);
    expect(r.residual[0]).toBeCloseTo(0.1, 15);
    expect(r.residual[2]).toBeCloseTo(0.03, 15);
    expect(r.clipped).toEqual([true, false, true]);
    expect(r.cursors.h[2]).toBeCloseTo(0.1, 15);
  });
  it("identities: taps + residual = post-cursors; one limit for all equals the same list; input unchanged", () => {
    const a = dfeTaps(cursors, 4, 0.1);
    const b = dfeTaps(cursors, 4, [0.1, 0.1, 0.1, 0.1]);
    expect(Array.from(a.taps)).toEqual(Array.from(b.taps));
    for (let k = 0; k < 4; k++) expect(a.taps[k] + a.residual[k]).toBeCloseTo(cursors.h[2 + k], 15);
    expect(Array.from(cursors.h)).toEqual([0.05, 0.6, 0.3, -0.12, 0.08, 0.02]);
  });
  it("edges: more taps than post-cursors, zero taps, bad limits", () => {
    const r = dfeTaps(cursors, 7);
    expect(Array.from(r.taps.slice(4))).toEqual([0, 0, 0]);
    expect(dfeTaps(cursors, 0).taps.length).toBe(0);
    expect(() => dfeTaps(cursors, 2, [0.1])).toThrow(/limits_V must hold 2/);
    expect(() => dfeTaps(cursors, 1, -0.1)).toThrow(/limits_V\[0\]/);
    expect(() => dfeTaps(cursors, 1, Number.NaN)).toThrow(/limits_V\[0\]/);
    expect(() => dfeTaps(cursors, -1)).toThrow(/count/);
    expect(() => dfeTaps({ h: cursors.h, main: 9 }, 1)).toThrow(/cursors.main/);
  });
});
