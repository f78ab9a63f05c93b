// Bad input: every kind exits 2 with a message and the field's path, in-process and in a real process.
import { spawn } from "node:child_process";
import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { runCommand } from "@lib/cli/runCommand";

const root = fileURLToPath(new URL("../../..", import.meta.url));
const fixture = (name: string) => readFileSync(new URL(`../fixtures/${name}`, import.meta.url), "utf8");
const UI = 4e-11;

const bad = (command: string | undefined, input: string) => {
  const r = runCommand(command, input);
  expect(r.exitCode).toBe(2);
  const body = JSON.parse(r.text);
  expect(Object.keys(body)).toEqual(["error"]);
  expect(typeof body.error.message).toBe("string");
  expect(body.error.message.length).toBeGreaterThan(5);
  expect(body.error.message).not.toMatch(/\n\s+at /); // never a stack trace
  expect(typeof body.error.path).toBe("string");
  return body.error as { message: string; path: string };
};

describe("bad input exits 2 with { error: { message, path } }", () => {
  it.each([
    ["no command", undefined, "{}", "command", /give a command/],
    ["unknown command", "optimise", "{}", "command", /unknown command 'optimise'/],
    ["invalid JSON", "ber", "{q: 1}", "", /not valid JSON/],
    ["empty request", "ber", "", "", /request is empty/],
    ["not an object", "zf", "[1, 2]", "", /expected object/],
    ["Infinity (1e999)", "ber", '{"q": 1e999}', "q", /finite number|Infinity/],
    ["NaN literal", "ber", '{"q": NaN}', "", /not valid JSON/],
    ["wrong type", "mmse", '{"cursors": "1,2", "main": 0, "pre": 0, "post": 0, "noiseRms_V": 0}', "cursors", /array/],
    [
      "non-finite inside an array",
      "zf",
      '{"cursors": [1, 1e999], "main": 0, "pre": 0, "post": 0}',
      "cursors.1",
      /finite/,
    ],
    [
      "missing field",
      "mmse",
      '{"cursors": [1], "main": 0, "pre": 0, "post": 0}',
      "noiseRms_V",
      /noiseRms_V: this field is required/,
    ],
    [
      "missing nested field",
      "pulse",
      '{"source": {"kind": "csv"}, "ui_s": 1e-10, "samplesPerUi": 8}',
      "source.response",
      /required/,
    ],
    ["out-of-range index", "zf", '{"cursors": [1, 0.5], "main": 2, "pre": 0, "post": 1}', "main", /outside cursors/],
    ["fractional index", "zf", '{"cursors": [1, 0.5], "main": 0.5, "pre": 0, "post": 1}', "main", /integer/],
    [
      "pre leaves no main tap",
      "fir-response",
      '{"taps": [1], "pre": 1, "ui_s": 1e-10, "freqs_Hz": [0]}',
      "pre",
      /no main tap/,
    ],
    [
      "negative frequency",
      "fir-response",
      '{"taps": [1], "pre": 0, "ui_s": 1e-10, "freqs_Hz": [-1]}',
      "freqs_Hz.0",
      /≥ 0/,
    ],
    [
      "CTLE low-frequency stage without corner",
      "ctle-response",
      '{"gDc_dB": 0, "fz_Hz": 1, "fp1_Hz": 1, "fp2_Hz": 1, "gDc2_dB": -3, "freqs_Hz": [0]}',
      "fLf_Hz",
      /fLf_Hz/,
    ],
    ["singular zero forcing", "zf", '{"cursors": [0, 0, 0], "main": 1, "pre": 1, "post": 1}', "cursors", /singular/],
    [
      "diverging LMS",
      "lms",
      '{"cursors": [1, 0.5], "main": 0, "pre": 0, "post": 2, "noiseRms_V": 0, "mu": 10, "iterations": 500, "seed": 1, "variant": "lms"}',
      "mu",
      /diverge/,
    ],
    [
      "unknown variant",
      "lms",
      '{"cursors": [1], "main": 0, "pre": 0, "post": 0, "noiseRms_V": 0, "mu": 0.1, "iterations": 5, "seed": 1, "variant": "rls"}',
      "variant",
      /sign-sign/,
    ],
    ["PRBS order", "prbs", '{"order": 8, "length": 10}', "order", /7, 9, 11/],
    ["ber and q together", "ber", '{"q": 1, "ber": 0.1}', "", /exactly one/],
    ["BER out of range", "ber", '{"ber": 1.5}', "ber", /below 1/],
    [
      "unknown source kind",
      "pulse",
      '{"source": {"kind": "scope"}, "ui_s": 1e-10, "samplesPerUi": 8}',
      "source.kind",
      /samples/,
    ],
    [
      "samplesPerUi too large",
      "pulse",
      '{"source": {"kind": "loss-model", "lossAtNyquist_dB": 10}, "ui_s": 1e-10, "samplesPerUi": 5000}',
      "samplesPerUi",
      /1024/,
    ],
    [
      "same port twice",
      "pulse",
      '{"source": {"kind": "touchstone", "text": "1 0 0", "pairs": {"inP": 1, "inN": 1, "outP": 3, "outN": 4}}, "ui_s": 1e-10, "samplesPerUi": 8}',
      "source.pairs",
      /four different/,
    ],
  ])("%s", (_, command, input, path, message) => {
    const e = bad(command, input);
    expect(e.path).toBe(path);
    expect(e.message).toMatch(message);
  });

  it("malformed files inside a request name the line, at path source.text", () => {
    const ts = bad(
      "pulse",
      JSON.stringify({
        source: { kind: "touchstone", text: "# GHz S RI\n1 0.1 0 0.9 0 0.9 0 0.1 0\n0.5 0.1 0 0.9 0 0.9 0 0.1 0\n" },
        ui_s: UI,
        samplesPerUi: 8,
      }),
    );
    expect(ts.path).toBe("source.text");
    expect(ts.message).toMatch(/^line 3: frequencies must ascend/);
    const csv = bad(
      "pulse",
      JSON.stringify({
        source: { kind: "csv", response: "pulse", text: "t,v\n0,1\n1e-12,oops\n" },
        ui_s: UI,
        samplesPerUi: 8,
      }),
    );
    expect(csv.path).toBe("source.text");
    expect(csv.message).toMatch(/^line 3: 'oops' is not a number/);
    const ports = bad(
      "pulse",
      JSON.stringify({
        source: { kind: "touchstone", text: fixture("four-port-v2.s4p"), pairs: { inP: 1, inN: 2, outP: 3, outN: 9 } },
        ui_s: UI,
        samplesPerUi: 8,
      }),
    );
    expect(ports.path).toBe("source.pairs.outN");
    const threePort = bad(
      "pulse",
      JSON.stringify({
        source: {
          kind: "touchstone",
          text: "# GHz S RI\n1 1 0 1 0 1 0\n 1 0 1 0 1 0\n 1 0 1 0 1 0\n2 1 0 1 0 1 0\n 1 0 1 0 1 0\n 1 0 1 0 1 0\n",
        },
        ui_s: UI,
        samplesPerUi: 8,
      }),
    );
    expect(threePort.path).toBe("source");
    expect(threePort.message).toMatch(/3 port/);
  });
});

/** Runs the command line as a user would: `npm run --silent engine -- <command> < request`. */
function engine(command: string, input: string): Promise<{ code: number | null; stdout: string; stderr: string }> {
  return new Promise((resolve, reject) => {
    const child = spawn("npm", ["run", "--silent", "engine", "--", command], {
      cwd: root,
      stdio: ["pipe", "pipe", "pipe"],
    });
    let stdout = "";
    let stderr = "";
    child.stdout.on("data", (d) => (stdout += d));
    child.stderr.on("data", (d) => (stderr += d));
    child.on("error", reject);
    child.on("close", (code) => resolve({ code, stdout, stderr }));
    child.stdin.end(input);
  });
}

describe("through a real child process", () => {
  it(
    "answers with exit 0 and refuses with exit 2, printing one JSON document and no stack trace",
    { timeout: 120_000 },
    async () => {
      const [prbs, zf, unknown, nan, touchstone, garbage] = await Promise.all([
        engine("prbs", '{"order": 7, "length": 16}'),
        engine("zf", '{"cursors": [0.0, 0.2, 0.9, -0.3, 0.1], "main": 9, "pre": 1, "post": 1}'),
        engine("frobnicate", "{}"),
        engine("ber", '{"q": 1e999}'),
        engine(
          "pulse",
          JSON.stringify({
            source: { kind: "touchstone", text: fixture("four-port-v2.s4p"), format: "s4p" },
            ui_s: UI,
            samplesPerUi: 8,
          }),
        ),
        engine(
          "pulse",
          JSON.stringify({
            source: { kind: "touchstone", text: "# GHz S RI R 50\n1 0 zero\n" },
            ui_s: UI,
            samplesPerUi: 8,
          }),
        ),
      ]);
      expect(prbs.code).toBe(0);
      expect(JSON.parse(prbs.stdout)).toEqual({ bits: "1111111000000100" });
      expect(zf.code).toBe(2);
      expect(JSON.parse(zf.stdout).error.path).toBe("main");
      expect(unknown.code).toBe(2);
      expect(JSON.parse(unknown.stdout).error.path).toBe("command");
      expect(nan.code).toBe(2);
      expect(JSON.parse(nan.stdout).error.path).toBe("q");
      expect(touchstone.code).toBe(0);
      const pulse = JSON.parse(touchstone.stdout);
      expect(pulse.values_V.length).toBeGreaterThan(10);
      expect(pulse.insertionLoss.freqs_Hz).toEqual([1e7, 5e9, 1e10]);
      expect(garbage.code).toBe(2);
      expect(JSON.parse(garbage.stdout).error).toEqual({
        message: "line 2: 'zero' is not a number",
        path: "source.text",
      });
      for (const r of [prbs, zf, unknown, nan, touchstone, garbage]) {
        expect(r.stdout.trim().split("\n").length).toBe(1);
        expect(r.stdout + r.stderr).not.toMatch(/\n\s+at /);
      }
    },
  );
});
