// LMS adaptation of a receive DFE with known symbols: how the taps walk to their closed-form values.
import type { Cursors } from "../pulse/cursorsAt.ts";
import { seededRandom } from "../signal/seededRandom.ts";
import type { Modulation } from "../types.ts";

/** Settings of a DFE adaptation run. */
export interface DfeAdaptationOptions {
  readonly modulation: Modulation;
  /** Number of DFE taps (integer ≥ 1). */
  readonly taps: number;
  /** Magnitude limit per tap in volts (Infinity for none); the taps are clipped after each update. */
  readonly limits_V: ArrayLike<number>;
  /** Gaussian noise rms at the slicer, volts (≥ 0). */
  readonly noiseRms_V: number;
  /** Step size (> 0): LMS `d ← d + μ·e·a`, sign-sign `d ← d + μ·sgn(e)·sgn(a)` (μ in volts). */
  readonly mu: number;
  readonly iterations: number;
  readonly seed: number;
  readonly variant: "lms" | "sign-sign";
  /** Record the taps every this many updates (default: about 100 records). */
  readonly every?: number;
}

/** A DFE adaptation trajectory. */
export interface DfeAdaptation {
  /** Final taps, volts. */
  readonly taps: Float64Array;
  /** Update counts of the records, and the taps at each (the first record is the start, all zero). */
  readonly iterationsAt: number[];
  readonly trajectory: Float64Array[];
}

/**
 * Trains the DFE taps on random symbols (NRZ ±1 or PAM4 ±1, ±1/3, seeded) through the cursors
 * `{ h, main }` (volts at the slicer): the slicer input is `y = Σ_i h_i·a_{n−i} + noise − Σ_k d_k·a_{n−k}`,
 * the error against the known symbol `e = y − h_main·a_n`, and each tap moves along `e·a_{n−k}` (LMS) or
 * its signs (sign-sign), then is clipped to its limit. The taps converge to the post-cursors clipped
 * to the limits — the closed form the optimizer assumes.
 *
 * @see Haykin, *Adaptive Filter Theory*, 4th ed. (LMS and sign-sign LMS); decision feedback:
 *   Belfiore & Park, Proc. IEEE 67(8), 1979.
 */
export function dfeAdaptation(cursors: Cursors, options: DfeAdaptationOptions): DfeAdaptation {
  const { h, main } = cursors;
  if (!(h instanceof Float64Array) || h.length === 0)
    throw new RangeError("cursors.h must be a non-empty Float64Array");
  if (!Number.isInteger(main) || main < 0 || main >= h.length)
    throw new RangeError(`cursors.main must index cursors.h, got ${main}`);
  const n = options.taps;
  if (!Number.isInteger(n) || n < 1 || n > 64) throw new RangeError(`taps must be an integer 1…64, got ${String(n)}`);
  if (options.limits_V.length < n) throw new RangeError(`limits_V must hold ${n} limits`);
  if (!(Number.isFinite(options.noiseRms_V) && options.noiseRms_V >= 0))
    throw new RangeError("noiseRms_V must be a finite number ≥ 0");
  if (!(Number.isFinite(options.mu) && options.mu > 0))
    throw new RangeError(`mu must be a finite number > 0, got ${options.mu}`);
  if (!Number.isInteger(options.iterations) || options.iterations < 1 || options.iterations > 1e7) {
    throw new RangeError(`iterations must be an integer 1…1e7, got ${String(options.iterations)}`);
  }
  if (options.variant !== "lms" && options.variant !== "sign-sign")
    throw new RangeError(`variant must be "lms" or "sign-sign"`);
  const every = options.every ?? Math.max(1, Math.ceil(options.iterations / 100));
  if (!Number.isInteger(every) || every < 1) throw new RangeError(`every must be an integer ≥ 1, got ${String(every)}`);
  const rng = seededRandom(options.seed);
  const draw =
    options.modulation === "pam4"
      ? () => [-1, -1 / 3, 1 / 3, 1][Math.min(3, Math.floor(rng.uniform() * 4))]
      : () => rng.sign();
  // Symbol history: sym[i] is a_{n−i} after the newest symbol a_n, for i = 0 … L−1.
  const L = Math.max(h.length, main + n + 1);
  const sym = new Float64Array(L);
  for (let i = 0; i < L; i++) sym[i] = draw();
  const d = new Float64Array(n);
  const trajectory: Float64Array[] = [Float64Array.from(d)];
  const iterationsAt = [0];
  const h0 = h[main];
  for (let it = 1; it <= options.iterations; it++) {
    sym.copyWithin(1, 0, L - 1);
    sym[0] = draw();
    // The decided symbol sits at delay `main` (the cursor h[main] multiplies it).
    let y = options.noiseRms_V * rng.normal();
    for (let i = 0; i < h.length; i++) y += h[i] * sym[i];
    for (let k = 0; k < n; k++) y -= d[k] * sym[main + 1 + k];
    const e = y - h0 * sym[main];
    for (let k = 0; k < n; k++) {
      const a = sym[main + 1 + k];
      const step = options.variant === "lms" ? options.mu * e * a : options.mu * Math.sign(e) * Math.sign(a);
      const lim = options.limits_V[k];
      const v = d[k] + step;
      d[k] = v > lim ? lim : v < -lim ? -lim : v;
    }
    if (it % every === 0) {
      trajectory.push(Float64Array.from(d));
      iterationsAt.push(it);
    }
  }
  return { taps: d, iterationsAt, trajectory };
}
