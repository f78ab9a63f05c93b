// Shared test fixtures of the analysis tests: synthetic pulses with known cursors.
import type { Pulse } from "@lib/types";

/**
 * A pulse whose symbol-spaced samples at the main phase are exactly `cursors` (main at index
 * `main`), with a triangular shape between them so that other phases interpolate linearly.
 */
export function cursorPulse(cursors: number[], main: number, samplesPerUi = 16, ui_s = 1e-10): Pulse {
  const n = (cursors.length - 1) * samplesPerUi + 1;
  const v = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const k = Math.floor(i / samplesPerUi);
    const f = i / samplesPerUi - k;
    const a = cursors[k];
    const b = k + 1 < cursors.length ? cursors[k + 1] : 0;
    v[i] = a + f * (b - a);
  }
  return { ui_s, samplesPerUi, values_V: v, mainIndex: main * samplesPerUi };
}

/**
 * A rectangular pulse: `amplitude` for exactly one UI (`samplesPerUi` samples) and 0 elsewhere,
 * padded by `padUi` UIs each side; `mainIndex` is the middle sample of the rectangle
 * (`samplesPerUi` even: the first of the two middle samples).
 */
export function rectPulse(amplitude: number, samplesPerUi: number, padUi = 2, ui_s = 1e-10): Pulse {
  const n = (2 * padUi + 1) * samplesPerUi;
  const v = new Float64Array(n);
  const start = padUi * samplesPerUi;
  for (let i = start; i < start + samplesPerUi; i++) v[i] = amplitude;
  return { ui_s, samplesPerUi, values_V: v, mainIndex: start + samplesPerUi / 2 - (samplesPerUi % 2 === 0 ? 1 : 0.5) };
}

/** Standard normal CDF by Simpson integration of the density — a test oracle independent of erfc. */
export function normalCdfOracle(x: number): number {
  if (x > 0) return 1 - normalCdfOracle(-x);
  const lower = x - 40;
  const n = 20_000;
  const h = (x - lower) / n;
  const phi = (t: number) => Math.exp(-0.5 * t * t) / Math.sqrt(2 * Math.PI);
  let s = phi(lower) + phi(x);
  for (let i = 1; i < n; i++) s += (i % 2 === 1 ? 4 : 2) * phi(lower + i * h);
  return (s * h) / 3;
}

/** Every sum `Σ a_k·r_k` over all symbol patterns with equal probability (brute force). */
export function enumerateIsi(isi: number[], alphabet: number[]): { values: number[]; prob: number } {
  let values = [0];
  for (const r of isi) {
    const next: number[] = [];
    for (const v of values) for (const a of alphabet) next.push(v + a * r);
    values = next;
  }
  return { values, prob: 1 / values.length };
}
