// The three export formats of a tap table version, in Tapwright's own layout (documented in the
// README): CSV (one row per class, register codes), JSON (everything, codes and physical values)
// and a C header (the register map as macros and one array of default settings per class).
import type { Corner } from "@lib/contract/corner";
import { codeRange } from "@lib/tapTables";
import type { Architecture } from "@/features/studies/architecture";
import type { RegisterField } from "./registerMap";
import type { ClassResult, ExportFormat, VersionState } from "./tapTables";

/** Everything an export holds. */
export interface ExportModel {
  table: { id: number; name: string };
  version: number;
  state: VersionState;
  approval: { by: string; at: Date } | null;
  budget: {
    name: string;
    modulation: string;
    bitRate_bps: number | null;
    targetBer: number;
    requiredHeadroom_V: number;
  };
  architecture: Architecture;
  registerMap: RegisterField[];
  classes: ClassResult[];
  /** The corners the defaults hold at (a sweep's); none when absent or null. */
  corners?: Corner[] | null;
  engineVersion: string;
  generatedAt: Date;
}

/** JSON export's format tag; a change of layout changes the number. */
export const JSON_FORMAT = "tapwright.tap-table/1";

const mediaTypes: Record<ExportFormat, string> = {
  csv: "text/csv; charset=utf-8",
  json: "application/json; charset=utf-8",
  c: "text/x-c; charset=utf-8",
};
const extensions: Record<ExportFormat, string> = { csv: "csv", json: "json", c: "h" };

/** A lowercase identifier from a name: "Quillfeather NRZ backplane" → "quillfeather_nrz_backplane". */
function slug(name: string, max = 40): string {
  const s = name
    .normalize("NFKD")
    .replace(/\P{ASCII}/gu, "")
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, "_")
    .replace(/^_+|_+$/g, "")
    .slice(0, max)
    .replace(/_+$/, "");
  return /^[a-z]/.test(s) ? s : `t_${s || "table"}`;
}

/** File name of an export: `<table>_v<n>.<ext>`, with `_draft` before the extension unless the version is signed off. */
export function exportFilename(model: Pick<ExportModel, "table" | "version" | "state">, format: ExportFormat): string {
  return `${slug(model.table.name)}_v${model.version}${model.state === "approved" ? "" : "_draft"}.${extensions[format]}`;
}

export function exportMediaType(format: ExportFormat): string {
  return mediaTypes[format];
}

/**
 * One CSV cell, quoted as RFC 4180 asks. Text that starts with = + - @, a tab or a carriage return
 * gets a leading ' so that a spreadsheet shows it instead of running it as a formula (OWASP's CSV
 * injection guidance); numbers are written as numbers.
 */
export function csvCell(value: string | number | null): string {
  if (value === null) return "";
  const s = typeof value === "number" ? String(value) : /^[=+\-@\t\r]/.test(value) ? `'${value}` : value;
  return /[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

/**
 * CSV: a header row, then one row per class: `class_index, class_name, loss_min_dB, loss_max_dB,
 * channel_count, worst_headroom_mV`, then one column per register field holding its code.
 */
function toCsv(m: ExportModel): string {
  const header = [
    "class_index",
    "class_name",
    "loss_min_dB",
    "loss_max_dB",
    "channel_count",
    "worst_headroom_mV",
    ...m.registerMap.map((f) => f.name),
  ];
  const rows = m.classes.map((c) => [
    c.index,
    c.name,
    c.lossRange_dB?.[0] ?? null,
    c.lossRange_dB?.[1] ?? null,
    c.channels.length,
    Number((c.worstHeadroom_V * 1e3).toFixed(3)),
    ...m.registerMap.map((f) => c.codes[f.name]),
  ]);
  return [header, ...rows].map((r) => r.map(csvCell).join(",")).join("\r\n") + "\r\n";
}

/** JSON: the whole version — budget summary, architecture, register map, classes with codes and values. */
function toJson(m: ExportModel): string {
  return (
    JSON.stringify(
      {
        format: JSON_FORMAT,
        table: m.table,
        version: m.version,
        state: m.state,
        approval: m.approval ? { by: m.approval.by, at: m.approval.at.toISOString() } : null,
        generatedAt: m.generatedAt.toISOString(),
        engineVersion: m.engineVersion,
        budget: m.budget,
        architecture: m.architecture,
        // Only a version held at a sweep's corners names them; a nominal export stays as it was.
        ...(m.corners ? { corners: m.corners } : {}),
        registerMap: m.registerMap,
        classes: m.classes.map((c) => ({
          index: c.index,
          name: c.name,
          lossRange_dB: c.lossRange_dB,
          channels: c.channels.map((ch) => ({
            name: ch.name,
            lossAtNyquist_dB: ch.lossAtNyquist_dB,
            defaultHeadroom_V: ch.defaultHeadroom_V,
            ownHeadroom_V: ch.ownHeadroom_V,
            ...(ch.worstCorner !== undefined ? { worstCorner: ch.worstCorner } : {}),
          })),
          worstHeadroom_V: c.worstHeadroom_V,
          codes: c.codes,
          values: c.values,
        })),
        caution:
          "Estimates from linear models and statistical assumptions; confirm on real hardware under your qualification rules before production.",
      },
      null,
      2,
    ) + "\n"
  );
}

/** The smallest C99 integer type holding a field's codes. */
function cType(f: RegisterField): string {
  const width = f.bits <= 8 ? 8 : f.bits <= 16 ? 16 : 32;
  return `${f.signed ? "int" : "uint"}${width}_t`;
}

/** A comment-safe one-liner (no comment terminators, no line breaks). */
function commentText(s: string): string {
  return s.replace(/\*\//g, "* /").replace(/[\r\n]+/g, " ");
}

function cNumber(v: number): string {
  const s = Number(v.toPrecision(12)).toString();
  return /[.e]/.test(s) ? s : `${s}.0`;
}

/**
 * C header: an include guard, `<P>_VERSION`, `<P>_SIGNED_OFF` (1 or 0), `<P>_CLASS_COUNT`; per field `<P>_<FIELD>_BITS`,
 * `_SIGNED`, `_LSB` (physical units, a double), `_MIN_CODE`, `_MAX_CODE`; an enum of the classes;
 * a struct with one member per field (the smallest stdint type); and `<p>_defaults[]`, one
 * initializer per class in enum order. `<P>` is `TW_` + the table's name as an identifier.
 */
function toCHeader(m: ExportModel): string {
  const p = `tw_${slug(m.table.name)}`;
  const P = p.toUpperCase();
  const guard = `${P}_V${m.version}_H`;
  const lines: string[] = [];
  lines.push(
    `/* ${commentText(`Tapwright tap table "${m.table.name}" v${m.version} — ${m.state === "approved" ? "signed off" : `NOT SIGNED OFF (${m.state})`}`)}`,
  );
  if (m.approval) lines.push(` * ${commentText(`Approved by ${m.approval.by} on ${m.approval.at.toISOString()}`)}`);
  lines.push(
    ` * ${commentText(`Budget: ${m.budget.name} (${m.budget.modulation.toUpperCase()}, target BER ${m.budget.targetBer})`)}`,
  );
  lines.push(` * ${commentText(`Architecture: ${m.architecture.label}`)}`);
  lines.push(` * ${commentText(`Generated ${m.generatedAt.toISOString()} by engine ${m.engineVersion}.`)}`);
  lines.push(" * Estimates from linear models; confirm on real hardware before production.");
  lines.push(" */");
  lines.push(`#ifndef ${guard}`, `#define ${guard}`, "", "#include <stdint.h>", "");
  lines.push(`#define ${P}_VERSION ${m.version}u`);
  lines.push(`/* 1 when a reviewer signed this version off; a build can refuse drafts with #if !${P}_SIGNED_OFF. */`);
  lines.push(`#define ${P}_SIGNED_OFF ${m.state === "approved" ? 1 : 0}`);
  lines.push(`#define ${P}_CLASS_COUNT ${m.classes.length}u`);
  lines.push(`#define ${P}_FIELD_COUNT ${m.registerMap.length}u`, "");
  for (const f of m.registerMap) {
    const F = `${P}_${f.name.toUpperCase()}`;
    const { lo, hi } = codeRange(f);
    lines.push(
      `/* ${commentText(`${f.name}: ${f.parameter}, LSB ${f.lsb} ${f.unit}, range ${f.min} … ${f.max} ${f.unit}`)} */`,
    );
    lines.push(`#define ${F}_BITS ${f.bits}u`);
    lines.push(`#define ${F}_SIGNED ${f.signed ? 1 : 0}`);
    lines.push(`#define ${F}_LSB ${cNumber(f.lsb)}`);
    lines.push(`#define ${F}_MIN_CODE (${lo})`);
    lines.push(`#define ${F}_MAX_CODE (${hi})`, "");
  }
  const classIds = uniqueIdentifiers(
    m.classes.map((c) => classIdentifier(c.name)),
    takenClassIds(m.registerMap),
  );
  lines.push(`enum ${p}_class {`);
  m.classes.forEach((c, i) => lines.push(`  ${P}_CLASS_${classIds[i]} = ${i}, /* ${commentText(c.name)} */`));
  lines.push("};", "");
  lines.push("typedef struct {");
  for (const f of m.registerMap) lines.push(`  ${cType(f)} ${memberName(f.name)};`);
  lines.push(`} ${p}_setting_t;`, "");
  lines.push(`static const ${p}_setting_t ${p}_defaults[${P}_CLASS_COUNT] = {`);
  m.classes.forEach((c, i) => {
    lines.push(
      `  /* ${commentText(`${c.name}: ${c.channels.length} channels, worst limiter headroom ${(c.worstHeadroom_V * 1e3).toFixed(1)} mV`)} */`,
    );
    const members = m.registerMap.map((f) => `.${memberName(f.name)} = ${c.codes[f.name]}`).join(", ");
    lines.push(`  [${P}_CLASS_${classIds[i]}] = { ${members} },`);
  });
  lines.push("};", "", `#endif /* ${guard} */`, "");
  return lines.join("\n");
}

/** A class name as a C identifier, its comparisons spelled out: "Loss ≥ 16 dB" → LOSS_GE_16_DB, "Loss 12–20 dB" → LOSS_12_TO_20_DB. */
function classIdentifier(name: string): string {
  const spelled = name
    .replace(/≥|>=/g, " ge ")
    .replace(/≤|<=/g, " le ")
    .replace(/</g, " lt ")
    .replace(/>/g, " gt ")
    .replace(/[–—]/g, " to ");
  return slug(spelled, 32).toUpperCase();
}

/** Makes identifiers unique, also against `taken`: a repeat gets the first free suffix _2, _3, … */
function uniqueIdentifiers(ids: string[], taken: Iterable<string> = []): string[] {
  const used = new Set(taken);
  return ids.map((id) => {
    let out = id;
    for (let n = 2; used.has(out); n++) out = `${id}_${n}`;
    used.add(out);
    return out;
  });
}

/** C99 and C11 keywords, and the C23 ones a newer compiler reserves, in the lower case field names use. */
const C_KEYWORDS = new Set(
  (
    "auto break case char const continue default do double else enum extern float for goto if inline int long register restrict return " +
    "short signed sizeof static struct switch typedef union unsigned void volatile while alignas alignof bool constexpr false nullptr " +
    "static_assert thread_local true typeof typeof_unqual"
  ).split(" "),
);

/** A register field's name as a struct member: a C keyword gets a trailing underscore ("int" → "int_"). */
function memberName(name: string): string {
  return C_KEYWORDS.has(name) ? `${name}_` : name;
}

/**
 * Class enum names already spelled by other macros: `<P>_CLASS_<id>` must not equal `<P>_CLASS_COUNT`,
 * nor a field macro `<P>_<FIELD>_<suffix>` whose field name starts with "class_" (or is "class").
 */
function takenClassIds(fields: RegisterField[]): string[] {
  const taken = ["COUNT"];
  for (const f of fields) {
    for (const suffix of ["BITS", "SIGNED", "LSB", "MIN_CODE", "MAX_CODE"]) {
      const macro = `${f.name.toUpperCase()}_${suffix}`;
      if (macro.startsWith("CLASS_")) taken.push(macro.slice("CLASS_".length));
    }
  }
  return taken;
}

/** The export in one format. */
export function renderExport(m: ExportModel, format: ExportFormat): string {
  return format === "csv" ? toCsv(m) : format === "c" ? toCHeader(m) : toJson(m);
}
