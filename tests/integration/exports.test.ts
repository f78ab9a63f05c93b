// Exports of a tap table version: CSV and JSON parse back to the codes the API shows; the C header
// compiles (`cc -fsyntax-only`) and, compiled into a program, holds the same codes; API tokens fetch
// exports, are refused (401) on write routes and after revocation; every export is audited.
import { execFileSync } from "node:child_process";
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { parse } from "csv-parse/sync";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { baseUrl, signIn, type Client } from "../support/http";
import { closeDb } from "../fixtures/workspace";
import { auditEvents, population, unique, versionComputed } from "./handoff.fixture";

interface ClassResult {
  index: number;
  name: string;
  codes: Record<string, number>;
  values: Record<string, number>;
  worstHeadroom_V: number;
  channels: unknown[];
}
interface Field {
  name: string;
  bits: number;
  signed: boolean;
  lsb: number;
}

let designer: Client;
let admin: Client;
let firmware: Client;
let table: { id: number; name: string; classes: ClassResult[]; registerMap: Field[] };
const dir = mkdtempSync(join(tmpdir(), "tapwright-exports-"));

beforeAll(async () => {
  [designer, admin, firmware] = await Promise.all([signIn("designer"), signIn("admin"), signIn("firmware")]);
  const pop = await population(designer, [5, 9, 13, 17, 21, 25, 29]);
  const res = await designer.send("POST", "/api/v1/tap-tables", {
    name: unique('Export, "quoted" table'),
    budgetId: pop.budgetId,
    architecture: {
      key: "tx-ctle-dfe2",
      label: "TX FIR + CTLE + DFE 2",
      tx: { pre: 0, post: 1 },
      ctle: true,
      dfeTaps: 2,
      ffe: null,
    },
    grouping: { mode: "loss-bins", edges_dB: [10, 20], channelIds: pop.channelIds },
  });
  const { id } = await res.json();
  const v = await versionComputed(designer, id, 1);
  expect(v.job.status, v.job.error?.message).toBe("done");
  table = { id, name: v.table.name, classes: v.result.classes, registerMap: v.inputs.registerMap };
});
afterAll(closeDb);

const exportPath = (format: string) => `/api/v1/tap-tables/${table.id}/versions/1/export?format=${format}`;

describe("exports", () => {
  it("CSV: one row per class with the register codes, and it parses back", async () => {
    const res = await firmware.get(exportPath("csv"));
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toMatch(/^text\/csv/);
    expect(res.headers.get("content-disposition")).toMatch(/attachment; filename=".+_v1_draft\.csv"/);
    const rows = parse(await res.text(), { columns: true, skip_empty_lines: true }) as Record<string, string>[];
    expect(rows).toHaveLength(table.classes.length);
    expect(Object.keys(rows[0])).toEqual([
      "class_index",
      "class_name",
      "loss_min_dB",
      "loss_max_dB",
      "channel_count",
      "worst_headroom_mV",
      ...table.registerMap.map((f) => f.name),
    ]);
    table.classes.forEach((c, i) => {
      expect(rows[i].class_name).toBe(c.name);
      expect(Number(rows[i].class_index)).toBe(c.index);
      expect(Number(rows[i].channel_count)).toBe(c.channels.length);
      expect(Number(rows[i].worst_headroom_mV)).toBeCloseTo(c.worstHeadroom_V * 1e3, 3);
      for (const f of table.registerMap) expect(Number(rows[i][f.name])).toBe(c.codes[f.name]);
    });
    expect(rows[0].loss_min_dB).toBe("");
    expect(rows[0].loss_max_dB).toBe("10");
  });

  it("JSON: the whole version, which parses back to the same codes and values", async () => {
    const res = await firmware.get(exportPath("json"));
    expect(res.status).toBe(200);
    const doc = await res.json();
    expect(doc.format).toBe("tapwright.tap-table/1");
    expect(doc).toMatchObject({
      table: { id: table.id, name: table.name },
      version: 1,
      state: "ready",
      approval: null,
    });
    expect(doc.registerMap).toEqual(table.registerMap);
    expect(doc.classes.map((c: ClassResult) => c.codes)).toEqual(table.classes.map((c) => c.codes));
    expect(doc.classes.map((c: ClassResult) => c.values)).toEqual(table.classes.map((c) => c.values));
    expect(doc.caution).toMatch(/real hardware/);
  });

  it("C header: compiles with cc -fsyntax-only, and a program built on it reads the same codes", async () => {
    const res = await firmware.get(exportPath("c"));
    expect(res.status).toBe(200);
    expect(res.headers.get("content-disposition")).toMatch(/_v1_draft\.h"/);
    const header = await res.text();
    const file = join(dir, "table.h");
    writeFileSync(file, header);
    execFileSync("cc", ["-fsyntax-only", "-std=c99", "-Wall", "-Wextra", "-pedantic", "-Werror", "-x", "c", file]);

    const prefix = header.match(/typedef struct \{[\s\S]*?\} (\w+)_setting_t;/)![1];
    const P = prefix.toUpperCase();
    const prog = [
      "#include <stdio.h>",
      '#include "table.h"',
      "int main(void) {",
      `  unsigned i;`,
      `  for (i = 0; i < ${P}_CLASS_COUNT; i++) {`,
      `    printf("${table.registerMap.map(() => "%ld").join(" ")}\\n", ${table.registerMap.map((f) => `(long)${prefix}_defaults[i].${f.name}`).join(", ")});`,
      "  }",
      `  printf("%u %u\\n", ${P}_VERSION, ${P}_FIELD_COUNT);`,
      "  return 0;",
      "}",
    ].join("\n");
    writeFileSync(join(dir, "main.c"), prog);
    execFileSync(
      "cc",
      ["-std=c99", "-Wall", "-Wextra", "-pedantic", "-Werror", "-o", join(dir, "main"), join(dir, "main.c")],
      { cwd: dir },
    );
    const lines = execFileSync(join(dir, "main")).toString().trim().split("\n");
    expect(lines).toHaveLength(table.classes.length + 1);
    table.classes.forEach((c, i) =>
      expect(lines[i].split(" ").map(Number)).toEqual(table.registerMap.map((f) => c.codes[f.name])),
    );
    expect(lines[table.classes.length]).toBe(`1 ${table.registerMap.length}`);
    for (const f of table.registerMap) {
      expect(header).toContain(`#define ${P}_${f.name.toUpperCase()}_BITS ${f.bits}u`);
      expect(header).toContain(`#define ${P}_${f.name.toUpperCase()}_SIGNED ${f.signed ? 1 : 0}`);
    }
    expect(header).toMatch(/NOT SIGNED OFF \(ready\)/);
    for (const id of ["CLASS_LOSS_LT_10_DB = 0", "CLASS_LOSS_10_TO_20_DB = 1", "CLASS_LOSS_GE_20_DB = 2"])
      expect(header).toContain(`${P}_${id}`);
    expect(header).toContain(`#define ${P}_SIGNED_OFF 0`);
  });

  it("an unknown format is refused (400) and names the field", async () => {
    const res = await firmware.get(exportPath("xml"));
    expect(res.status).toBe(400);
    expect((await res.json()).error.path).toBe("format");
  });
});

describe("API tokens", () => {
  it("fetch exports; are refused on write routes; stop working when revoked; exports are audited", async () => {
    const created = await (await firmware.send("POST", "/api/v1/tokens", { name: unique("Firmware build") })).json();
    const bearer = { authorization: `Bearer ${created.secret}` };
    const viaToken = await fetch(baseUrl + exportPath("c"), { headers: bearer });
    expect(viaToken.status).toBe(200);
    expect(await viaToken.text()).toContain("_defaults[");
    expect((await fetch(baseUrl + `/api/v1/tap-tables/${table.id}`, { headers: bearer })).status).toBe(200);

    const writes: [string, string, unknown][] = [
      ["POST", "/api/v1/tap-tables", { name: "x" }],
      ["POST", `/api/v1/tap-tables/${table.id}/versions`, {}],
      ["PUT", `/api/v1/tap-tables/${table.id}/versions/1`, { note: "x" }],
      ["POST", `/api/v1/tap-tables/${table.id}/versions/1/sign-off`, { reviewerId: "x" }],
      ["POST", "/api/v1/studies", {}],
      ["POST", "/api/v1/sign-offs/1/decision", { decision: "approve" }],
      ["POST", "/api/v1/sign-offs/1/comments", { body: "x" }],
    ];
    for (const [method, path, body] of writes) {
      const res = await fetch(baseUrl + path, {
        method,
        headers: { ...bearer, "content-type": "application/json", origin: baseUrl },
        body: JSON.stringify(body),
      });
      expect(res.status, `${method} ${path}`).toBe(401);
    }

    const events = await auditEvents(admin, "table.export");
    expect(
      events.some(
        (e) =>
          e.targetId === String(table.id) &&
          e.actorEmail === "firmware@tapwright.test" &&
          e.detail?.via === "token" &&
          e.detail?.format === "c",
      ),
    ).toBe(true);
    expect(
      events.some((e) => e.targetId === String(table.id) && e.detail?.via === "session" && e.detail?.format === "csv"),
    ).toBe(true);

    expect((await firmware.send("DELETE", `/api/v1/tokens/${created.id}`)).status).toBe(200);
    const revoked = await fetch(baseUrl + exportPath("c"), { headers: bearer });
    expect(revoked.status).toBe(401);
    expect((await revoked.json()).error.message).toMatch(/revoked/);
  });
});
