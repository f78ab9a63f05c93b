// Engine I benchmarks: a 4-port Touchstone file of 4000 frequencies → pulse at 32 samples/UI, and
// ZF / MMSE of 15 taps over 200 cursors — each in-process and as a whole process (the command line
// spawned as a user would: `npm run --silent engine -- <command> < request.json`).
import { spawnSync } from "node:child_process";
import { fileURLToPath } from "node:url";
import { bench, describe } from "vitest";
import {
  channelTransfer,
  formatTouchstone,
  lossModelS21,
  parseTouchstone,
  pulseFromS21,
  pulseFromTouchstone,
  type NetworkData,
} from "@lib/channel";
import { runCommand } from "@lib/cli/runCommand";
import { seededRandom } from "@lib/signal";
import { mmseEqualizer, zeroForcing } from "@lib/solvers";

const root = fileURLToPath(new URL("../..", import.meta.url));
const UI = 1 / 25.78125e9;

/** A backplane-like 4-port: thrus 1→3 and 2→4 from the loss model, weak crosstalk and reflections. */
function backplane4000(): string {
  const n = 4000;
  const freqs = Float64Array.from({ length: n }, (_, i) => 10e6 * (i + 1)); // 10 MHz … 40 GHz
  const thru = lossModelS21(freqs, { lossAtNyquist_dB: 24, delay_s: 3e-9 }, 1 / (2 * UI));
  const s = new Float64Array(n * 16 * 2);
  const rng = seededRandom(42);
  for (let k = 0; k < n; k++) {
    for (let o = 0; o < 4; o++) {
      for (let i = 0; i < 4; i++) {
        const at = 2 * ((k * 4 + o) * 4 + i);
        const isThru = (o === 2 && i === 0) || (o === 0 && i === 2) || (o === 3 && i === 1) || (o === 1 && i === 3);
        if (isThru) {
          s[at] = thru.re[k];
          s[at + 1] = thru.im[k];
        } else {
          const level = o === i ? 0.05 : 0.005;
          s[at] = level * rng.normal();
          s[at + 1] = level * rng.normal();
        }
      }
    }
  }
  const net: NetworkData = { ports: 4, freqs_Hz: freqs, s, referenceOhms: new Float64Array(4).fill(50) };
  return formatTouchstone(net, {
    version: 1,
    format: "RI",
    unit: "GHz",
    comments: ["benchmark backplane, 24 dB at Nyquist"],
  });
}

const s4p = backplane4000();
const pulseRequest = JSON.stringify({
  source: { kind: "touchstone", text: s4p, format: "s4p" },
  ui_s: UI,
  samplesPerUi: 32,
});
const net = parseTouchstone(s4p, { ports: 4 });
const sdd = channelTransfer(net);

const rng = seededRandom(7);
const cursors = Float64Array.from(
  { length: 200 },
  (_, i) => (i === 20 ? 1 : i > 20 ? 0.45 * Math.exp(-(i - 20) / 6) : 0.02 * rng.normal()) + 0.002 * rng.normal(),
);
const solverRequest = { cursors: Array.from(cursors), main: 20, pre: 4, post: 10 };

/** Spawns the command line exactly as a user would and checks it answered. */
function engine(command: string, input: string): void {
  const r = spawnSync("npm", ["run", "--silent", "engine", "--", command], { cwd: root, input, maxBuffer: 1 << 28 });
  if (r.status !== 0) throw new Error(`engine ${command} exited ${r.status}: ${String(r.stdout).slice(0, 300)}`);
}

const whole = { iterations: 5, warmupIterations: 1, time: 0, warmupTime: 0 };

describe("4-port Touchstone (4000 frequencies) → pulse at 32 samples/UI", () => {
  bench("in-process: parse + SDD21 + pulse", () => {
    pulseFromTouchstone(s4p, { ui_s: UI, samplesPerUi: 32, ports: 4 });
  });
  bench("in-process: parse only (1.2 MB of text)", () => {
    parseTouchstone(s4p, { ports: 4 });
  });
  bench("in-process: SDD21 → pulse only (FFT of 131072)", () => {
    pulseFromS21(net.freqs_Hz, sdd, { ui_s: UI, samplesPerUi: 32 });
  });
  bench("in-process: runCommand('pulse') incl. JSON parse and serialization", () => {
    runCommand("pulse", pulseRequest);
  });
  bench("whole process: npm run --silent engine -- pulse", () => engine("pulse", pulseRequest), whole);
});

describe("ZF and MMSE, 15 taps over 200 cursors", () => {
  const h = { h: cursors, main: 20 };
  bench("in-process: zeroForcing", () => {
    zeroForcing(h, 4, 10);
  });
  bench("in-process: mmseEqualizer", () => {
    mmseEqualizer(h, 4, 10, 0.01);
  });
  bench("whole process: npm run --silent engine -- zf", () => engine("zf", JSON.stringify(solverRequest)), whole);
  bench(
    "whole process: npm run --silent engine -- mmse",
    () => engine("mmse", JSON.stringify({ ...solverRequest, noiseRms_V: 0.01 })),
    whole,
  );
  bench(
    "whole process baseline: npm run --silent engine -- ber (start-up cost)",
    () => engine("ber", '{"q": 7}'),
    whole,
  );
});
