// Channel classes of a tap table: loss bins hold lo ≤ loss < hi (a channel on an edge goes up),
// empty bins are dropped, manual classes keep their order and names, and what cannot be grouped
// is refused with the request path of the channel at fault.
import { describe, expect, it } from "vitest";
import { classesOf, groupingChannelIds, GroupingError, type GroupableChannel } from "@/features/tapTables/grouping";

const channels = new Map<number, GroupableChannel>(
  [
    { id: 1, name: "Short", lossAtNyquist_dB: 5 },
    { id: 2, name: "On the edge", lossAtNyquist_dB: 12 },
    { id: 3, name: "Just under", lossAtNyquist_dB: 19.9 },
    { id: 4, name: "Long", lossAtNyquist_dB: 20 },
    { id: 5, name: "Very long", lossAtNyquist_dB: 30 },
    { id: 6, name: "From a pulse file", lossAtNyquist_dB: null },
  ].map((c) => [c.id, c]),
);

const names = (cs: { channels: GroupableChannel[] }[]) => cs.map((c) => c.channels.map((ch) => ch.name));

describe("loss bins", () => {
  it("bins by loss at Nyquist, lo ≤ loss < hi, in order from low to high loss", () => {
    const classes = classesOf({ mode: "loss-bins", channelIds: [5, 4, 3, 2, 1], edges_dB: [12, 20] }, channels);
    expect(classes.map((c) => c.name)).toEqual(["Loss < 12 dB", "Loss 12–20 dB", "Loss ≥ 20 dB"]);
    expect(classes.map((c) => c.lossRange_dB)).toEqual([
      [null, 12],
      [12, 20],
      [20, null],
    ]);
    expect(names(classes)).toEqual([["Short"], ["Just under", "On the edge"], ["Very long", "Long"]]);
  });

  it("drops empty bins, and with no edges holds every channel in one class", () => {
    const sparse = classesOf({ mode: "loss-bins", channelIds: [1, 5], edges_dB: [8, 12, 20] }, channels);
    expect(sparse.map((c) => c.name)).toEqual(["Loss < 8 dB", "Loss ≥ 20 dB"]);
    const one = classesOf({ mode: "loss-bins", channelIds: [1, 2], edges_dB: [] }, channels);
    expect(one).toEqual([
      { name: "All channels", lossRange_dB: [null, null], channels: [channels.get(1), channels.get(2)] },
    ]);
  });

  it("refuses a channel without a loss at Nyquist, and an unknown channel, naming its place in the request", () => {
    const noLoss = () => classesOf({ mode: "loss-bins", channelIds: [1, 6], edges_dB: [12] }, channels);
    expect(noLoss).toThrow(GroupingError);
    expect(noLoss).toThrow(/From a pulse file.*group the channels by hand/);
    try {
      classesOf({ mode: "loss-bins", channelIds: [1, 99], edges_dB: [12] }, channels);
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(GroupingError);
      expect((e as GroupingError).path).toBe("grouping.channelIds.1");
    }
  });
});

describe("classes by hand", () => {
  it("keeps the classes' order and names, without loss ranges, and takes channels without a known loss", () => {
    const classes = classesOf(
      {
        mode: "manual",
        classes: [
          { name: "Daughter cards", channelIds: [6, 5] },
          { name: "Midplane", channelIds: [1] },
        ],
      },
      channels,
    );
    expect(classes.map((c) => [c.name, c.lossRange_dB])).toEqual([
      ["Daughter cards", null],
      ["Midplane", null],
    ]);
    expect(names(classes)).toEqual([["From a pulse file", "Very long"], ["Short"]]);
  });

  it("names the class and position of an unknown channel", () => {
    try {
      classesOf(
        {
          mode: "manual",
          classes: [
            { name: "A", channelIds: [1] },
            { name: "B", channelIds: [2, 42] },
          ],
        },
        channels,
      );
      expect.unreachable();
    } catch (e) {
      expect((e as GroupingError).path).toBe("grouping.classes.1.channelIds.1");
      expect((e as Error).message).toBe("Channel 42 was not found.");
    }
  });

  it("lists every channel a grouping names, in request order", () => {
    expect(groupingChannelIds({ mode: "loss-bins", channelIds: [3, 1], edges_dB: [12] })).toEqual([3, 1]);
    expect(
      groupingChannelIds({
        mode: "manual",
        classes: [
          { name: "A", channelIds: [4] },
          { name: "B", channelIds: [2, 5] },
        ],
      }),
    ).toEqual([4, 2, 5]);
  });
});
