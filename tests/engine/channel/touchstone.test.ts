// Touchstone reader and writer: the parse check, fixtures, version 2 keywords, errors that name the line.
import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { formatTouchstone, InputFileError, parseTouchstone, sParameter, type NetworkData } from "@lib/channel";

const fixture = (name: string) => readFileSync(new URL(`../fixtures/${name}`, import.meta.url), "utf8");
const at = (net: NetworkData, f: number, out: number, inp: number) => {
  const s = sParameter(net, out, inp);
  return [s.re[f], s.im[f]];
};
const errorOf = (fn: () => unknown): InputFileError => {
  try {
    fn();
  } catch (e) {
    if (e instanceof InputFileError) return e;
    throw e;
  }
  throw new Error("expected an InputFileError");
};

describe("parseTouchstone", () => {
  // [computed] from the Touchstone option line and the 2-port column order (IBIS Touchstone 2.0 spec).
  it("parse check: '# GHz S MA R 50' / '1.0 0.1 -30 0.9 -45 0.9 -45 0.2 -60' [computed, Touchstone spec]", () => {
    const net = parseTouchstone("# GHz S MA R 50\n1.0 0.1 -30 0.9 -45 0.9 -45 0.2 -60\n");
    expect(net.ports).toBe(2);
    expect(net.freqs_Hz[0]).toBe(1e9);
    const close = (v: number[], w: number[]) => v.forEach((x, i) => expect(Math.abs(x - w[i])).toBeLessThan(1e-6));
    close(at(net, 0, 1, 1), [0.086603, -0.05]);
    close(at(net, 0, 2, 1), [0.636396, -0.636396]);
    close(at(net, 0, 1, 2), [0.636396, -0.636396]);
    close(at(net, 0, 2, 2), [0.2 * Math.cos(-Math.PI / 3), 0.2 * Math.sin(-Math.PI / 3)]);
    expect(Array.from(net.referenceOhms)).toEqual([50, 50]);
  });

  it("defaults to GHz S MA R 50 without an option line; option tokens in any order and case", () => {
    const a = parseTouchstone("1 0.5 0 0.9 -90 0.9 -90 0.5 0\n");
    expect(a.freqs_Hz[0]).toBe(1e9);
    expect(at(a, 0, 2, 1)[1]).toBeCloseTo(-0.9, 12);
    const b = parseTouchstone("# r 75 ri khz S\n1 0.1 0.2\n");
    expect(b.ports).toBe(1);
    expect(b.freqs_Hz[0]).toBe(1e3);
    expect(b.referenceOhms[0]).toBe(75);
    expect(at(b, 0, 1, 1)).toEqual([0.1, 0.2]);
  });

  it("fixture: version 1 two-port in dB with comments, a blank line and noise data skipped", () => {
    const net = parseTouchstone(fixture("two-port-v1.s2p"));
    expect(net.ports).toBe(2);
    expect(Array.from(net.freqs_Hz)).toEqual([1e8, 5e8, 1e9, 2e9]);
    const [re, im] = at(net, 2, 2, 1); // −3 dB at −360°
    expect(re).toBeCloseTo(10 ** (-3 / 20), 12);
    expect(Math.abs(im)).toBeLessThan(1e-12);
    expect(Math.hypot(...at(net, 0, 1, 1))).toBeCloseTo(10 ** (-30 / 20), 12);
  });

  it("fixture: version 2 four-port with [Reference] over two lines and an information block", () => {
    const net = parseTouchstone(fixture("four-port-v2.s4p"), { ports: 4 });
    expect(net.ports).toBe(4);
    expect(Array.from(net.freqs_Hz)).toEqual([1e7, 5e9, 1e10]);
    expect(at(net, 1, 3, 1)).toEqual([0.5, -0.6]);
    expect(at(net, 1, 1, 3)).toEqual([0.5, -0.6]);
    expect(at(net, 2, 4, 2)).toEqual([-0.3, -0.4]);
    expect(Array.from(net.referenceOhms)).toEqual([50, 50, 50, 50]);
  });

  it("version 1 three- and four-port files: one matrix row per line; port count inferred", () => {
    const rows = (f: number, n: number) =>
      Array.from(
        { length: n },
        (_, r) => (r === 0 ? `${f} ` : "  ") + Array.from({ length: n }, (_, c) => `${r + 1}.${c + 1} ${f}`).join(" "),
      ).join("\n");
    for (const n of [3, 4]) {
      const net = parseTouchstone(`# GHz S RI R 50\n${rows(1, n)}\n${rows(2, n)}\n`);
      expect(net.ports).toBe(n);
      expect(at(net, 1, n, 1)).toEqual([Number(`${n}.1`), 2]);
      expect(at(net, 0, 1, n)).toEqual([Number(`1.${n}`), 1]);
    }
  });

  it("version 1 files of five ports wrap rows at four pairs", () => {
    const n = 5;
    const net: NetworkData = {
      ports: n,
      freqs_Hz: Float64Array.of(1e9, 2e9),
      s: Float64Array.from({ length: 2 * n * n * 2 }, (_, i) => i / 100),
      referenceOhms: new Float64Array(n).fill(50),
    };
    const text = formatTouchstone(net);
    expect(text.split("\n")[1].trim().split(/\s+/).length).toBe(9); // f + 4 pairs
    expect(text.split("\n")[2].trim().split(/\s+/).length).toBe(2); // the fifth pair
    const back = parseTouchstone(text);
    expect(Array.from(back.s)).toEqual(Array.from(net.s));
  });

  it("version 2: [Two-Port Data Order] 12_21 and lower/upper matrix formats", () => {
    const head = "[Version] 2.0\n# Hz S RI\n[Number of Ports] 2\n";
    const a = parseTouchstone(
      `${head}[Two-Port Data Order] 12_21\n[Number of Frequencies] 1\n[Network Data]\n5 11 0 12 0 21 0 22 0\n[End]\n`,
    );
    expect(at(a, 0, 1, 2)[0]).toBe(12);
    expect(at(a, 0, 2, 1)[0]).toBe(21);
    const b = parseTouchstone(
      `${head}[Two-Port Data Order] 21_12\n[Number of Frequencies] 1\n[Network Data]\n5 11 0 21 0 12 0 22 0\n[End]\n`,
    );
    expect(at(b, 0, 1, 2)[0]).toBe(12);
    const lower = parseTouchstone(
      "[Version] 2.0\n# GHz S RI\n[Number of Ports] 3\n[Number of Frequencies] 1\n[Matrix Format] Lower\n[Network Data]\n1 11 0\n21 0 22 0\n31 0 32 0 33 0\n[End]\n",
    );
    expect(at(lower, 0, 1, 3)[0]).toBe(31);
    expect(at(lower, 0, 3, 2)[0]).toBe(32);
    const upper = parseTouchstone(
      "[Version] 2.0\n# GHz S RI\n[Number of Ports] 3\n[Number of Frequencies] 1\n[Matrix Format] Upper\n[Network Data]\n1 11 0 12 0 13 0\n22 0 23 0\n33 0\n[End]\n",
    );
    expect(at(upper, 0, 3, 1)[0]).toBe(13);
    expect(at(upper, 0, 2, 3)[0]).toBe(23);
  });

  it.each([
    ["1 0.1 0 0.9 0 0.9 0 0.1 0\n0.5 0.1 0 0.9 0 0.9 0 0.1 0\n", 2, /frequencies must ascend/],
    ["1 0.1 0 0.9 0 0.9 0 0.1 0\n2 0.1 0 0.9 0 0.9 0 0.1\n", 1, /lines 1–2\) has 8 value pairs/],
    [
      "# GHz S RI\n1 0.1 0 0.9 0 0.9 0 0.1 0\n2 0.1 0 0.9 0 0.9 0 0.1 0\n3 0.1 0 0.9 0 0.9 0\n",
      4,
      /7 values; 9 are expected/,
    ],
    ["1 0.1 0 0.9 0 NaN 0 0.1 0\n", 1, /'NaN' is not a number/],
    ["1 0.1 0 0.9 0 Infinity 0 0.1 0\n", 1, /'Infinity' is not a number/],
    ["# GHz S XX R 50\n1 0 0\n", 1, /unknown option 'XX'/],
    ["# GHz Y MA R 50\n1 0 0\n", 1, /only S-parameter/],
    ["# GHz S MA R\n1 0 0\n", 1, /positive resistance/],
    ["1 0 0 0 0 0 0\n", 1, /3 value pairs, and an N-port has N²/],
    ["1 0 0 0 0\n2 0 0 0 0\n", 1, /2 value pairs/],
    ["-1 0 0\n", 1, /negative/],
    ["1 0 0 0 0 0 0 0 0\n0 0\n2 0 0\n", 1, /has 5 value pairs/],
    ["! nothing\n", 0, /no network data/],
    ["[Number of Ports] 2\n", 1, /without \[Version\] 2.0/],
    ["[Version] 3.0\n", 1, /unsupported \[Version\]/],
    [
      "[Version] 2.0\n# GHz S RI\n[Number of Ports] 2\n[Number of Frequencies] 1\n[Network Data]\n1 0 0 0 0 0 0 0 0\n[End]\n",
      5,
      /Two-Port Data Order/,
    ],
    [
      "[Version] 2.0\n# GHz S RI\n[Number of Ports] 1\n[Number of Frequencies] 2\n[Network Data]\n1 0 0\n[End]\n",
      7,
      /says 2 but the file holds 1/,
    ],
    [
      "[Version] 2.0\n# GHz S RI\n[Number of Ports] 1\n[Number of Frequencies] 1\n[Network Data]\n1 0 0\n",
      6,
      /must end with \[End\]/,
    ],
    ["[Version] 2.0\n# GHz S RI\n[Number of Ports] 1\n[Frobnicate] 1\n", 4, /unknown keyword \[Frobnicate\]/],
    ["[Version] 2.0\n# GHz S RI\n[Number of Ports] 1\n1 0 0\n", 4, /outside \[Network Data\]/],
    ["[Version] 2.0\n# GHz S RI\n[Number of Ports] 4\n[Mixed-Mode Order] D2,1 D1,2\n", 4, /mixed-mode/],
    ["1 0 0\n# GHz S RI R 50\n", 2, /option line must come before/],
  ])("errors name the line: %j → line %i", (text, line, message) => {
    const e = errorOf(() => parseTouchstone(text));
    expect(e.line).toBe(line);
    expect(e.message).toMatch(message);
    if (line > 0) expect(e.message).toMatch(new RegExp(`^line ${line}: `));
  });

  it("edges: the ports option must agree with [Number of Ports]; bad ports option; CRLF and BOM", () => {
    const v2 =
      "[Version] 2.0\n# GHz S RI\n[Number of Ports] 1\n[Number of Frequencies] 1\n[Network Data]\n1 0.5 0\n[End]\n";
    expect(() => parseTouchstone(v2, { ports: 2 })).toThrow(/disagrees/);
    expect(() => parseTouchstone(v2, { ports: 0 })).toThrow(/ports must be/);
    const crlf = parseTouchstone("\ufeff# GHz S RI R 50\r\n1 0.5 0\r\n2 0.4 0\r\n");
    expect(Array.from(crlf.freqs_Hz)).toEqual([1e9, 2e9]);
    // With the port count given, a 2-port's values may wrap over lines.
    const wrapped = parseTouchstone("# GHz S RI\n1 0.1 0 0.9 0\n 0.9 0 0.1 0\n", { ports: 2 });
    expect(at(wrapped, 0, 2, 2)[0]).toBe(0.1);
    const e = errorOf(() => parseTouchstone("1 0 0\n2 0 0 0\n", { ports: 1 }));
    expect(e.message).toMatch(/^line 2: too many values/);
  });
});

describe("formatTouchstone", () => {
  it("analytic: writes the 2-port order N11 N21 N12 N22 in version 1 and the keywords in version 2", () => {
    const net: NetworkData = {
      ports: 2,
      freqs_Hz: Float64Array.of(1e9),
      s: Float64Array.of(11, 0, 12, 0, 21, 0, 22, 0),
      referenceOhms: Float64Array.of(50, 50),
    };
    expect(formatTouchstone(net, { comments: ["made by a test"] })).toBe(
      "! made by a test\n# GHz S RI R 50\n1 11 0 21 0 12 0 22 0\n",
    );
    const v2 = formatTouchstone(net, { version: 2, unit: "MHz" });
    expect(v2).toContain("[Two-Port Data Order] 12_21");
    expect(v2).toContain("1000 11 0 12 0 21 0 22 0");
    expect(v2.trim().endsWith("[End]")).toBe(true);
    expect(() => formatTouchstone({ ...net, s: new Float64Array(3) })).toThrow(/net.s/);
  });
});
