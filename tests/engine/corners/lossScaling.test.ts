// Loss corners: the insertion loss in dB times s at every frequency, for Touchstone data (S21 scaled
// with a minimum-phase change), for synthetic lines (the model rebuilt) and for sampled pulses (the
// loss read off the pulse's spectrum) — each checked against the others.
import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import {
  channelTransfer,
  formatTouchstone,
  lossModelS21,
  parseTouchstone,
  pulseFromLossModel,
  pulseFromS21,
} from "@lib/channel";
import { cornerPulses, lossScaledPulse, lossScaledS21, PULSE_LOSS_BAND_BAUD } from "@lib/corners";
import { cursorsAt, pulseArea } from "@lib/pulse";
import { createFftPlan, nextPowerOfTwo } from "@lib/signal";
import type { Pulse } from "@lib/types";

const baud = 28e9;
const ui = 1 / baud;
const fN = baud / 2;
const grid = { ui_s: ui, samplesPerUi: 32 };
/** Each check builds several pulses through FFTs of 2^15–2^17 points: generous under a loaded machine. */
const SLOW = 30_000;
const freqs = Float64Array.from({ length: 2000 }, (_, i) => 10e6 + i * 25e6);
const dB = (re: number, im: number) => 20 * Math.log10(Math.hypot(re, im));
const line = (loss: number) => ({ lossAtNyquist_dB: loss, delay_s: 1e-9 });

/** Symbol-spaced cursors around the main one (2 before, 8 after). */
const cursors = (p: Pulse) => cursorsAt(p, p.mainIndex, 2, 8).h;
/** Largest cursor difference as a fraction of the first pulse's main cursor. */
const cursorGap = (a: Pulse, b: Pulse) => {
  const ca = cursors(a);
  const cb = cursors(b);
  return ca.reduce((m, v, i) => Math.max(m, Math.abs(v - cb[i])), 0) / ca[2];
};

/** The channel's loss in dB read off a pulse at the FFT bins within the band (the one-UI rectangle divided out). */
function pulseLoss_dB(p: Pulse, size: number): Float64Array {
  const P = createFftPlan(size).realForward(p.values_V);
  const dt = p.ui_s / p.samplesPerUi;
  const df = 1 / (size * dt);
  const band = Math.floor(PULSE_LOSS_BAND_BAUD / p.ui_s / df);
  return Float64Array.from({ length: band + 1 }, (_, k) => {
    const x = k * df * p.ui_s;
    const sinc = x === 0 ? 1 : Math.sin(Math.PI * x) / (Math.PI * x);
    return -20 * Math.log10((Math.hypot(P.re[k], P.im[k]) * dt) / (p.ui_s * Math.abs(sinc)));
  });
}

describe("lossScaledS21", () => {
  it(
    "analytic: the insertion loss in dB is multiplied by s at every data frequency (tol 1e-9 dB)",
    () => {
      const text = readFileSync(new URL("../fixtures/two-port-v1.s2p", import.meta.url), "utf8");
      const net = parseTouchstone(text, { ports: 2 });
      const data = [
        { f: freqs, h: lossModelS21(freqs, { lossAtNyquist_dB: 25, delay_s: 2e-9 }, fN) },
        { f: net.freqs_Hz, h: channelTransfer(net) },
      ];
      for (const { f, h } of data) {
        for (const s of [0.5, 0.9, 1.1, 2]) {
          const hs = lossScaledS21(f, h, s);
          for (let i = 0; i < f.length; i++)
            expect(Math.abs(dB(hs.re[i], hs.im[i]) - s * dB(h.re[i], h.im[i]))).toBeLessThan(1e-9);
        }
      }
    },
    SLOW,
  );

  it(
    "oracle: scaling a synthetic line's S21 by s gives the line built with s × its loss (pulse cursors within 2 % of the main)",
    () => {
      for (const [loss, s] of [
        [20, 1.2],
        [20, 0.8],
        [30, 1.1],
        [10, 1.5],
      ]) {
        const scaled = pulseFromS21(freqs, lossScaledS21(freqs, lossModelS21(freqs, line(loss), fN), s), grid).pulse;
        const rebuilt = pulseFromLossModel(line(loss * s), grid).pulse;
        expect(cursorGap(rebuilt, scaled)).toBeLessThan(0.02);
      }
    },
    SLOW,
  );

  it(
    "identities: s = 1 is a copy; the delay is kept (the main cursor arrives within 3 UI of the nominal one)",
    () => {
      const h = lossModelS21(freqs, line(20), fN);
      const same = lossScaledS21(freqs, h, 1);
      expect(Array.from(same.re)).toEqual(Array.from(h.re));
      expect(same.re).not.toBe(h.re);
      const nominal = pulseFromS21(freqs, h, grid);
      const lossier = pulseFromS21(freqs, lossScaledS21(freqs, h, 1.3), grid);
      const t = (r: typeof nominal) => r.start_s + (r.pulse.mainIndex * ui) / 32;
      expect(Math.abs(t(lossier) - t(nominal))).toBeLessThan(3 * ui);
    },
    SLOW,
  );

  it(
    "edges: refuses a factor ≤ 0, mismatched lengths and descending frequencies, naming them",
    () => {
      const h = lossModelS21(freqs, line(20), fN);
      expect(() => lossScaledS21(freqs, h, 0)).toThrow(/lossScale/);
      expect(() => lossScaledS21(freqs, h, Number.NaN)).toThrow(/lossScale/);
      expect(() => lossScaledS21(freqs.subarray(0, 10), h, 1.1)).toThrow(/s21/);
      expect(() =>
        lossScaledS21(Float64Array.of(2, 1), { re: Float64Array.of(1, 1), im: Float64Array.of(0, 0) }, 1.1),
      ).toThrow(/ascend/);
    },
    SLOW,
  );
});

describe("lossScaledPulse (a channel known only by its pulse)", () => {
  it(
    "analytic: the loss read off the pulse is multiplied by s at every frequency of the band (tol 0.05 dB down to −60 dB)",
    () => {
      const nominal = pulseFromLossModel(line(20), grid).pulse;
      for (const s of [0.8, 1.25]) {
        const scaled = lossScaledPulse(nominal, s);
        const size = nextPowerOfTwo(4 * Math.max(scaled.values_V.length, nominal.values_V.length));
        const before = pulseLoss_dB(nominal, size);
        const after = pulseLoss_dB(scaled, size);
        for (let k = 0; k < before.length; k++) {
          if (before[k] > 60) continue;
          expect(Math.abs(after[k] - s * before[k])).toBeLessThan(0.05);
        }
      }
    },
    SLOW,
  );

  it(
    "oracle: a synthetic line's pulse scaled by s matches the line rebuilt with s × its loss (cursors within 2 % of the main)",
    () => {
      for (const [loss, s] of [
        [20, 1.2],
        [20, 0.8],
        [30, 1.1],
        [10, 1.5],
      ]) {
        const scaled = lossScaledPulse(pulseFromLossModel(line(loss), grid).pulse, s);
        expect(cursorGap(pulseFromLossModel(line(loss * s), grid).pulse, scaled)).toBeLessThan(0.02);
      }
    },
    SLOW,
  );

  it(
    "identities: the DC gain goes to its s-th power (area/UI); causal: nothing appears before the pulse's start; s = 1 is a copy",
    () => {
      const nominal = pulseFromLossModel({ lossAtNyquist_dB: 15 }, grid).pulse;
      // A channel with 1 dB of DC loss: its pulse scaled by 0.9.
      const dcLossy: Pulse = { ...nominal, values_V: Float64Array.from(nominal.values_V, (v) => v * 10 ** (-1 / 20)) };
      for (const s of [0.5, 2]) {
        const scaled = lossScaledPulse(dcLossy, s);
        expect(pulseArea(scaled) / ui).toBeCloseTo((pulseArea(dcLossy) / ui) ** s, 3);
        const firstSignificant = scaled.values_V.findIndex(
          (v) => Math.abs(v) > 1e-3 * scaled.values_V[scaled.mainIndex],
        );
        const firstNominal = dcLossy.values_V.findIndex(
          (v) => Math.abs(v) > 1e-3 * dcLossy.values_V[dcLossy.mainIndex],
        );
        expect(firstSignificant).toBeGreaterThanOrEqual(firstNominal - 32);
      }
      const copy = lossScaledPulse(nominal, 1);
      expect(Array.from(copy.values_V)).toEqual(Array.from(nominal.values_V));
      expect(copy.values_V).not.toBe(nominal.values_V);
    },
    SLOW,
  );

  it(
    "edges: refuses a bad factor and an all-zero pulse",
    () => {
      const nominal = pulseFromLossModel(line(20), grid).pulse;
      expect(() => lossScaledPulse(nominal, -1)).toThrow(/lossScale/);
      expect(() => lossScaledPulse({ ...nominal, values_V: new Float64Array(64), mainIndex: 0 }, 1.2)).toThrow(
        /all zero/,
      );
    },
    SLOW,
  );
});

describe("cornerPulses", () => {
  it(
    "oracle: the three routes agree on one line at 1.2 × its loss — model, Touchstone text, sampled pulse (cursors within 2 %)",
    () => {
      const model = line(18);
      const h = lossModelS21(freqs, model, fN);
      // A matched, reciprocal 2-port carrying the line as S21 and S12.
      const sMatrix = new Float64Array(freqs.length * 8);
      for (let f = 0; f < freqs.length; f++) {
        for (const at of [2 * (f * 4 + 2), 2 * (f * 4 + 1)]) {
          sMatrix[at] = h.re[f];
          sMatrix[at + 1] = h.im[f];
        }
      }
      const text = formatTouchstone({ ports: 2, freqs_Hz: freqs, s: sMatrix, referenceOhms: Float64Array.of(50, 50) });
      const fromModel = cornerPulses({ kind: "loss-model", model, grid }, [1.2])[0];
      const fromFile = cornerPulses({ kind: "touchstone", text, ports: 2, grid }, [1.2])[0];
      const fromPulse = cornerPulses({ kind: "pulse", pulse: pulseFromLossModel(model, grid).pulse }, [1.2])[0];
      expect(cursorGap(fromModel, fromFile)).toBeLessThan(0.02);
      expect(cursorGap(fromModel, fromPulse)).toBeLessThan(0.02);
    },
    SLOW,
  );

  it(
    "identities: one pulse per factor in order; equal factors are built once",
    () => {
      const out = cornerPulses({ kind: "loss-model", model: line(10), grid }, [1.1, 0.9, 1.1]);
      expect(out).toHaveLength(3);
      expect(out[0]).toBe(out[2]);
      expect(out[0].values_V[out[0].mainIndex]).toBeLessThan(out[1].values_V[out[1].mainIndex]);
    },
    SLOW,
  );

  it(
    "edges: a factor that takes the loss model beyond 100 dB, or ≤ 0, is refused by name",
    () => {
      expect(() => cornerPulses({ kind: "loss-model", model: line(60), grid }, [2])).toThrow(
        /beyond the model's 100 dB/,
      );
      expect(() => cornerPulses({ kind: "loss-model", model: line(60), grid }, [1, 0])).toThrow(/lossScales\[1\]/);
    },
    SLOW,
  );
});
