// The voltage step of the grid a statistical-eye law is built on: fine enough that the eye height
// converges (to about 0.02 mV), coarse enough that the law stays cheap.

/** Noise tails are kept to this many standard deviations (Φ(−13) ≈ 6·10⁻³⁹). */
export const NOISE_TAIL_SIGMAS = 13;

/**
 * The coarsest grid: never fewer than this many steps between 0 and `Σm + 13σ` (the first-wave
 * grid; the joint search's bounds rely on the step never exceeding it).
 */
export const DEFAULT_HALF_BINS = 256;

/** Without noise, the step is `Σm / NOISELESS_HALF_BINS`. */
export const NOISELESS_HALF_BINS = 1024;

/** The finest grid: at most this many steps between 0 and `Σm` (bounds the cost of large ISI over small noise). */
export const MAX_HALF_BINS = 1024;

/**
 * `ε` of the step rule `Δ = √(σ·ε)`: a part split between two nodes costs the eye edge about
 * `λ·Δ²/8` (λ ≈ Q/σ, the tail's exponential rate), so `Δ² ∝ σ` keeps the sum over the few parts
 * that matter near 0.01 mV per edge whatever σ is (measured on 250-cursor channels, README).
 */
export const TAIL_PRECISION_V = 8e-6;

/**
 * Grid step (volts) of the law of `Σ ±m_i + n`, `n ~ N(0, σ²)`, whose parts total `span_V = Σm`:
 * `Δ = min(√(σ·ε), σ/4)` with noise (`Σm/1024` without), never coarser than `(Σm + 13σ)/256` and never
 * finer than `Σm/4096`, divided by `refine` (2 halves it: the convergence check). Nondecreasing in
 * `span_V`, so the step at an upper bound of the span bounds the step from above (the joint search's
 * bounds rely on it).
 *
 * @param span_V - total of the two-point magnitudes, volts (finite, ≥ 0).
 * @param noiseRms_V - Gaussian noise rms in volts, ≥ 0.
 * @param refine - divides the step (finite, ≥ 1; default 1).
 * @returns the step in volts; 0 when there is neither ISI nor noise.
 */
export function lawStepForSpan(span_V: number, noiseRms_V: number, refine = 1): number {
  if (!(Number.isFinite(noiseRms_V) && noiseRms_V >= 0)) {
    throw new RangeError(`noiseRms_V must be a finite number ≥ 0, got ${noiseRms_V}`);
  }
  if (!(Number.isFinite(span_V) && span_V >= 0))
    throw new RangeError(`span_V must be a finite number ≥ 0, got ${span_V}`);
  if (!(Number.isFinite(refine) && refine >= 1))
    throw new RangeError(`refine must be a finite number ≥ 1, got ${String(refine)}`);
  const sigma = noiseRms_V;
  const coarsest = (span_V + NOISE_TAIL_SIGMAS * sigma) / DEFAULT_HALF_BINS;
  if (coarsest === 0) return 0;
  let step = sigma > 0 ? Math.min(Math.sqrt(sigma * TAIL_PRECISION_V), sigma / 4) : span_V / NOISELESS_HALF_BINS;
  step = Math.min(step, coarsest);
  step = Math.max(step, span_V / MAX_HALF_BINS);
  return step / refine;
}

/**
 * Grid step (volts) of the law of the two-point parts `parts` plus noise: {@link lawStepForSpan} of
 * their total.
 *
 * @param parts - two-point magnitudes in volts (see `isiParts`), finite and ≥ 0.
 * @param noiseRms_V - Gaussian noise rms in volts, ≥ 0.
 * @param refine - divides the step (finite, ≥ 1; default 1).
 */
export function lawStep(parts: Float64Array, noiseRms_V: number, refine = 1): number {
  let span = 0;
  for (let i = 0; i < parts.length; i++) span += parts[i];
  if (!Number.isFinite(span)) throw new RangeError("parts hold a value that is not finite");
  return lawStepForSpan(span, noiseRms_V, refine);
}
