// LMS and sign-sign LMS: convergence to the Wiener taps, reproducibility, trajectories, stability.
import { describe, expect, it } from "vitest";
import { lmsAdapt, mmseEqualizer } from "@lib/solvers";

const channel = { h: Float64Array.of(0.08, 1, 0.45, -0.15, 0.05), main: 1 };
const [pre, post, sigma] = [2, 4, 0.05];

describe("lmsAdapt", () => {
  it("LMS with a small step lands near the MMSE taps (seed 1; taps within 0.02, MSE within 10 %)", () => {
    const target = mmseEqualizer(channel, pre, post, sigma);
    const r = lmsAdapt(channel, pre, post, {
      noiseRms_V: sigma,
      mu: 0.002,
      iterations: 60_000,
      seed: 1,
      variant: "lms",
    });
    r.taps.forEach((c, j) => expect(Math.abs(c - target.taps[j])).toBeLessThan(0.02));
    expect(r.mse[r.mse.length - 1]).toBeLessThan(target.mse * 1.1);
    expect(r.mse[r.mse.length - 1]).toBeGreaterThanOrEqual(target.mse);
  });

  // Sign-sign LMS drives E[sgn(e)·sgn(x)] to zero, not E[e·x]: it settles near, not at, the
  // Wiener taps (Haykin, Adaptive Filter Theory, sign-error algorithms [memory]).
  it("sign-sign LMS settles (seed 2): MSE falls five-fold, stays within 2× the MMSE, taps steady", () => {
    const target = mmseEqualizer(channel, pre, post, sigma);
    const r = lmsAdapt(channel, pre, post, {
      noiseRms_V: sigma,
      mu: 2e-4,
      iterations: 80_000,
      seed: 2,
      variant: "sign-sign",
    });
    const last = r.mse[r.mse.length - 1];
    expect(last).toBeLessThan(r.mse[0] / 5);
    expect(last).toBeLessThan(2 * target.mse);
    const tail = r.trajectory.slice(Math.floor((3 * r.trajectory.length) / 4));
    for (let j = 0; j < r.taps.length; j++) {
      const vals = tail.map((t) => t[j]);
      expect(Math.max(...vals) - Math.min(...vals)).toBeLessThan(0.05);
    }
  });

  it("identities: the same seed reproduces the run; trajectory starts at the initial taps; records every k", () => {
    const opts = { noiseRms_V: sigma, mu: 0.01, iterations: 1000, seed: 42, variant: "lms" as const, every: 100 };
    const a = lmsAdapt(channel, pre, post, opts);
    const b = lmsAdapt(channel, pre, post, opts);
    expect(Array.from(a.taps)).toEqual(Array.from(b.taps));
    expect(a.trajectory.length).toBe(11);
    expect(a.iterationsAt).toEqual([0, 100, 200, 300, 400, 500, 600, 700, 800, 900, 1000]);
    expect(Array.from(a.trajectory[0])).toEqual([0, 0, 1, 0, 0, 0, 0]);
    expect(Array.from(a.trajectory[10])).toEqual(Array.from(a.taps));
    const c = lmsAdapt(channel, pre, post, { ...opts, seed: 43 });
    expect(Array.from(c.taps)).not.toEqual(Array.from(a.taps));
    const d = lmsAdapt(channel, pre, post, { ...opts, initial: [0, 0, 0.5, 0, 0, 0, 0] });
    expect(d.trajectory[0][2]).toBe(0.5);
  });

  it("oracle: on a noiseless one-cursor channel, LMS follows c ← c − μ·(c·a − 1)·a = c − μ(c − 1) exactly", () => {
    const r = lmsAdapt({ h: Float64Array.of(1), main: 0 }, 0, 0, {
      noiseRms_V: 0,
      mu: 0.1,
      iterations: 5,
      seed: 3,
      variant: "lms",
      every: 1,
      initial: [0],
    });
    // x = a (±1), e = c·a − a, c ← c − μ·e·a = c − μ(c − 1) since a² = 1.
    let c = 0;
    for (let k = 1; k <= 5; k++) {
      c = c - 0.1 * (c - 1);
      expect(r.trajectory[k][0]).toBeCloseTo(c, 14);
    }
  });

  it("edges: a step beyond 2/λmax diverges with a message giving the bound [memory: Haykin, LMS chapter]", () => {
    expect(() =>
      lmsAdapt(channel, pre, post, { noiseRms_V: sigma, mu: 5, iterations: 2000, seed: 1, variant: "lms" }),
    ).toThrow(/mu = 5 .*2\/λmax = /);
    const base = { noiseRms_V: sigma, mu: 0.01, iterations: 10, seed: 1, variant: "lms" as const };
    expect(() => lmsAdapt(channel, pre, post, { ...base, mu: 0 })).toThrow(/mu/);
    expect(() => lmsAdapt(channel, pre, post, { ...base, iterations: 0 })).toThrow(/iterations/);
    expect(() => lmsAdapt(channel, pre, post, { ...base, seed: 0.5 })).toThrow(/seed/);
    expect(() => lmsAdapt(channel, pre, post, { ...base, every: 0 })).toThrow(/every/);
    expect(() => lmsAdapt(channel, pre, post, { ...base, variant: "x" as "lms" })).toThrow(/variant/);
    expect(() => lmsAdapt(channel, pre, post, { ...base, initial: [1] })).toThrow(/initial/);
    expect(() => lmsAdapt(channel, pre, post, { ...base, noiseRms_V: -1 })).toThrow(/noiseRms_V/);
  });
});
