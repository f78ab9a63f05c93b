// The three exports of a tap table version against golden files (tests/unit/features/golden/):
// a change of layout shows as a diff of the file, to be reviewed and accepted with `vitest -u`.
// The model is a signed-off 28 Gb/s NRZ table of two classes under the default register map.
import { describe, expect, it } from "vitest";
import { decodeField } from "@lib/tapTables/registerMap";
import { exportFilename, exportMediaType, renderExport, type ExportModel } from "@/features/tapTables/exports";
import { defaultRegisterMap } from "@/features/tapTables/registerMap";
import type { Architecture } from "@/features/studies/architecture";
import type { ChannelHeadroom, ClassResult } from "@/features/tapTables/tapTables";
import { budget } from "../../support/budget";

const architecture: Architecture = {
  key: "tx-ctle-dfe2",
  label: "TX FIR + CTLE + DFE 2",
  tx: { pre: 1, post: 1 },
  ctle: true,
  dfeTaps: 2,
  ffe: null,
};
const registerMap = defaultRegisterMap(architecture, budget());

function lane(id: number, loss_dB: number, default_V: number, own_V: number): ChannelHeadroom {
  return {
    id,
    name: `Kestrel lane ${id}`,
    lossAtNyquist_dB: loss_dB,
    defaultHeadroom_V: default_V,
    ownHeadroom_V: own_V,
    defaultEyeHeight_V: default_V + 0.015,
    own: { tx: [-0.05, 0.8, -0.15], ctle: { gDc_dB: -6, gDc2_dB: 0 } },
  };
}

function cls(
  index: number,
  name: string,
  lossRange_dB: [number | null, number | null],
  codeList: number[],
  channels: ChannelHeadroom[],
): ClassResult {
  const codes = Object.fromEntries(registerMap.map((f, i) => [f.name, codeList[i]]));
  const values = Object.fromEntries(registerMap.map((f, i) => [f.name, decodeField(f, codeList[i])]));
  return {
    index,
    name,
    lossRange_dB,
    codes,
    values,
    worstHeadroom_V: Math.min(...channels.map((c) => c.defaultHeadroom_V)),
    channels,
  };
}

const model: ExportModel = {
  table: { id: 7, name: "Kestrel midplane — lanes 0–3" },
  version: 3,
  state: "approved",
  approval: { by: "Ines Varga", at: new Date("2026-11-20T14:05:00Z") },
  budget: {
    name: "Kestrel 28G NRZ",
    modulation: "nrz",
    bitRate_bps: 28e9,
    targetBer: 1e-12,
    requiredHeadroom_V: 0.005,
  },
  architecture,
  registerMap,
  classes: [
    cls(
      0,
      "Loss < 16 dB",
      [null, 16],
      [0, 18, -2, -1, 12, 3],
      [lane(1, 9.5, 0.0312, 0.0334), lane(2, 14.2, 0.0228, 0.0241)],
    ),
    cls(
      1,
      "Loss ≥ 16 dB",
      [16, null],
      [-1, 15, -4, -3, 38, 11],
      [lane(3, 18.8, 0.0094, 0.0101), lane(4, 23.6, 0.0061, 0.0069)],
    ),
  ],
  engineVersion: "golden-1",
  generatedAt: new Date("2026-11-21T09:30:00Z"),
};

describe("tap-table exports against golden files", () => {
  it("CSV: one row per class with its register codes", async () => {
    const csv = renderExport(model, "csv");
    // Snapshots compare with normalized line ends; RFC 4180's CRLF is checked here.
    expect(csv.split("\r\n")).toHaveLength(4);
    await expect(csv).toMatchFileSnapshot("./golden/kestrel_v3.csv");
  });

  it("JSON: the whole version, codes and physical values", async () => {
    await expect(renderExport(model, "json")).toMatchFileSnapshot("./golden/kestrel_v3.json");
  });

  it("C header: the register map as macros and one initializer per class", async () => {
    await expect(renderExport(model, "c")).toMatchFileSnapshot("./golden/kestrel_v3.h");
  });

  it("names the files after the table (non-ASCII dropped, so “0–3” reads 03), drafts marked, with each format's media type", () => {
    expect(exportFilename(model, "csv")).toBe("kestrel_midplane_lanes_03_v3.csv");
    expect(exportFilename({ ...model, state: "ready" }, "c")).toBe("kestrel_midplane_lanes_03_v3_draft.h");
    expect(exportMediaType("json")).toBe("application/json; charset=utf-8");
  });
});
