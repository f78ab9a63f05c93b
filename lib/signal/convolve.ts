// Linear convolution of two real sequences, directly for short inputs and by FFT for long ones.
import { FftPlan, nextPowerOfTwo } from "./fftPlan.ts";

/** Above this product of lengths the FFT route is taken. */
const DIRECT_LIMIT = 1 << 15;

/**
 * Full linear convolution `y[n] = Σ_k a[k]·b[n−k]`, length `a.length + b.length − 1`.
 * @param a - first sequence, non-empty.
 * @param b - second sequence, non-empty.
 */
export function convolve(a: Float64Array, b: Float64Array): Float64Array {
  if (!(a instanceof Float64Array) || a.length === 0) throw new RangeError("a must be a non-empty Float64Array");
  if (!(b instanceof Float64Array) || b.length === 0) throw new RangeError("b must be a non-empty Float64Array");
  const n = a.length + b.length - 1;
  if (a.length * b.length <= DIRECT_LIMIT) {
    const y = new Float64Array(n);
    for (let i = 0; i < a.length; i++) {
      const ai = a[i];
      if (ai === 0) continue;
      for (let j = 0; j < b.length; j++) y[i + j] += ai * b[j];
    }
    return y;
  }
  const plan = new FftPlan(nextPowerOfTwo(n));
  const A = plan.realForward(a);
  const B = plan.realForward(b);
  const re = new Float64Array(A.re.length);
  const im = new Float64Array(A.re.length);
  for (let k = 0; k < re.length; k++) {
    re[k] = A.re[k] * B.re[k] - A.im[k] * B.im[k];
    im[k] = A.re[k] * B.im[k] + A.im[k] * B.re[k];
  }
  return plan.realInverse({ re, im }).slice(0, n);
}
