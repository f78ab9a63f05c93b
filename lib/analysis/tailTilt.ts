// The exponential tilt at which a sum of two-point parts plus Gaussian noise reaches a given lower
// tail: the saddle point of its cumulant generating function (Lugannani–Rice form).

/** `log cosh(y)` without overflow or cancellation, y ≥ 0. */
export function logCosh(y: number): number {
  if (y < 1e-3) {
    const y2 = y * y;
    return y2 * (0.5 - y2 * (1 / 12 - y2 / 45));
  }
  return y + Math.log1p(Math.exp(-2 * y)) - Math.LN2;
}

/** `log sinh(y)` without overflow, y > 0. */
export function logSinh(y: number): number {
  return y + Math.log(-Math.expm1(-2 * y)) - Math.LN2;
}

/** The largest `λ·(Σm + σ)` a tilt may reach (see {@link tailTilt}). */
export const MAX_TILT_SPAN = 1e6;

/**
 * The saddle-point tilt `λ` (1/V) of `Y = Σ ±m_i + n`, `n ~ N(0, σ²)`, at which the tail `P(Y < y)`
 * equals `p`: with the cumulant generating function `K(λ) = Σ log cosh(λm_i) + σ²λ²/2`, the
 * Lugannani–Rice leading term `P ≈ exp(K(λ) − λK'(λ)) / (λ·√(2π·K''(λ)))` set equal to `p`, solved by
 * Newton's method on `log λ` from the Gaussian estimate `Q(p)/√(Σm² + σ²)`, with bisection whenever
 * a step would leave the bracket. The tilt is capped at `λ·(Σm + σ) = 10⁶` (a tail below the law's
 * smallest atom has no saddle point).
 *
 * @param parts - two-point magnitudes in volts (finite, ≥ 0).
 * @param noiseRms_V - Gaussian noise rms in volts (≥ 0).
 * @param p - tail probability, 0 < p < 0.5.
 * @returns λ in 1/V (0 when there is neither ISI nor noise).
 * @see R. Lugannani and S. Rice, "Saddle point approximation for the distribution of the sum of
 *   independent random variables", Adv. Appl. Prob. 12, 1980 [memory: recalled, not re-read].
 */
export function tailTilt(parts: Float64Array, noiseRms_V: number, p: number): number {
  if (!(p > 0 && p < 0.5)) throw new RangeError(`p must be a probability strictly between 0 and 0.5, got ${p}`);
  if (!(Number.isFinite(noiseRms_V) && noiseRms_V >= 0)) {
    throw new RangeError(`noiseRms_V must be a finite number ≥ 0, got ${noiseRms_V}`);
  }
  const s2 = noiseRms_V * noiseRms_V;
  let v = s2;
  let span = noiseRms_V;
  for (let i = 0; i < parts.length; i++) {
    v += parts[i] * parts[i];
    span += parts[i];
  }
  if (!(v > 0)) return 0;
  // A tail below the law's smallest atom (no noise, p < 2^−n) has no saddle point: λ runs off. Beyond
  // λ·(Σm + σ) = 10⁶ every part is already matched at its extreme, and larger tilts only lose digits.
  const cap = MAX_TILT_SPAN / span;
  const logP = Math.log(p);
  // h(λ) = K − λK' − log(λ√(2πK'')) − log p, decreasing in λ; h'(λ) ≈ −λK'' − 1/λ.
  const h = (lambda: number): { value: number; slope: number } => {
    let K = 0.5 * s2 * lambda * lambda;
    let K1 = s2 * lambda;
    let K2 = s2;
    for (let i = 0; i < parts.length; i++) {
      const m = parts[i];
      if (m === 0) continue;
      const a = lambda * m;
      const t = Math.tanh(a);
      K += logCosh(a);
      K1 += m * t;
      K2 += m * m * (1 - t * t);
    }
    const value = K - lambda * K1 - Math.log(lambda * Math.sqrt(2 * Math.PI * K2)) - logP;
    return { value, slope: -lambda * K2 - 1 / lambda };
  };
  // Gaussian start: λ = z/√v with z from the tail's rough size √(−2 log p).
  let lambda = Math.sqrt(-2 * logP) / Math.sqrt(v);
  if (lambda > cap) lambda = cap;
  let lo = 0;
  let hi = Number.POSITIVE_INFINITY;
  for (let it = 0; it < 60; it++) {
    const { value, slope } = h(lambda);
    if (value > 0) {
      if (lambda >= cap) return cap;
      lo = lambda;
    } else hi = lambda;
    let next = lambda - value / slope;
    if (!(next > lo && next < hi)) next = Number.isFinite(hi) ? 0.5 * (lo + hi) : 2 * lambda;
    if (next > cap) next = cap;
    if (Math.abs(next - lambda) <= 1e-10 * lambda) return next;
    lambda = next;
  }
  return lambda;
}
