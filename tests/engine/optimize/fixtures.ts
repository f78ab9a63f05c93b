// Fixtures of the optimizer tests: small analytic channels and budgets.
import type { Pulse } from "@lib/types";

/**
 * The pulse of a first-order RC channel (time constant τ with a = e^(−UI/τ)) for a 1 V, 1 UI symbol:
 * `1 − e^(−t/τ)` during the UI, then `(1 − a)·e^(−(t − UI)/τ)`; `mainIndex` at t = UI, where the
 * symbol-spaced cursors are `(1 − a)·a^k` [computed from the RC step response].
 */
export function rcPulse(a: number, samplesPerUi = 8, spanUi = 24, ui_s = 1e-10): Pulse {
  const tau = -1 / Math.log(a); // in UI
  const n = spanUi * samplesPerUi + 1;
  const v = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const t = i / samplesPerUi;
    v[i] = t <= 1 ? 1 - Math.exp(-t / tau) : (1 - a) * Math.exp(-(t - 1) / tau);
  }
  return { ui_s, samplesPerUi, values_V: v, mainIndex: samplesPerUi };
}

/** A pulse with the given symbol-spaced cursors, constant over each UI (main cursor `cursors[main]`). */
export function stepwisePulse(cursors: number[], main: number, samplesPerUi = 8, ui_s = 1e-10): Pulse {
  const v = new Float64Array(cursors.length * samplesPerUi);
  cursors.forEach((c, k) => v.fill(c, k * samplesPerUi, (k + 1) * samplesPerUi));
  return { ui_s, samplesPerUi, values_V: v, mainIndex: main * samplesPerUi + Math.floor(samplesPerUi / 2) };
}

/** A CTLE that is flat over the band: zero on the first pole, second pole far above the baud rate. */
export function flatCtle(ui_s = 1e-10) {
  return { gDc_dB: [0, 0, 1] as [number, number, number], fz_Hz: 1 / ui_s, fp1_Hz: 1 / ui_s, fp2_Hz: 1e4 / ui_s };
}
