// Dual-Dirac sampling jitter as weights over neighbouring sampling phases (phase-shifted cursors).
import erfc from "@stdlib/math-base-special-erfc";

/** Jitter of the sampling instant relative to the data, in unit intervals. */
export interface Jitter {
  /** Random jitter, Gaussian rms, in UI (≥ 0). */
  readonly rjRms_UI: number;
  /** Deterministic jitter, dual-Dirac peak-to-peak, in UI (≥ 0). */
  readonly djPp_UI: number;
}

/** Weights `w[i]` for the integer phase offsets `first + i` (in samples). They sum to 1. */
export interface JitterKernel {
  readonly first: number;
  readonly weights: Float64Array;
}

/** Checks a {@link Jitter} object and throws a RangeError naming the faulty field. */
export function assertJitter(jitter: Jitter, name = "jitter"): void {
  if (jitter === null || typeof jitter !== "object") throw new TypeError(`${name} must be an object`);
  if (!(Number.isFinite(jitter.rjRms_UI) && jitter.rjRms_UI >= 0 && jitter.rjRms_UI <= 0.5)) {
    throw new RangeError(`${name}.rjRms_UI must be a number 0 … 0.5 UI, got ${String(jitter.rjRms_UI)}`);
  }
  if (!(Number.isFinite(jitter.djPp_UI) && jitter.djPp_UI >= 0 && jitter.djPp_UI <= 1)) {
    throw new RangeError(`${name}.djPp_UI must be a number 0 … 1 UI, got ${String(jitter.djPp_UI)}`);
  }
}

const SQRT_2PI = Math.sqrt(2 * Math.PI);
const TAIL = 13;

/**
 * Mixing weights that turn per-phase quantities on the integer sample grid into their value at
 * the (possibly fractional) phase `frac` under sampling jitter `τ`:
 * `Q(frac) = E_τ[Q_lin(frac + τ·samplesPerUi)] = Σ_m w[m]·Q(m)`, where `Q_lin` interpolates
 * linearly between integer phases, so `w[m] = E[hat(frac + τ·samplesPerUi − m)]` with
 * `hat(y) = max(0, 1 − |y|)`.
 *
 * The jitter is the dual-Dirac model: `τ = ±DJ/2` with probability ½ each, plus Gaussian RJ.
 * Weights below `floor` at the two ends are dropped (by default 10⁻³⁸, 13 σ of the Gaussian); a
 * dropped weight changes any mixed probability by less than itself.
 *
 * @param jitter - RJ rms and DJ peak-to-peak in UI.
 * @param samplesPerUi - samples per UI of the phase grid (integer ≥ 1).
 * @param frac - evaluation point in samples relative to phase 0 (any finite number; default 0).
 * @param floor - weights below it at the ends are dropped (0 < floor < 0.01, default 1e-38).
 * @see dual-Dirac jitter model: T11.2 "Fibre Channel — Methodologies for Jitter and Signal Quality
 *   Specification" (MJSQ) technical report [memory: recalled, not re-read].
 */
export function jitterKernel(jitter: Jitter | undefined, samplesPerUi: number, frac = 0, floor = 1e-38): JitterKernel {
  if (!Number.isInteger(samplesPerUi) || samplesPerUi < 1) {
    throw new RangeError(`samplesPerUi must be an integer ≥ 1, got ${String(samplesPerUi)}`);
  }
  if (!Number.isFinite(frac)) throw new RangeError(`frac must be a finite number, got ${frac}`);
  if (!(floor > 0 && floor < 0.01)) throw new RangeError(`floor must be a number in (0, 0.01), got ${floor}`);
  const rj = jitter === undefined ? 0 : jitter.rjRms_UI;
  const dj = jitter === undefined ? 0 : jitter.djPp_UI;
  if (jitter !== undefined) assertJitter(jitter);
  const s = rj * samplesPerUi;
  const half = 0.5 * dj * samplesPerUi;
  const means = half > 0 ? [frac - half, frac + half] : [frac];
  const share = 1 / means.length;
  const first = Math.floor(frac - half - TAIL * s) - 1;
  const last = Math.ceil(frac + half + TAIL * s) + 1;
  const w = new Float64Array(last - first + 1);
  for (const mu of means) {
    for (let m = first; m <= last; m++) w[m - first] += share * expectedHat(mu - m, s);
  }
  let a = 0;
  let b = w.length - 1;
  while (a < b && w[a] < floor) a++;
  while (b > a && w[b] < floor) b--;
  return { first: first + a, weights: w.slice(a, b + 1) };
}

/** `E[max(0, 1 − |Y|)]` for `Y ~ N(a, s²)` (`s = 0`: the hat function at `a`). */
function expectedHat(a: number, s: number): number {
  if (s === 0) return Math.max(0, 1 - Math.abs(a));
  const x = Math.abs(a); // the hat is even, so Y and −Y give the same value
  const cdf = (t: number) => 0.5 * erfc((x - t) / (s * Math.SQRT2));
  const pdf = (t: number) => {
    const z = (t - x) / s;
    return Math.exp(-0.5 * z * z) / SQRT_2PI;
  };
  // M(t) = E[Y·1{Y ≤ t}] = x·Φ((t − x)/s) − s·φ((t − x)/s)
  const moment = (t: number) => x * cdf(t) - s * pdf(t);
  const v = cdf(1) - cdf(-1) - moment(1) + 2 * moment(0) - moment(-1);
  return v > 0 ? v : 0;
}
