// FFT plans over fft.js: made once per size, run many times, with real-input helpers.
import FFT from "fft.js";

/** A complex sequence split into real and imaginary parts of equal length. */
export interface ComplexArray {
  readonly re: Float64Array;
  readonly im: Float64Array;
}

/** Smallest power of two ≥ `n` (and ≥ 2). */
export function nextPowerOfTwo(n: number): number {
  if (!Number.isFinite(n) || n < 0) throw new RangeError(`n must be a finite number ≥ 0, got ${String(n)}`);
  let p = 2;
  while (p < n) p *= 2;
  return p;
}

/**
 * A discrete Fourier transform of one power-of-two size, with the twiddle table built once.
 * Forward: `X[k] = Σ x[n]·exp(−i2πkn/N)`; inverse: `x[n] = (1/N)·Σ X[k]·exp(+i2πkn/N)`.
 * Scratch buffers are reused between calls, so a plan must not be shared by concurrent callers
 * (JavaScript's single thread makes this safe within one worker). Outputs are always fresh arrays.
 *
 * @see Cooley & Tukey, "An algorithm for the machine calculation of complex Fourier series",
 *   Math. Comp. 19 (1965); the radix-4 implementation is the fft.js package.
 */
export class FftPlan {
  /** Transform length N (power of two ≥ 2). */
  readonly size: number;
  readonly #fft: FFT;
  readonly #a: Float64Array;
  readonly #b: Float64Array;
  readonly #real: Float64Array;

  constructor(size: number) {
    if (!Number.isInteger(size) || size < 2 || (size & (size - 1)) !== 0 || size > 1 << 26) {
      throw new RangeError(`size must be a power of two 2…2^26, got ${String(size)}`);
    }
    this.size = size;
    this.#fft = new FFT(size);
    this.#a = new Float64Array(2 * size);
    this.#b = new Float64Array(2 * size);
    this.#real = new Float64Array(size);
  }

  /** Forward transform of a complex sequence of length N. */
  forward(x: ComplexArray): ComplexArray {
    this.#load(x, "x");
    this.#fft.transform(this.#b, this.#a);
    return this.#unload();
  }

  /** Inverse transform (with the 1/N factor) of a complex spectrum of length N. */
  inverse(X: ComplexArray): ComplexArray {
    this.#load(X, "X");
    this.#fft.inverseTransform(this.#b, this.#a);
    return this.#unload();
  }

  /**
   * Forward transform of a real sequence of length ≤ N (zero-padded to N).
   * @returns the half spectrum, bins 0 … N/2 (length N/2 + 1); the rest follows by symmetry.
   */
  realForward(x: Float64Array): ComplexArray {
    const n = this.size;
    if (!(x instanceof Float64Array) || x.length > n) {
      throw new RangeError(`x must be a Float64Array of length ≤ ${n}`);
    }
    const r = this.#real;
    r.set(x);
    r.fill(0, x.length);
    this.#fft.realTransform(this.#b, r);
    const half = n / 2 + 1;
    const re = new Float64Array(half);
    const im = new Float64Array(half);
    for (let k = 0; k < half; k++) {
      re[k] = this.#b[2 * k];
      im[k] = this.#b[2 * k + 1];
    }
    return { re, im };
  }

  /**
   * Real sequence of length N whose spectrum is the Hermitian extension of the half spectrum
   * `X` (bins 0 … N/2). The imaginary parts of bins 0 and N/2 are ignored, as a real signal has none.
   */
  realInverse(X: ComplexArray): Float64Array {
    const n = this.size;
    const half = n / 2 + 1;
    if (X.re.length !== half || X.im.length !== half) {
      throw new RangeError(`X must hold ${half} bins (0 … N/2), got ${X.re.length}`);
    }
    const a = this.#a;
    a[0] = X.re[0];
    a[1] = 0;
    a[n] = X.re[n / 2];
    a[n + 1] = 0;
    for (let k = 1; k < n / 2; k++) {
      a[2 * k] = X.re[k];
      a[2 * k + 1] = X.im[k];
      a[2 * (n - k)] = X.re[k];
      a[2 * (n - k) + 1] = -X.im[k];
    }
    this.#fft.inverseTransform(this.#b, a);
    const out = new Float64Array(n);
    for (let i = 0; i < n; i++) out[i] = this.#b[2 * i];
    return out;
  }

  #load(x: ComplexArray, name: string): void {
    const n = this.size;
    if (x.re.length !== n || x.im.length !== n) {
      throw new RangeError(`${name} must have re and im of length ${n}`);
    }
    const a = this.#a;
    for (let i = 0; i < n; i++) {
      a[2 * i] = x.re[i];
      a[2 * i + 1] = x.im[i];
    }
  }

  #unload(): ComplexArray {
    const n = this.size;
    const re = new Float64Array(n);
    const im = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      re[i] = this.#b[2 * i];
      im[i] = this.#b[2 * i + 1];
    }
    return { re, im };
  }
}

/** A plan for transforms of length `size` (a power of two). */
export function createFftPlan(size: number): FftPlan {
  return new FftPlan(size);
}
