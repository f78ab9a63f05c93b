// The `eye` command per shared/engine-cli.md: the clean-pulse closed form, PAM4, DFE, jitter,
// bathtub shape, bad input (exit 2 naming the field). In-process through runCommand.
import { describe, expect, it } from "vitest";
import { qFromBer } from "@lib/analysis/ber";
import { runCommand } from "@lib/cli/runCommand";

// eslint-disable-next-line @typescript-eslint/no-explicit-any
const ok = (request: unknown): any => {
  const r = runCommand("eye", JSON.stringify(request));
  if (r.exitCode !== 0) throw new Error(`exit ${r.exitCode}: ${r.text}`);
  return JSON.parse(r.text);
};
const bad = (request: unknown) => {
  const r = runCommand("eye", JSON.stringify(request));
  expect(r.exitCode).toBe(2);
  return JSON.parse(r.text).error as { message: string; path: string };
};

/** Symbol-spaced cursors as a pulse: linear between cursors, 16 samples per UI. */
function pulse(cursors: number[], main: number) {
  const spu = 16;
  const values_V: number[] = [];
  for (let i = 0; i <= (cursors.length - 1) * spu; i++) {
    const k = Math.floor(i / spu);
    const f = i / spu - k;
    values_V.push(cursors[k] + f * ((cursors[k + 1] ?? 0) - cursors[k]));
  }
  return { ui_s: 1e-10, samplesPerUi: spu, values_V, mainIndex: main * spu };
}

describe("eye command", () => {
  // shared/engine-cli.md states 2A − 2·Q(targetBer)·σ, a level's conditional tail of targetBer at each
  // edge. With targetBer a bit error ratio averaged over the two equiprobable levels (Tapwright's one
  // convention, README), each edge carries a tail of 2·targetBer: 2A − 2·Q(2·targetBer)·σ [computed].
  it("a single cursor of height A with no ISI: eyeHeight = 2A − 2·Q(2·targetBer)·noiseRms_V; default policy centre, as budgets [computed]", () => {
    const r = ok({ pulse: pulse([0, 0.3, 0], 1), modulation: "nrz", noiseRms_V: 0.005, targetBer: 1e-12 });
    expect(Math.abs(r.eyeHeight_V - (0.6 - 2 * qFromBer(2e-12) * 0.005))).toBeLessThan(5e-6);
    expect(r.samplingPhase_UI).toBe(0);
    expect(r.policy).toBe("centre");
    expect(r.bathtub.phase_UI.length).toBe(r.bathtub.log10Ber.length);
  });

  it("PAM4 reports the smallest of three eyes, a third of NRZ without noise [practice]", () => {
    const nrz = ok({ pulse: pulse([0, 0.3, 0], 1), modulation: "nrz", noiseRms_V: 0, targetBer: 1e-12 });
    const pam4 = ok({ pulse: pulse([0, 0.3, 0], 1), modulation: "pam4", noiseRms_V: 0, targetBer: 1e-12 });
    expect(pam4.eyeHeights_V.length).toBe(3);
    expect(pam4.eyeHeight_V).toBeCloseTo(nrz.eyeHeight_V / 3, 12);
  });

  it("DFE taps cancel the first post-cursors; jitter narrows the eye; more noise lowers it", () => {
    const p = pulse([0, 0.3, 0.1, 0.04, 0], 1);
    const plain = ok({ pulse: p, noiseRms_V: 0.004, targetBer: 1e-12, policy: "max-height" });
    const dfe = ok({ pulse: p, noiseRms_V: 0.004, targetBer: 1e-12, dfe: { taps: [0.1, 0.04] }, policy: "max-height" });
    expect(Math.abs(dfe.eyeHeight_V - (0.6 - 2 * qFromBer(2e-12) * 0.004))).toBeLessThan(5e-6);
    expect(dfe.eyeHeight_V).toBeGreaterThan(plain.eyeHeight_V);
    const jit = ok({
      pulse: p,
      noiseRms_V: 0.004,
      targetBer: 1e-12,
      dfe: { taps: [0.1, 0.04] },
      jitter: { rjRms_UI: 0.02, djPp_UI: 0.1 },
      policy: "max-height",
    });
    expect(jit.eyeWidth_UI).toBeLessThan(dfe.eyeWidth_UI);
    const noisy = ok({ pulse: p, noiseRms_V: 0.01, targetBer: 1e-12, policy: "max-height" });
    expect(noisy.eyeHeight_V).toBeLessThan(plain.eyeHeight_V);
  });

  it("aggressors (shared/engine-cli.md, Crosstalk): the eye closes by their worst-phase parts; crosstalk and the eye without it are reported", () => {
    const victim = pulse([0, 0.3, 0], 1);
    const xt = { ...pulse([0, 0.02, 0.01, 0], 1), mainIndex: 16 };
    const r = ok({
      pulse: victim,
      noiseRms_V: 0,
      targetBer: 1e-12,
      aggressors: [{ pulse: xt, name: "lane 3 NEXT" }, { pulse: xt }],
    });
    expect(r.eyeHeightWithoutCrosstalk_V).toBeCloseTo(0.6, 9);
    expect(r.eyeHeight_V).toBeCloseTo(0.6 - 2 * 2 * 0.03, 3);
    expect(r.crosstalk.perAggressor.map((a: { name: string }) => a.name)).toEqual(["lane 3 NEXT", "aggressor 2"]);
    expect(r.crosstalk.rms_V).toBeCloseTo(Math.sqrt(2 * (0.02 ** 2 + 0.01 ** 2)), 12);
    const none = ok({ pulse: victim, noiseRms_V: 0, targetBer: 1e-12 });
    expect(none.crosstalk).toBeUndefined();
    expect(bad({ pulse: victim, noiseRms_V: 0.001, aggressors: [{ pulse: { ...xt, samplesPerUi: 8 } }] }).path).toBe(
      "aggressors.0",
    );
    expect(bad({ pulse: victim, noiseRms_V: 0.001, aggressors: [{}] }).path).toBe("aggressors.0.pulse");
  });

  it("bad input exits 2 with a message naming the field", () => {
    expect(bad({ pulse: pulse([0, 0.3, 0], 1), noiseRms_V: -1 }).path).toBe("noiseRms_V");
    expect(bad({ pulse: pulse([0, 0.3, 0], 1), noiseRms_V: 0.01, targetBer: 0.5 }).path).toBe("targetBer");
    expect(bad({ pulse: pulse([0, 0.3, 0], 1), noiseRms_V: 0.01, modulation: "qam" }).path).toBe("modulation");
    expect(bad({ pulse: { ...pulse([0, 0.3, 0], 1), mainIndex: 999 }, noiseRms_V: 0.01 }).path).toBe("pulse.mainIndex");
    expect(bad({ pulse: pulse([0, 0.3, 0], 1), noiseRms_V: 0.01, jitter: { rjRms_UI: 2, djPp_UI: 0 } }).path).toBe(
      "jitter.rjRms_UI",
    );
  });
});
