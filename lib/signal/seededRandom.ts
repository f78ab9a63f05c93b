// Reproducible pseudo-random numbers for adaptation runs and tests: same seed, same sequence.

/** A seeded generator of uniform and Gaussian variates. */
export interface SeededRandom {
  /** Uniform in [0, 1). */
  uniform(): number;
  /** Standard normal (mean 0, variance 1). */
  normal(): number;
  /** +1 or −1 with equal probability. */
  sign(): number;
}

/**
 * A generator seeded by an integer: mulberry32 for uniforms (period 2^32), Box–Muller for normals.
 * Not cryptographic.
 * @see Box & Muller, "A note on the generation of random normal deviates", Ann. Math. Stat. 29 (1958).
 */
export function seededRandom(seed: number): SeededRandom {
  if (!Number.isInteger(seed)) throw new RangeError(`seed must be an integer, got ${String(seed)}`);
  let state = seed >>> 0;
  let spare: number | null = null;
  const uniform = (): number => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const normal = (): number => {
    if (spare !== null) {
      const s = spare;
      spare = null;
      return s;
    }
    let u = 0;
    while (u === 0) u = uniform();
    const v = uniform();
    const r = Math.sqrt(-2 * Math.log(u));
    spare = r * Math.sin(2 * Math.PI * v);
    return r * Math.cos(2 * Math.PI * v);
  };
  return { uniform, normal, sign: () => (uniform() < 0.5 ? -1 : 1) };
}
