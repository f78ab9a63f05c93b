// The tap-table exports against hostile names: CSV cells that a spreadsheet would run as formulas
// are neutralised (OWASP's CSV injection guidance), and the C header stays valid C99 when field
// names are C keywords and class names collide after they are made identifiers.
import { execFileSync } from "node:child_process";
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { parse } from "csv-parse/sync";
import { describe, expect, it } from "vitest";
import { renderExport, type ExportModel } from "@/features/tapTables/exports";
import type { RegisterField } from "@/features/tapTables/registerMap";

const field = (name: string): RegisterField => ({
  name,
  parameter: "ctle.gDc_dB",
  bits: 4,
  signed: true,
  lsb: 1,
  unit: "dB",
  min: -7,
  max: 7,
});

function model(classNames: string[], fields: RegisterField[]): ExportModel {
  return {
    table: { id: 1, name: "=cmd|' /C calc'!A0" },
    version: 1,
    state: "ready",
    approval: null,
    budget: { name: "@SUM(1+1)", modulation: "nrz", bitRate_bps: 28e9, targetBer: 1e-12, requiredHeadroom_V: 0.005 },
    architecture: { key: "ctle", label: "CTLE only", tx: { pre: 0, post: 0 }, ctle: true, dfeTaps: 0, ffe: null },
    registerMap: fields,
    classes: classNames.map((name, index) => ({
      index,
      name,
      lossRange_dB: null,
      channels: [],
      worstHeadroom_V: -0.002,
      codes: Object.fromEntries(fields.map((f) => [f.name, -3])),
      values: Object.fromEntries(fields.map((f) => [f.name, -3])),
    })) as unknown as ExportModel["classes"],
    corners: null,
    engineVersion: "test",
    generatedAt: new Date(0),
  };
}

describe("CSV export", () => {
  it("prefixes text cells that start with = + - @, a tab or a carriage return with a quote; numbers stay numbers", () => {
    const names = ['=HYPERLINK("http://x.example","x")', "+1+1", "-2+3", "@SUM(A1:A2)", "\tTab", "\rReturn", "Plain"];
    const rows = parse(renderExport(model(names, [field("gain")]), "csv"), {
      columns: true,
      relax_quotes: true,
    }) as Record<string, string>[];
    expect(rows.map((r) => r.class_name)).toEqual([
      '\'=HYPERLINK("http://x.example","x")',
      "'+1+1",
      "'-2+3",
      "'@SUM(A1:A2)",
      "'\tTab",
      "'\rReturn",
      "Plain",
    ]);
    expect(rows[0].gain).toBe("-3");
    expect(rows[0].worst_headroom_mV).toBe("-2");
  });
});

describe("C header export", () => {
  it("compiles when field names are C keywords and class names collide after mangling", () => {
    const header = renderExport(
      model(
        ["Count", "A", "A", "A 2", "a-2", "int"],
        [field("int"), field("default"), field("register"), field("gain")],
      ),
      "c",
    );
    const dir = mkdtempSync(join(tmpdir(), "tapwright-cheader-"));
    writeFileSync(join(dir, "t.h"), header);
    writeFileSync(
      join(dir, "main.c"),
      '#include "t.h"\nint main(void) { return (int)sizeof tw_cmd_c_calc_a0_defaults[0] > 0 ? 0 : 1; }\n',
    );
    execFileSync(
      "cc",
      [
        "-std=c99",
        "-Wall",
        "-Wextra",
        "-pedantic",
        "-Werror",
        "-Wno-unused-variable",
        "-o",
        join(dir, "main"),
        join(dir, "main.c"),
      ],
      { cwd: dir },
    );
    const enumNames = [...header.matchAll(/^\s+(TW_\w+) = \d+,/gm)].map((m) => m[1]);
    expect(new Set(enumNames).size).toBe(6);
    expect(header).not.toMatch(/^\s+int8_t int;/m);
  });
});
