// Property tests of the Touchstone reader: random valid files round-trip; garbage gives a clear error.
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { formatTouchstone, InputFileError, parseTouchstone, type NetworkData } from "@lib/channel";

const networkArb = fc
  .record({
    ports: fc.constantFrom(1, 2, 3, 4, 5, 6),
    count: fc.integer({ min: 1, max: 6 }),
    start: fc.double({ min: 0, max: 1e9, noNaN: true }),
    steps: fc.array(fc.double({ min: 1e3, max: 1e9, noNaN: true }), { minLength: 6, maxLength: 6 }),
    ohms: fc.double({ min: 1, max: 200, noNaN: true }),
  })
  .chain(({ ports, count, start, steps, ohms }) =>
    fc
      .array(fc.double({ min: -2, max: 2, noNaN: true, noDefaultInfinity: true }), {
        minLength: count * ports * ports * 2,
        maxLength: count * ports * ports * 2,
      })
      .map((vals): NetworkData => {
        const freqs = new Float64Array(count);
        let f = start;
        for (let i = 0; i < count; i++) {
          freqs[i] = f;
          f += steps[i];
        }
        return {
          ports,
          freqs_Hz: freqs,
          s: Float64Array.from(vals),
          referenceOhms: new Float64Array(ports).fill(ohms),
        };
      }),
  );

const optionsArb = fc.record({
  version: fc.constantFrom(1 as const, 2 as const),
  format: fc.constantFrom("RI" as const, "MA" as const, "DB" as const),
  unit: fc.constantFrom("Hz" as const, "kHz" as const, "MHz" as const, "GHz" as const),
  twoPortOrder: fc.constantFrom("12_21" as const, "21_12" as const),
});

describe("Touchstone round trip and garbage (fast-check, seeds fixed)", () => {
  it("random valid files round-trip: write → read gives the same network (RI exact; MA/DB to 1e-9)", () => {
    fc.assert(
      fc.property(networkArb, optionsArb, fc.boolean(), (net, opts, tellPorts) => {
        const text = formatTouchstone(net, opts);
        const back = parseTouchstone(text, tellPorts ? { ports: net.ports } : {});
        expect(back.ports).toBe(net.ports);
        for (let i = 0; i < net.freqs_Hz.length; i++) {
          expect(Math.abs(back.freqs_Hz[i] - net.freqs_Hz[i])).toBeLessThanOrEqual(
            1e-12 * Math.max(1, net.freqs_Hz[i]),
          );
        }
        for (let i = 0; i < net.s.length; i++) {
          if (opts.format === "RI")
            expect(back.s[i] === net.s[i]).toBe(true); // −0 reads back as 0
          else expect(Math.abs(back.s[i] - net.s[i])).toBeLessThan(1e-9);
        }
        expect(back.referenceOhms[0]).toBe(net.referenceOhms[0]);
      }),
      { seed: 20261201, numRuns: 300 },
    );
  }, 30_000); // 300 files checked value by value take seconds (more on a busy machine): not a speed check

  const isClearError = (e: unknown) =>
    e instanceof InputFileError && e.message.length > 10 && (e.line === 0 || e.message.startsWith(`line ${e.line}: `));

  it("random text never crashes: it parses or gives an InputFileError naming the line", () => {
    const token = fc.oneof(
      fc.constantFrom(
        "#",
        "!",
        "[Version]",
        "2.0",
        "[End]",
        "[Network Data]",
        "GHz",
        "S",
        "RI",
        "MA",
        "R",
        "50",
        "NaN",
        "1e999",
        "-",
      ),
      fc.double({ noNaN: false }).map(String),
      fc.string({ maxLength: 4 }),
    );
    const line = fc.array(token, { maxLength: 10 }).map((t) => t.join(" "));
    fc.assert(
      fc.property(fc.array(line, { maxLength: 12 }), (lines) => {
        try {
          parseTouchstone(lines.join("\n"));
        } catch (e) {
          expect(isClearError(e)).toBe(true);
        }
      }),
      { seed: 7, numRuns: 500 },
    );
    fc.assert(
      fc.property(fc.string({ maxLength: 300 }), (text) => {
        try {
          parseTouchstone(text);
        } catch (e) {
          expect(isClearError(e)).toBe(true);
        }
      }),
      { seed: 8, numRuns: 500 },
    );
  });

  it("damaged valid files (a token dropped, garbage inserted, lines swapped) give a parse or a clear error", () => {
    fc.assert(
      fc.property(
        networkArb,
        optionsArb,
        fc.nat(),
        fc.constantFrom("drop", "insert", "swap"),
        fc.string({ maxLength: 5 }),
        (net, opts, where, how, junk) => {
          const tokens = formatTouchstone(net, opts).split(/(\s+)/);
          const lines = formatTouchstone(net, opts).split("\n");
          let text: string;
          if (how === "drop") {
            tokens.splice(where % tokens.length, 1);
            text = tokens.join("");
          } else if (how === "insert") {
            tokens.splice(where % tokens.length, 0, ` ${junk} `);
            text = tokens.join("");
          } else {
            const i = where % lines.length;
            const j = (where * 7 + 3) % lines.length;
            [lines[i], lines[j]] = [lines[j], lines[i]];
            text = lines.join("\n");
          }
          try {
            parseTouchstone(text);
          } catch (e) {
            expect(isClearError(e)).toBe(true);
          }
        },
      ),
      { seed: 9, numRuns: 500 },
    );
  });
});
