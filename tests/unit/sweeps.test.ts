// The sweep's pure parts: batches cover every pair once, the binding corner is the lowest headroom,
// the histogram counts every value once, the time left follows the pace, the CSV is RFC 4180, and
// every preset says where its numbers come from.
import { describe, expect, it } from "vitest";
import { cornerSchema } from "@lib/contract/corner";
import {
  CORNERS_PER_BATCH,
  headroomHistogram,
  sweepBatches,
  sweepCsv,
  timeLeft_s,
  worstPerChannel,
  type PairResult,
} from "@/features/sweeps/sweeps";
import { cornerPresets, sourceLabel } from "@/features/sweeps/presets";

const pair = (
  channelId: number,
  cornerIndex: number,
  limiterHeadroom_V: number | null,
  error: string | null = null,
): PairResult => ({
  channelId,
  cornerIndex,
  limiterHeadroom_V,
  eyeHeight_V: limiterHeadroom_V,
  linearHeadroom_V: limiterHeadroom_V,
  linearReachExhausted: limiterHeadroom_V === null ? null : false,
  fewestDfeTaps: limiterHeadroom_V === null ? null : 0,
  setting: null,
  error,
});

describe("sweep batches", () => {
  it("cover every channel × corner pair exactly once, one channel per batch, at most CORNERS_PER_BATCH corners", () => {
    for (const [channels, corners] of [
      [1, 1],
      [3, 4],
      [5, 9],
      [13, 4],
      [2, 24],
    ]) {
      const seen = new Set<string>();
      for (const b of sweepBatches(channels, corners)) {
        expect(b.cornerIndices.length).toBeGreaterThan(0);
        expect(b.cornerIndices.length).toBeLessThanOrEqual(CORNERS_PER_BATCH);
        for (const k of b.cornerIndices) {
          const key = `${b.channelIndex}:${k}`;
          expect(seen.has(key)).toBe(false);
          seen.add(key);
        }
      }
      expect(seen.size).toBe(channels * corners);
    }
  });
});

describe("worst corner per channel and the CSV", () => {
  const channels = [
    { id: 7, name: "A", lossAtNyquist_dB: 10 },
    { id: 9, name: "B", lossAtNyquist_dB: 20 },
    { id: 11, name: "C", lossAtNyquist_dB: null },
  ];
  const corners = [{ name: "nominal" }, { name: "hot", lossScale: 1.1 }, { name: "slow", txSwingScale: 0.9 }];

  it("is the lowest headroom; a tie goes to the first corner; refused pairs and channels without results are left out", () => {
    const w = worstPerChannel(channels, corners, [
      pair(7, 0, 0.05),
      pair(7, 1, 0.03),
      pair(7, 2, 0.04),
      pair(9, 0, 0.02),
      pair(9, 1, 0.02),
      pair(9, 2, null, "refused"),
    ]);
    expect(w).toEqual([
      { channelId: 7, channelName: "A", corner: "hot", cornerIndex: 1, limiterHeadroom_V: 0.03 },
      { channelId: 9, channelName: "B", corner: "nominal", cornerIndex: 0, limiterHeadroom_V: 0.02 },
    ]);
  });

  it("CSV: one row per pair in channel then corner order, quoted where needed, mV, empty for no value", () => {
    const inputs = {
      budget: { id: 1, name: "b", params: {} as never },
      corners,
      channels: [{ id: 7, name: 'Lane "7", rear', lossAtNyquist_dB: 10 }],
    };
    const lines = sweepCsv(inputs, [pair(7, 1, 0.0123456), pair(7, 0, -0.001)]).split("\r\n");
    expect(lines).toHaveLength(5);
    expect(lines[4]).toBe("");
    expect(lines[1]).toBe('7,"Lane ""7"", rear",10,nominal,1,1,1,1,1,-1,-1,-1,false,0,');
    expect(lines[2]).toBe('7,"Lane ""7"", rear",10,hot,1.1,1,1,1,1,12.346,12.346,12.346,false,0,');
    expect(lines[3]).toBe('7,"Lane ""7"", rear",10,slow,1,0.9,1,1,1,,,,,,');
    // A name a spreadsheet would run as a formula is shown as text.
    const evil = sweepCsv(
      { ...inputs, channels: [{ id: 8, name: "=HYPERLINK(1)", lossAtNyquist_dB: null }] },
      [],
    ).split("\r\n");
    expect(evil[1].startsWith("8,'=HYPERLINK(1),,nominal")).toBe(true);
  });
});

describe("histogram and time left", () => {
  it("counts every value once, the largest in the last bin; one value makes one bin", () => {
    const values = [0.001, 0.002, 0.0025, 0.01, -0.003];
    const bins = headroomHistogram(values, 4);
    expect(bins).toHaveLength(4);
    expect(bins.reduce((n, b) => n + b.count, 0)).toBe(values.length);
    expect(bins[0].from_V).toBe(-0.003);
    expect(bins[3].to_V).toBeCloseTo(0.01, 15);
    expect(bins[3].count).toBe(1);
    expect(headroomHistogram([0.004, 0.004])).toEqual([{ from_V: 0.004, to_V: 0.004, count: 2 }]);
    expect(headroomHistogram([])).toEqual([]);
  });

  it("the time left is the pace so far times the pairs left; unknown before the first pair", () => {
    expect(timeLeft_s(0, 10, 5)).toBeNull();
    expect(timeLeft_s(4, 10, 8)).toBeCloseTo(12, 12);
    expect(timeLeft_s(10, 10, 30)).toBe(0);
  });
});

describe("corner presets", () => {
  it("are valid corners with unique names, each labelled common practice or from memory with a note", () => {
    for (const p of cornerPresets) {
      expect(["common practice", "from memory"]).toContain(sourceLabel(p.source));
      expect(p.source.note.length).toBeGreaterThan(20);
      expect(new Set(p.corners.map((c) => c.name)).size).toBe(p.corners.length);
      for (const c of p.corners) expect(cornerSchema.safeParse(c).success).toBe(true);
    }
  });
});
