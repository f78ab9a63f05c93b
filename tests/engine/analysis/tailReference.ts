// An independent reference for the statistical eye's tails, sharing no code with lib/: the lower tail
// of Σ a_k·r_k + n (independent equiprobable symbols, Gaussian noise) by numerical inversion of its
// two-sided Laplace transform along the saddle-point line (the Bromwich integral), trapezoid rule.
// Exact up to quadrature and aliasing errors that are exponentially small in the chosen spacing:
// no grid, no binning. Needs noise (σ > 0) for the integrand to decay.

/**
 * Two-point magnitudes of the ISI: NRZ `|r|`; PAM4 with levels ±1, ±x the sum of `±(1+x)/2·r` and
 * `±(1−x)/2·r` (the four equiprobable levels are exactly those sums). Zeros dropped.
 */
export function twoPointMagnitudes(isi: readonly number[], modulation: "nrz" | "pam4", inner = 1 / 3): number[] {
  const out: number[] = [];
  for (const r of isi) {
    if (modulation === "nrz") out.push(Math.abs(r));
    else out.push((Math.abs(r) * (1 + inner)) / 2, (Math.abs(r) * (1 - inner)) / 2);
  }
  return out.filter((m) => m > 0);
}

/** The tilt c > 0 where K'(c) = −y for K(c) = Σ log cosh(c·m) + σ²c²/2 (y < 0): the saddle point. */
function saddlePoint(m: readonly number[], sigma: number, y: number): number {
  const slope = (c: number) => {
    let s = sigma * sigma * c;
    for (const x of m) s += x * Math.tanh(c * x);
    return s;
  };
  let lo = 0;
  let hi = 1;
  while (slope(hi) < -y) hi *= 2;
  for (let i = 0; i < 200; i++) {
    const mid = 0.5 * (lo + hi);
    if (slope(mid) < -y) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}

/**
 * `P(Σ ±m_i + n < y)` for y < 0, n ~ N(0, σ²): `(1/π)·∫₀^∞ Re[M(s)·e^{sy}/s] dω` with `s = c + iω`,
 * `M(s) = e^{σ²s²/2}·Π cosh(s·m_i)`, c the saddle point; trapezoid with spacing 2π/L (L four times
 * the law's span) up to ω = 14/σ.
 */
export function referenceProbBelow(m: readonly number[], sigma: number, y: number): number {
  if (!(sigma > 0)) throw new Error("the reference needs noise (σ > 0)");
  if (!(y < 0)) throw new Error("the reference computes lower tails (y < 0)");
  const c = saddlePoint(m, sigma, y);
  let peak = 0;
  for (const x of m) peak += x;
  const span = 4 * (peak + Math.abs(y) + 40 * sigma) + 60 / c;
  const h = (2 * Math.PI) / span;
  const n = Math.ceil(14 / sigma / h);
  // Everything is scaled by M(c)·e^{cy}, the integrand's size at ω = 0.
  let logRef = 0.5 * sigma * sigma * c * c + c * y;
  for (const x of m) logRef += c * x - Math.LN2 + Math.log1p(Math.exp(-2 * c * x));
  let sum = 0;
  for (let j = 0; j <= n; j++) {
    const w = j * h;
    let re = 0.5 * sigma * sigma * (c * c - w * w) + c * y - logRef;
    let im = sigma * sigma * c * w + w * y;
    for (const x of m) {
      // log cosh z = z − ln 2 + log(1 + e^{−2z}), z = (c + iω)·x.
      const e = Math.exp(-2 * c * x);
      const ur = 1 + e * Math.cos(2 * w * x);
      const ui = -e * Math.sin(2 * w * x);
      re += c * x - Math.LN2 + 0.5 * Math.log(ur * ur + ui * ui);
      im += w * x + Math.atan2(ui, ur);
    }
    const mag = Math.exp(re);
    const value = (mag * (Math.cos(im) * c + Math.sin(im) * w)) / (c * c + w * w);
    sum += (j === 0 ? 0.5 : 1) * value;
  }
  return (Math.exp(logRef) * sum * h) / Math.PI;
}

/**
 * The lower p-quantile (p < 0.5) of Σ ±m_i + n: the root of `log P(Y < y) − log p` (smooth and
 * increasing in y) by the Illinois variant of regula falsi on a bracket, to 1e-10 V.
 */
export function referenceQuantile(m: readonly number[], sigma: number, p: number): number {
  let peak = 0;
  for (const x of m) peak += x;
  const g = (y: number) => Math.log(referenceProbBelow(m, sigma, y)) - Math.log(p);
  // P(Y < −Σm − σ√(−2 ln p)) ≤ Φ(−√(−2 ln p)) ≤ p/2 (Chernoff), and for a symmetric ISI
  // P(Y < −σ/2) ≥ P(ISI ≤ 0)·Φ(−½) > 0.15 > p.
  if (!(p < 0.15)) throw new Error("the reference quantile needs p < 0.15");
  let a = -peak - sigma * Math.sqrt(-2 * Math.log(p));
  let b = -0.5 * sigma;
  let ga = g(a);
  let gb = g(b);
  let side = 0;
  for (let i = 0; i < 200 && b - a > 1e-10; i++) {
    const c = (a * gb - b * ga) / (gb - ga);
    const gc = g(c);
    if (gc < 0) {
      a = c;
      ga = gc;
      if (side === -1) gb /= 2;
      side = -1;
    } else {
      b = c;
      gb = gc;
      if (side === 1) ga /= 2;
      side = 1;
    }
    if (Math.abs(gc) < 1e-9) return c;
  }
  return 0.5 * (a + b);
}
