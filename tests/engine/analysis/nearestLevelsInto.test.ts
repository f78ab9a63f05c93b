// The levels around a slicer threshold, which decide what a BER at (t, v) is made of.
import { describe, expect, it } from "vitest";
import { nearestLevelsInto } from "@lib/analysis/nearestLevelsInto";

const out = new Int32Array(2);
const around = (levels: number[], main_V: number, v_V: number) => {
  nearestLevelsInto(levels, main_V, v_V, out);
  return [out[0], out[1]];
};

describe("nearestLevelsInto", () => {
  it("NRZ: the threshold between the two levels has one level on each side", () => {
    expect(around([-1, 1], 0.2, 0)).toEqual([1, 0]);
    expect(around([-1, 1], 0.2, 0.15)).toEqual([1, 0]);
  });

  it("PAM4: each of the three eyes is bounded by its two neighbouring levels", () => {
    const pam4 = [-1, -1 / 3, 1 / 3, 1];
    expect(around(pam4, 0.3, 0.2)).toEqual([3, 2]);
    expect(around(pam4, 0.3, 0)).toEqual([2, 1]);
    expect(around(pam4, 0.3, -0.2)).toEqual([1, 0]);
  });

  it("edges: a threshold beyond every level has none on one side; a level at the threshold counts as above", () => {
    expect(around([-1, 1], 0.2, 0.5)).toEqual([-1, 1]);
    expect(around([-1, 1], 0.2, -0.5)).toEqual([0, -1]);
    expect(around([-1, 1], 0.2, 0.2)).toEqual([1, 0]);
  });

  it("a negative main cursor mirrors the order of the levels", () => {
    expect(around([-1, 1], -0.2, 0.1)).toEqual([0, 1]);
  });
});
