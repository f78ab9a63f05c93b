// The `optimize` command per shared/engine-cli.md: response fields, the verdict, reproducibility and
// bad budgets (exit 2 naming the field). In-process through runCommand, plus one whole-process call.
import { spawnSync } from "node:child_process";
import { describe, expect, it } from "vitest";
import { runCommand } from "@lib/cli/runCommand";

// eslint-disable-next-line @typescript-eslint/no-explicit-any
const ok = (request: unknown): any => {
  const r = runCommand("optimize", JSON.stringify(request));
  if (r.exitCode !== 0) throw new Error(`exit ${r.exitCode}: ${r.text}`);
  return JSON.parse(r.text);
};

/** Cursors 1 (main) and 0.9 (post), constant over each UI: the channel 1 + 0.9·z⁻¹. */
const pulse = {
  ui_s: 1e-10,
  samplesPerUi: 8,
  values_V: [...new Array(16).fill(0), ...new Array(8).fill(1), ...new Array(8).fill(0.9), ...new Array(40).fill(0)],
  mainIndex: 20,
};
const budget = {
  modulation: "nrz",
  txSwing_Vppd: 1,
  noiseRms_V: 0.01,
  limiterSensitivity_V: 0.01,
  targetBer: 1e-12,
  requiredHeadroom_V: 0.3,
  tx: { pre: 0, post: 2, step: 0.05 },
  ctle: { gDc_dB: [-3, 0, 1.5], fz_Hz: 1e10, fp1_Hz: 1e10, fp2_Hz: 1e14 },
  dfe: { taps: 2, limits_V: [0.5, 0.2] },
};

describe("optimize command", () => {
  const r = ok({ pulse, budget });

  it("answers the contract's fields: tx, ctle, dfe, eye, limiterHeadroom_V, linearOnly, verdict", () => {
    expect(r.tx.taps.length).toBe(3);
    expect(typeof r.ctle.gDc_dB).toBe("number");
    expect(typeof r.ctle.gDc2_dB).toBe("number");
    expect(r.dfe.taps.length).toBe(2);
    expect(r.eye.eyeHeight_V).toBeGreaterThan(0);
    expect(r.limiterHeadroom_V).toBeCloseTo(r.eye.eyeHeight_V - 0.01, 12);
    expect(r.linearOnly.dfe.taps).toEqual([]);
    expect(r.verdict).toEqual({ linearReachExhausted: true, reasons: expect.any(Array), fewestDfeTaps: 1 });
    expect(r.surface.headroom_V.length).toBe(1);
    expect(r.surface.gDc_dB).toEqual([-3, -1.5, 0]);
    expect(r.top[0].limiterHeadroom_V).toBe(r.limiterHeadroom_V);
    expect(r.clocking.policy).toBe("centre");
  });

  it("same request, same answer", () => {
    expect(runCommand("optimize", JSON.stringify({ pulse, budget })).text).toBe(JSON.stringify(r));
  });

  it("bad budgets exit 2 naming the field; extra fields are ignored", () => {
    const bad = (b: unknown) => JSON.parse(runCommand("optimize", JSON.stringify({ pulse, budget: b })).text).error;
    expect(bad({ ...budget, txSwing_Vppd: 0 }).path).toBe("budget.txSwing_Vppd");
    expect(bad({ ...budget, ctle: { ...budget.ctle, gDc_dB: [0, -3, 1] } }).path).toBe("budget.ctle.gDc_dB");
    expect(bad({ ...budget, dfe: { taps: 2, limits_V: [0.1] } }).path).toBe("budget.dfe.limits_V");
    expect(bad({ ...budget, tx: { pre: 0, post: 1, ranges: [[0, 1]] } }).path).toBe("budget.tx.ranges");
    expect(bad({ ...budget, bitRate_bps: 3e9 }).path).toBe("budget.bitRate_bps");
    expect(
      runCommand("optimize", JSON.stringify({ pulse, budget: { ...budget, colour: "red" }, note: 1 })).exitCode,
    ).toBe(0);
  });

  it("whole process: npm run engine -- optimize answers on stdout with exit 0", () => {
    const p = spawnSync("npm", ["run", "--silent", "engine", "--", "optimize"], {
      input: JSON.stringify({ pulse, budget }),
      encoding: "utf8",
      cwd: new URL("../../..", import.meta.url).pathname,
    });
    expect(p.status).toBe(0);
    expect(JSON.parse(p.stdout).limiterHeadroom_V).toBe(r.limiterHeadroom_V);
  }, 60_000);
});
