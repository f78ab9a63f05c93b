// The channel rows of the sign-off page and the table page: every channel with its class, lowest
// loss first within each class (classes in their order), passing when its headroom with the class
// default reaches the required headroom (equal passes).
import { describe, expect, it } from "vitest";
import { headroomRows, type ChannelHeadroom, type ClassResult } from "@/features/tapTables/tapTables";

function lane(id: number, lossAtNyquist_dB: number | null, defaultHeadroom_V: number): ChannelHeadroom {
  return {
    id,
    name: `Lane ${id}`,
    lossAtNyquist_dB,
    defaultHeadroom_V,
    ownHeadroom_V: defaultHeadroom_V,
    defaultEyeHeight_V: 0.03,
    own: { tx: [1], ctle: { gDc_dB: 0, gDc2_dB: 0 } },
  };
}

function cls(index: number, name: string, channels: ChannelHeadroom[]): ClassResult {
  return {
    index,
    name,
    lossRange_dB: null,
    codes: {},
    values: {},
    worstHeadroom_V: Math.min(...channels.map((c) => c.defaultHeadroom_V)),
    channels,
  };
}

describe("headroom rows", () => {
  const classes = [
    cls(0, "Short", [lane(2, 11, 0.02), lane(1, 6, 0.03)]),
    cls(1, "By hand", [lane(4, null, 0.005), lane(3, 20, 0.0049999)]),
  ];

  it("lists every channel with its class, lowest loss first within a class, unknown loss as 0", () => {
    const rows = headroomRows(classes, 0.005);
    expect(rows.map((r) => [r.name, r.className])).toEqual([
      ["Lane 1", "Short"],
      ["Lane 2", "Short"],
      ["Lane 4", "By hand"],
      ["Lane 3", "By hand"],
    ]);
  });

  it("passes a channel whose headroom reaches the requirement, equal included", () => {
    expect(headroomRows(classes, 0.005).map((r) => [r.id, r.meetsRequired])).toEqual([
      [1, true],
      [2, true],
      [4, true],
      [3, false],
    ]);
    expect(headroomRows(classes, -1).every((r) => r.meetsRequired)).toBe(true);
  });

  it("leaves the classes as they were (sorts copies)", () => {
    headroomRows(classes, 0);
    expect(classes[0].channels.map((c) => c.id)).toEqual([2, 1]);
  });

  it("has no rows for no classes", () => {
    expect(headroomRows([], 0)).toEqual([]);
  });
});
