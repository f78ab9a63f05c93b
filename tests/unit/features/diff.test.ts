// The difference between two versions of a tap table: a class matches by name, or else by holding
// the same channels (a rename); codes and worst headroom are compared per class, and every channel
// says where it moved, which codes its class default changed and its headroom before and after.
import { describe, expect, it } from "vitest";
import { diffVersions } from "@/features/tapTables/diff";
import type { ChannelHeadroom, ClassResult } from "@/features/tapTables/tapTables";

function channel(id: number, defaultHeadroom_V: number): ChannelHeadroom {
  return {
    id,
    name: `Lane ${id}`,
    lossAtNyquist_dB: 10 + id,
    defaultHeadroom_V,
    ownHeadroom_V: defaultHeadroom_V + 0.001,
    defaultEyeHeight_V: 0.05,
    own: { tx: [0, 1, -0.1], ctle: { gDc_dB: -6, gDc2_dB: 0 } },
  };
}

function cls(index: number, name: string, codes: Record<string, number>, members: ChannelHeadroom[]): ClassResult {
  return {
    index,
    name,
    lossRange_dB: null,
    codes,
    values: {},
    worstHeadroom_V: Math.min(...members.map((m) => m.defaultHeadroom_V)),
    channels: members,
  };
}

describe("version diff", () => {
  const v1 = [
    cls(0, "Short", { ctle_gdc: -2, dfe_tap1: 10 }, [channel(1, 0.02), channel(2, 0.018)]),
    cls(1, "Long", { ctle_gdc: -8, dfe_tap1: 40 }, [channel(3, 0.006), channel(4, 0.004)]),
    cls(2, "Spare", { ctle_gdc: 0, dfe_tap1: 0 }, [channel(5, 0.03)]),
  ];
  const v2 = [
    cls(0, "Short", { ctle_gdc: -2, dfe_tap1: 10 }, [channel(1, 0.02), channel(2, 0.018)]),
    // "Long" renamed: it matches by holding the same channels, and its DFE code moved.
    cls(1, "Long reach", { ctle_gdc: -8, dfe_tap1: 44 }, [channel(4, 0.0045), channel(3, 0.0065)]),
    // Channel 5 moved into a new class (with a new channel 6) and another CTLE code; "Spare" is gone.
    cls(2, "Stub", { ctle_gdc: -1, dfe_tap1: 0, tx_post1: -3 }, [channel(5, 0.028), channel(6, 0.03)]),
  ];
  const d = diffVersions(1, v1, v2);

  it("matches classes by name, then by members, and marks what was added, removed, changed or kept", () => {
    expect(d.fromVersion).toBe(1);
    expect(d.classes.map((c) => [c.name, c.status, c.renamedFrom])).toEqual([
      ["Short", "same", null],
      ["Long reach", "changed", "Long"],
      ["Stub", "added", null],
      ["Spare", "removed", null],
    ]);
  });

  it("lists the register codes that changed, with fields only one side has as null", () => {
    expect(d.classes[1].codes).toEqual([{ field: "dfe_tap1", from: 40, to: 44 }]);
    expect(d.classes[2].codes).toEqual([]);
    expect(d.classes[0].worstHeadroom_V).toEqual({ from: 0.018, to: 0.018 });
    expect(d.classes[1].worstHeadroom_V).toEqual({ from: 0.004, to: 0.0045 });
    expect(d.classes[2].worstHeadroom_V).toEqual({ from: null, to: 0.028 });
    expect(d.classes[3].worstHeadroom_V).toEqual({ from: 0.03, to: null });
  });

  it("says per channel where it moved, the codes its class default changed and its headroom before and after", () => {
    const five = d.channels.find((c) => c.id === 5)!;
    expect(five).toEqual({
      id: 5,
      name: "Lane 5",
      fromClass: "Spare",
      toClass: "Stub",
      codes: [
        { field: "ctle_gdc", from: 0, to: -1 },
        { field: "tx_post1", from: null, to: -3 },
      ],
      from_V: 0.03,
      to_V: 0.028,
    });
    expect(d.channels.find((c) => c.id === 1)).toMatchObject({ fromClass: "Short", toClass: "Short", codes: [] });
    expect(d.channels.find((c) => c.id === 3)).toMatchObject({
      codes: [{ field: "dfe_tap1", from: 40, to: 44 }],
      from_V: 0.006,
      to_V: 0.0065,
    });
    expect(d.channels.find((c) => c.id === 6)).toMatchObject({
      fromClass: null,
      toClass: "Stub",
      from_V: null,
      to_V: 0.03,
    });
    expect(d.channels.map((c) => c.id).sort()).toEqual([1, 2, 3, 4, 5, 6]);
  });

  it("a channel only in one version has no class on the other side", () => {
    const gone = diffVersions(
      2,
      [cls(0, "A", { x: 1 }, [channel(7, 0.01)])],
      [cls(0, "A", { x: 1 }, [channel(8, 0.02)])],
    );
    expect(gone.classes).toEqual([
      { name: "A", renamedFrom: null, status: "same", codes: [], worstHeadroom_V: { from: 0.01, to: 0.02 } },
    ]);
    expect(gone.channels).toEqual([
      {
        id: 8,
        name: "Lane 8",
        fromClass: null,
        toClass: "A",
        codes: [{ field: "x", from: null, to: 1 }],
        from_V: null,
        to_V: 0.02,
      },
      {
        id: 7,
        name: "Lane 7",
        fromClass: "A",
        toClass: null,
        codes: [{ field: "x", from: 1, to: null }],
        from_V: 0.01,
        to_V: null,
      },
    ]);
  });
});
