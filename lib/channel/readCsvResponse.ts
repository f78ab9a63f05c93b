// Reader of sampled time responses in CSV form: time in seconds, voltage in volts.
import { CsvError, parse } from "csv-parse/sync";
import { InputFileError } from "./InputFileError.ts";
import { parseDecimal } from "./parseDecimal.ts";

/** A sampled time record. */
export interface SampledRecord {
  /** Sample times in seconds, strictly ascending. */
  readonly time_s: Float64Array;
  /** Sample values (volts; 1/s for an impulse response). */
  readonly values: Float64Array;
}

/** The field separator of a CSV text: comma, semicolon, or runs of spaces/tabs. */
export type CsvDelimiter = "," | ";" | "whitespace";

/** Most data rows accepted. */
export const CSV_MAX_ROWS = 1_000_000;

/** Picks the separator from the first line that is neither empty nor a `#` comment. */
export function detectCsvDelimiter(text: string): CsvDelimiter {
  for (const raw of text.split(/\r\n|\r|\n/)) {
    const line = raw.replace(/^\ufeff/, "").trim();
    if (line === "" || line.startsWith("#")) continue;
    if (line.includes(";")) return ";";
    if (line.includes(",")) return ",";
    return "whitespace";
  }
  return ",";
}

/**
 * Reads a two-column CSV of a time response. The separator is a comma, a semicolon or white
 * space (detected from the first line); one header line is allowed; `#` starts a comment line;
 * empty lines are skipped. Numbers use a decimal point.
 *
 * @param text - the file's text.
 * @returns sample times (s) and values.
 * @throws InputFileError naming the line: a value that is not a number (NaN and Infinity included),
 *   a row without exactly two values, times that do not ascend, fewer than two rows.
 */
export function readCsvResponse(text: string): SampledRecord {
  if (typeof text !== "string") throw new TypeError("text must be a string");
  const delimiter = detectCsvDelimiter(text);
  // One line ending throughout, so a stray CR never ends up inside a field; line numbers keep.
  const normalized = text.replace(/\r\n?/g, "\n");
  let rows: { record: string[]; info: { lines: number } }[];
  try {
    rows = parse(normalized, {
      delimiter: delimiter === "whitespace" ? [" ", "\t"] : delimiter,
      bom: true,
      comment: "#",
      skip_empty_lines: true,
      relax_column_count: true,
      trim: delimiter !== "whitespace",
      info: true,
      // csv-parse's typings do not follow `info: true`, which wraps each record as { record, info }.
    }) as unknown as { record: string[]; info: { lines: number } }[];
  } catch (e) {
    if (e instanceof CsvError) {
      const line = (e as CsvError & { lines?: number }).lines ?? 0;
      throw new InputFileError(line, `the CSV cannot be read (${e.message})`);
    }
    throw e;
  }
  const times: number[] = [];
  const values: number[] = [];
  for (let r = 0; r < rows.length; r++) {
    const { record, info } = rows[r];
    const fields = delimiter === "whitespace" ? record.filter((f) => f !== "") : record.map((f) => f.trim());
    if (fields.length === 0 || (fields.length === 1 && fields[0] === "")) continue;
    const nums = fields.map(parseDecimal);
    if (r === 0 && times.length === 0 && nums.some((v) => v === null)) continue; // header line
    const bad = nums.findIndex((v) => v === null);
    if (bad >= 0) throw new InputFileError(info.lines, `'${fields[bad]}' is not a number`);
    if (fields.length !== 2) {
      throw new InputFileError(info.lines, `expected 2 values (time in s, voltage in V), got ${fields.length}`);
    }
    const t = nums[0] as number;
    if (times.length > 0 && !(t > times[times.length - 1])) {
      throw new InputFileError(info.lines, `time ${t} s is not after the previous time ${times[times.length - 1]} s`);
    }
    if (times.length >= CSV_MAX_ROWS) throw new InputFileError(info.lines, `more than ${CSV_MAX_ROWS} rows`);
    times.push(t);
    values.push(nums[1] as number);
  }
  if (times.length < 2) throw new InputFileError(0, `the CSV holds ${times.length} data row(s); at least 2 are needed`);
  return { time_s: Float64Array.from(times), values: Float64Array.from(values) };
}
