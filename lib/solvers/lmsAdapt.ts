// LMS and sign-sign LMS adaptation of a symbol-spaced equalizer, trained on known random NRZ symbols.
import type { Cursors } from "../pulse/cursorsAt.ts";
import { seededRandom } from "../signal/seededRandom.ts";
import { checkCursorWindow } from "./checkCursors.ts";
import { equalizerMse } from "./mmse.ts";
import { convolutionMatrix } from "./convolutionMatrix.ts";
import { lmsStepBounds } from "./wienerSolve.ts";

/** The update rule. */
export type LmsVariant = "lms" | "sign-sign";

/** Settings of an adaptation run. */
export interface LmsOptions {
  /** rms of white Gaussian noise added to the channel output, volts (≥ 0). */
  readonly noiseRms_V: number;
  /** Step size μ (> 0). */
  readonly mu: number;
  /** Number of symbol-by-symbol updates (integer ≥ 1). */
  readonly iterations: number;
  /** Seed of the symbol and noise generator (integer); the same seed gives the same run. */
  readonly seed: number;
  /** `"lms"`: `c ← c − μ·e·x`; `"sign-sign"`: `c ← c − μ·sgn(e)·sgn(x)`. */
  readonly variant: LmsVariant;
  /** Record the taps every this many updates (default: about 200 records per run). */
  readonly every?: number;
  /** Starting taps (default: main tap 1, others 0). */
  readonly initial?: ArrayLike<number>;
}

/** Final taps, the recorded trajectory and the MSE at each record. */
export interface LmsResult {
  readonly taps: Float64Array;
  /** Taps after `k·every` updates, `k = 0, 1, …` (the first entry is the starting point). */
  readonly trajectory: Float64Array[];
  /** Update count of each trajectory entry. */
  readonly iterationsAt: number[];
  /**
   * Mean-square error of each trajectory entry, computed exactly from the cursors and the noise
   * (`‖H·c − e‖² + σ²‖c‖²`), so the learning curve is free of the training noise.
   */
  readonly mse: Float64Array;
}

const TAP_BLOW_UP = 1e6;

/**
 * Adapts a `pre + 1 + post`-tap equalizer on the channel `cursors`: each update draws an NRZ
 * symbol (±1), forms the channel output `x_k = Σ h[m]·a[k−m] + noise`, the equalizer output
 * `y = Σ c[j]·x[k−j]`, the error `e = y − a[k − main − pre]` against the known symbol, and
 * updates the taps. For a small μ and enough updates LMS ends near {@link mmseEqualizer}'s taps.
 *
 * @throws RangeError when the taps blow up (μ beyond the stability bound, which the message gives).
 * @see Widrow & Hoff, "Adaptive switching circuits", IRE WESCON Conv. Rec. (1960);
 *   Haykin, *Adaptive Filter Theory*, 4th ed. (LMS and sign-sign LMS).
 */
export function lmsAdapt(cursors: Cursors, pre: number, post: number, options: LmsOptions): LmsResult {
  checkCursorWindow(cursors, pre, post);
  const { noiseRms_V, mu, iterations, seed, variant } = options;
  if (!(noiseRms_V >= 0) || !Number.isFinite(noiseRms_V)) {
    throw new RangeError(`noiseRms_V must be a finite number ≥ 0, got ${String(noiseRms_V)}`);
  }
  if (!(mu > 0) || !Number.isFinite(mu)) throw new RangeError(`mu must be a finite number > 0, got ${String(mu)}`);
  if (!Number.isInteger(iterations) || iterations < 1 || iterations > 1e8) {
    throw new RangeError(`iterations must be an integer 1…1e8, got ${String(iterations)}`);
  }
  if (!Number.isInteger(seed)) throw new RangeError(`seed must be an integer, got ${String(seed)}`);
  if (variant !== "lms" && variant !== "sign-sign") {
    throw new RangeError(`variant must be "lms" or "sign-sign", got ${String(variant)}`);
  }
  const every = options.every ?? Math.max(1, Math.ceil(iterations / 200));
  if (!Number.isInteger(every) || every < 1) throw new RangeError(`every must be an integer ≥ 1, got ${String(every)}`);
  if (iterations / every > 100_000) throw new RangeError("every is too small: at most 100000 trajectory records");
  const n = pre + 1 + post;
  const c = new Float64Array(n);
  if (options.initial === undefined) {
    c[pre] = 1;
  } else {
    if (options.initial.length !== n)
      throw new RangeError(`initial must hold ${n} taps, got ${options.initial.length}`);
    for (let j = 0; j < n; j++) {
      if (!Number.isFinite(options.initial[j])) throw new RangeError(`initial[${j}] must be finite`);
      c[j] = options.initial[j];
    }
  }

  const { h, main } = cursors;
  const L = h.length;
  const rng = seededRandom(seed);
  // Symbol history a[k], a[k−1], … kept twice over in a doubled ring so reads are contiguous.
  const span = L + n;
  const sym = new Float64Array(2 * span);
  let head = 0; // sym[head] is the newest symbol
  const push = (a: number) => {
    head = (head - 1 + span) % span;
    sym[head] = a;
    sym[head + span] = a;
  };
  // Equalizer input history x[k], x[k−1], … (doubled ring as well).
  const xs = new Float64Array(2 * n);
  let xHead = 0;
  const channelOut = (): number => {
    let s = 0;
    for (let m = 0; m < L; m++) s += h[m] * sym[head + m];
    return s + noiseRms_V * rng.normal();
  };
  const pushX = (x: number) => {
    xHead = (xHead - 1 + n) % n;
    xs[xHead] = x;
    xs[xHead + n] = x;
  };
  // Warm up: fill the symbol and input histories before the first update.
  for (let k = 0; k < span; k++) {
    push(rng.sign());
    pushX(channelOut());
  }

  const trajectory: Float64Array[] = [Float64Array.from(c)];
  const iterationsAt: number[] = [0];
  const delay = main + pre;
  const blowUp = () => {
    const H = convolutionMatrix(h, n);
    const R = H.transpose().mmul(H);
    for (let j = 0; j < n; j++) R.set(j, j, R.get(j, j) + noiseRms_V * noiseRms_V);
    const bound = lmsStepBounds(R).meanBound;
    return new RangeError(
      `mu = ${mu} makes the adaptation diverge; LMS converges in the mean for mu < 2/λmax = ${bound.toPrecision(4)}`,
    );
  };
  for (let k = 1; k <= iterations; k++) {
    push(rng.sign());
    pushX(channelOut());
    let y = 0;
    for (let j = 0; j < n; j++) y += c[j] * xs[xHead + j];
    const e = y - sym[head + delay];
    if (variant === "lms") {
      const g = mu * e;
      for (let j = 0; j < n; j++) c[j] -= g * xs[xHead + j];
    } else {
      const se = Math.sign(e);
      if (se !== 0) for (let j = 0; j < n; j++) c[j] -= mu * se * Math.sign(xs[xHead + j]);
    }
    if (k % every === 0) {
      for (let j = 0; j < n; j++) if (!(Math.abs(c[j]) < TAP_BLOW_UP)) throw blowUp();
      trajectory.push(Float64Array.from(c));
      iterationsAt.push(k);
    }
  }
  for (let j = 0; j < n; j++) if (!(Math.abs(c[j]) < TAP_BLOW_UP)) throw blowUp();
  const mse = Float64Array.from(trajectory, (t) => equalizerMse(cursors, t, pre, noiseRms_V));
  return { taps: c, trajectory, iterationsAt, mse };
}
