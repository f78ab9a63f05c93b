// The `population` command: the minimax default of a class, with and without register codes, and
// bad input (exit 2 naming the field). In-process through runCommand.
import { describe, expect, it } from "vitest";
import { runCommand } from "@lib/cli/runCommand";

// eslint-disable-next-line @typescript-eslint/no-explicit-any
const ok = (request: unknown): any => {
  const r = runCommand("population", JSON.stringify(request));
  if (r.exitCode !== 0) throw new Error(`exit ${r.exitCode}: ${r.text}`);
  return JSON.parse(r.text);
};

const pulseOf = (post: number) => ({
  ui_s: 1e-10,
  samplesPerUi: 8,
  values_V: [
    ...new Array(8).fill(0),
    ...new Array(8).fill(1),
    ...new Array(8).fill(post),
    ...new Array(8).fill(post / 3),
    ...new Array(16).fill(0),
  ],
  mainIndex: 12,
});
const pulses = [pulseOf(0.2), pulseOf(0.45), pulseOf(0.7)];
const budget = {
  txSwing_Vppd: 0.8,
  noiseRms_V: 0.004,
  limiterSensitivity_V: 0.01,
  tx: { pre: 0, post: 1, step: 0.05 },
  ctle: { gDc_dB: [0, 0, 1], fz_Hz: 1e10, fp1_Hz: 1e10, fp2_Hz: 1e14 },
};

describe("population command", () => {
  it("one default for the class: the worst channel is the reported one, no channel beats its own optimum", () => {
    const r = ok({ pulses, budget });
    expect(r.channels.length).toBe(3);
    expect(r.worstHeadroom_V).toBe(
      Math.min(...r.channels.map((c: { defaultHeadroom_V: number }) => c.defaultHeadroom_V)),
    );
    for (const c of r.channels) expect(c.ownHeadroom_V).toBeGreaterThanOrEqual(c.defaultHeadroom_V);
    expect(r.codes).toBeNull();
    expect(r.setting.tx.taps.length).toBe(2);
  });

  it("with a register map: codes and values for each field", () => {
    const registerMap = [
      { name: "tx_main", parameter: "tx[0]", bits: 5, signed: false, lsb: 0.05, unit: "fraction", min: 0, max: 1 },
      { name: "tx_post1", parameter: "tx[1]", bits: 5, signed: true, lsb: 0.05, unit: "fraction", min: -0.5, max: 0 },
    ];
    const r = ok({ pulses, budget, registerMap });
    expect(Object.keys(r.codes).sort()).toEqual(["tx_main", "tx_post1"]);
    expect(r.values.tx_post1).toBeCloseTo(r.codes.tx_post1 * 0.05, 12);
  });

  it("bad input exits 2 naming the field", () => {
    const err = (req: unknown) => JSON.parse(runCommand("population", JSON.stringify(req)).text).error;
    expect(err({ pulses: [], budget }).path).toBe("pulses");
    expect(err({ pulses, budget: { ...budget, noiseRms_V: -1 } }).path).toBe("budget.noiseRms_V");
    expect(
      err({
        pulses,
        budget,
        registerMap: [{ name: "x", parameter: "rx[0]", bits: 4, signed: true, lsb: 1, unit: "V", min: 0, max: 1 }],
      }).path,
    ).toBe("registerMap.0.parameter");
    expect(err({ pulses: [pulses[0], { ...pulses[1], ui_s: 2e-10 }], budget }).message).toMatch(/pulses\[1\]\.ui_s/);
  });
});
