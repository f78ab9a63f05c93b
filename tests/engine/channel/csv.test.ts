// CSV reader of sampled responses: separators, header, comments, errors by line, property tests.
import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { detectCsvDelimiter, InputFileError, readCsvResponse } from "@lib/channel";

const fixture = (name: string) => readFileSync(new URL(`../fixtures/${name}`, import.meta.url), "utf8");

describe("readCsvResponse", () => {
  it("analytic: comma, semicolon and whitespace separated files with a header and comments", () => {
    const a = readCsvResponse("time,voltage\n0,0.1\n1e-12,0.2\n");
    expect(Array.from(a.time_s)).toEqual([0, 1e-12]);
    expect(Array.from(a.values)).toEqual([0.1, 0.2]);
    const b = readCsvResponse("# probe 3\n0 ; 1\n2e-12 ; -0.5\n");
    expect(Array.from(b.values)).toEqual([1, -0.5]);
    const c = readCsvResponse("  0\t\t 5\n\n1   6  \r\n2 7\r\n");
    expect(Array.from(c.time_s)).toEqual([0, 1, 2]);
    expect(Array.from(c.values)).toEqual([5, 6, 7]);
    expect(detectCsvDelimiter("# x\n\n1;2")).toBe(";");
    expect(detectCsvDelimiter("1,2")).toBe(",");
    expect(detectCsvDelimiter("1 2")).toBe("whitespace");
  });

  it("fixture: a semicolon step response with a header", () => {
    const r = readCsvResponse(fixture("step-semicolon.csv"));
    expect(r.time_s.length).toBe(9);
    expect(r.values[8]).toBe(1);
  });

  it.each([
    ["t,v\n0,1\n1,x\n", 3, /'x' is not a number/],
    ["0,1\n1,NaN\n", 2, /'NaN' is not a number/],
    ["0,1\n1,Infinity\n", 2, /'Infinity' is not a number/],
    ["0,1\n1,2,3\n", 2, /expected 2 values/],
    ["0,1\n1\n", 2, /expected 2 values/],
    ["0,1\n0,2\n", 2, /not after the previous/],
    ["0,1\n-1,2\n", 2, /not after the previous/],
    ["time,v\n", 0, /at least 2/],
    ["0,1\n", 0, /at least 2/],
    ['0,"1\n1,2\n', 2, /cannot be read \(Quote Not Closed/], // csv-parse reports where the open quote ran out
  ])("errors name the line: %j → line %i", (text, line, message) => {
    let err: unknown;
    try {
      readCsvResponse(text);
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(InputFileError);
    expect((err as InputFileError).line).toBe(line);
    expect((err as InputFileError).message).toMatch(message);
  });

  it("edges: a second non-numeric line is an error, not a header; BOM is ignored", () => {
    expect(() => readCsvResponse("a,b\nc,d\n0,1\n1,2\n")).toThrow(/line 2: 'c' is not a number/);
    expect(Array.from(readCsvResponse("\ufefft,v\n0,1\n1,2\n").values)).toEqual([1, 2]);
  });
});

describe("readCsvResponse properties (fast-check, seeds fixed)", () => {
  const rowsArb = fc
    .array(
      fc.tuple(
        fc.double({ min: 1e-15, max: 1e-9, noNaN: true }),
        fc.double({ min: -10, max: 10, noNaN: true, noDefaultInfinity: true }),
      ),
      { minLength: 2, maxLength: 40 },
    )
    .map((pairs) => {
      let t = 0;
      return pairs.map(([dt, v]) => {
        t += dt;
        return [t, v] as const;
      });
    });

  it("random valid files round-trip with every separator, header, comments and line ending", () => {
    fc.assert(
      fc.property(
        rowsArb,
        fc.constantFrom(",", ";", " ", "\t", "   ", " , "),
        fc.boolean(),
        fc.boolean(),
        fc.constantFrom("\n", "\r\n"),
        (rows, sep, header, comment, eol) => {
          const lines = rows.map(([t, v]) => `${t}${sep}${v}`);
          if (header) lines.unshift(`time_s${sep.trim() || sep}voltage_V`);
          if (comment) lines.unshift("# written by a property test");
          const r = readCsvResponse(lines.join(eol) + eol);
          expect(Array.from(r.time_s)).toEqual(rows.map(([t]) => t));
          expect(r.values.length).toBe(rows.length);
          r.values.forEach((v, i) => expect(v === rows[i][1]).toBe(true)); // −0 reads back as 0
        },
      ),
      { seed: 31, numRuns: 300 },
    );
  });

  it("random garbage never crashes: a result or an InputFileError with a message", () => {
    const cell = fc.oneof(
      fc.double().map(String),
      fc.string({ maxLength: 5 }),
      fc.constantFrom("NaN", '"', "#", ";", ","),
    );
    const line = fc
      .array(cell, { maxLength: 4 })
      .chain((cells) => fc.constantFrom(",", ";", " ").map((s) => cells.join(s)));
    fc.assert(
      fc.property(fc.array(line, { maxLength: 10 }), (lines) => {
        try {
          readCsvResponse(lines.join("\n"));
        } catch (e) {
          expect(e).toBeInstanceOf(InputFileError);
          expect((e as Error).message.length).toBeGreaterThan(10);
        }
      }),
      { seed: 32, numRuns: 500 },
    );
    fc.assert(
      fc.property(fc.string({ maxLength: 200 }), (text) => {
        try {
          readCsvResponse(text);
        } catch (e) {
          expect(e).toBeInstanceOf(InputFileError);
        }
      }),
      { seed: 33, numRuns: 500 },
    );
  });
});
