// DFE error propagation: a wrong decision fed back adds ISI to the next decisions. The DFE's recent
// decision errors form a Markov chain whose stationary law gives the error ratio with propagation.
import type { StatisticalEye } from "./statisticalEye.ts";

/** Largest number of error states the chain is solved with (3⁸ NRZ states: 8 taps; PAM4 5⁵: 5). */
export const MAX_ERROR_STATES = 6561;

/** Error propagation of a DFE at one sampling phase (see {@link dfeErrorPropagation}). */
export type DfeErrorPropagation =
  | {
      readonly modelled: true;
      /** Bit error ratio with correct decisions fed back (the statistical eye's convention). */
      readonly berWithout: number;
      /** Bit error ratio with the DFE's own decisions fed back (the chain's stationary law). */
      readonly berWith: number;
      /** `berWith / berWithout` (1 without DFE taps; `null` when `berWithout` is 0 in double precision). */
      readonly factor: number | null;
      /** Number of error states of the chain. */
      readonly states: number;
    }
  | {
      readonly modelled: false;
      /** Why not, in words for a reviewer. */
      readonly reason: string;
    };

/** Iterations of the stationary law at most, and the relative change of the error ratio that stops them. */
const MAX_ITERATIONS = 5000;
const TOLERANCE = 1e-10;

/**
 * The bit error ratio of a DFE whose taps feed back its own decisions, at the eye-centre thresholds
 * (midway between the levels' nominal positions `levels[i]·main(t)`) of phase `t`.
 *
 * Model: the error `e = a − â` of each of the last `N` decisions (N = the eye's DFE taps) is the
 * state of a Markov chain. A state adds `x = Σ_k d_k·e_{−k}` to the received sample, so the next
 * decision errs with the statistical eye's conditional tails shifted by `x`:
 * `P(level i+1 decided as i) = (1/M)·P(sample_{i+1} < θ_i − x)` and
 * `P(level i decided as i+1) = (1/M)·P(sample_i > θ_i − x)` (jitter, noise and residual ISI
 * included), and the new error `±(levels[i+1] − levels[i])` shifts into the state. The chain's
 * stationary law gives the symbol error ratio; bits follow the one BER convention (NRZ: a symbol
 * is a bit; Gray-coded PAM4: one bit of two per adjacent-level error, and a fall across more than one
 * threshold is counted as an adjacent error). Exact for taps that cancel their cursors (unclipped)
 * when the residual ISI is independent of past decisions; a clipped tap's residual `h_k − d_k` is
 * kept in the eye's law as an independent part (its sign is in fact known after an error), and the
 * residual ISI of one decision is taken as independent of the previous decisions' — both common
 * practice for the Markov model of DFE error propagation.
 *
 * @param eye - the statistical eye of the equalized pulse with its DFE taps (volts).
 * @param t - sampling phase in samples from the nominal main cursor.
 * @returns not modelled when the chain would have more than {@link MAX_ERROR_STATES} states.
 * @see D. L. Duttweiler, J. E. Mazo and D. G. Messerschmitt, "An upper bound on the error
 *   probability in decision-feedback equalization", IEEE Trans. Inform. Theory 20, 1974 — error
 *   propagation as a chain of the feedback's error states, the multiplication at most 2^N for
 *   binary signalling under their conditions [memory: recalled, not re-read].
 */
export function dfeErrorPropagation(eye: StatisticalEye, t: number): DfeErrorPropagation {
  if (!Number.isFinite(t)) throw new RangeError(`t must be a finite phase in samples, got ${t}`);
  const levels = eye.levels;
  const M = levels.length;
  const taps = eye.dfeTaps;
  const N = taps.length;
  const main = eye.main(t);
  const thresholds = Array.from({ length: M - 1 }, (_, i) => 0.5 * (levels[i] + levels[i + 1]) * main);
  const gaps = Array.from({ length: M - 1 }, (_, i) => levels[i + 1] - levels[i]);
  // The error alphabet: 0, then +gap and −gap of each distinct adjacent gap.
  const distinct: number[] = [];
  for (const g of gaps) if (!distinct.some((d) => Math.abs(d - g) < 1e-12)) distinct.push(g);
  const alphabet = [0, ...distinct.flatMap((g) => [g, -g])];
  const A = alphabet.length;
  const codeOfGap = gaps.map((g) => 1 + 2 * distinct.findIndex((d) => Math.abs(d - g) < 1e-12));
  const states = A ** N;
  if (states > MAX_ERROR_STATES) {
    return {
      modelled: false,
      reason: `error propagation is not modelled for ${N} DFE taps with ${M} levels (${states} error states; at most ${MAX_ERROR_STATES})`,
    };
  }
  const bitsPerSymbol = Math.log2(M);

  // Per state: the probability of each new error code (index 0: no error).
  const next = new Float64Array(states * A);
  const errorOf = new Float64Array(states);
  const digits = new Int32Array(N);
  for (let s = 0; s < states; s++) {
    let x = 0;
    let c = s;
    for (let k = 0; k < N; k++) {
      digits[k] = c % A;
      c = Math.floor(c / A);
      x += taps[k] * alphabet[digits[k]];
    }
    let err = 0;
    for (let i = 0; i + 1 < M; i++) {
      const down = eye.probBelow(i + 1, t, thresholds[i] - x) / M; // level i+1 read as i: e = +gap
      const up = eye.probAbove(i, t, thresholds[i] - x) / M; // level i read as i+1: e = −gap
      next[s * A + codeOfGap[i]] += down;
      next[s * A + codeOfGap[i] + 1] += up;
      err += down + up;
    }
    next[s * A] = Math.max(0, 1 - err);
    errorOf[s] = err;
  }
  const serWithout = errorOf[0];
  if (N === 0) {
    const ber = serWithout / bitsPerSymbol;
    return { modelled: true, berWithout: ber, berWith: ber, factor: ber > 0 ? 1 : null, states };
  }

  // The stationary law by iteration from the error-free state: the newest error enters at digit 0.
  const keep = A ** (N - 1);
  let pi = new Float64Array(states);
  let nextPi = new Float64Array(states);
  pi[0] = 1;
  let ser = serWithout;
  for (let it = 0; it < MAX_ITERATIONS; it++) {
    nextPi.fill(0);
    for (let s = 0; s < states; s++) {
      const w = pi[s];
      if (w === 0) continue;
      const base = A * (s % keep);
      for (let e = 0; e < A; e++) nextPi[base + e] += w * next[s * A + e];
    }
    [pi, nextPi] = [nextPi, pi];
    let total = 0;
    let errors = 0;
    for (let s = 0; s < states; s++) {
      total += pi[s];
      errors += pi[s] * errorOf[s];
    }
    const updated = errors / total;
    const settled = it >= N && Math.abs(updated - ser) <= TOLERANCE * updated;
    ser = updated;
    if (settled) break;
  }
  const berWithout = serWithout / bitsPerSymbol;
  const berWith = ser / bitsPerSymbol;
  return { modelled: true, berWithout, berWith, factor: berWithout > 0 ? berWith / berWithout : null, states };
}
