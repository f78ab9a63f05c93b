// The one place that touches fmin: its UMD build registers `globalThis.fmin` when imported for its
// side effect (it has no ES module exports). fmin 0.0.4's build assigns an undeclared loop variable
// in the simplex shrink step, which throws in strict (ES module) code, so runs here never shrink:
// a run ends where it would shrink and restarts from its best point with a halved simplex.
import "fmin";

/** The part of fmin's API used here. */
interface FminApi {
  nelderMead(
    f: (x: number[]) => number,
    x0: number[],
    parameters?: {
      maxIterations?: number;
      minErrorDelta?: number;
      zeroDelta?: number;
      nonZeroDelta?: number;
      sigma?: number;
    },
  ): { x: number[]; fx: number };
}

/** Options of {@link nelderMead}. */
export interface NelderMeadOptions {
  /** Largest number of iterations over all restarts (default 200 per dimension). */
  readonly maxIterations?: number;
  /** Largest number of restarts with a halved simplex (default 8). */
  readonly restarts?: number;
  /** Stop when the simplex's values differ by less than this (default 1e-9). */
  readonly minErrorDelta?: number;
  /** Initial simplex: a zero coordinate moves by this (default 0.001) … */
  readonly zeroDelta?: number;
  /** … a non-zero one is multiplied by this (default 1.05). */
  readonly nonZeroDelta?: number;
}

/**
 * Minimizes `f` from `x0` with the Nelder–Mead downhill simplex (fmin's implementation), restarted
 * from the best point with a halved initial simplex whenever a run would shrink, until a restart no
 * longer improves the value or the iteration budget is spent.
 *
 * @param f - objective; must return a finite number for every point it is given.
 * @param x0 - starting point (non-empty, finite).
 * @returns the best point found and its value.
 * @see J. A. Nelder and R. Mead, "A simplex method for function minimization", The Computer
 *   Journal 7(4), 1965.
 */
export function nelderMead(
  f: (x: readonly number[]) => number,
  x0: readonly number[],
  options: NelderMeadOptions = {},
): { x: number[]; fx: number } {
  if (typeof f !== "function") throw new TypeError("f must be a function");
  if (!Array.isArray(x0) || x0.length === 0) throw new RangeError("x0 must be a non-empty array");
  x0.forEach((v, i) => {
    if (!Number.isFinite(v)) throw new RangeError(`x0[${i}] must be finite, got ${v}`);
  });
  // The UMD build's global has no type declaration (see the top of this file).
  const api = (globalThis as unknown as { fmin?: FminApi }).fmin;
  if (api === undefined || typeof api.nelderMead !== "function") {
    throw new TypeError("the fmin package did not register its API (globalThis.fmin)");
  }
  const checked = (x: number[]): number => {
    const v = f(x);
    if (!Number.isFinite(v)) throw new RangeError(`the objective returned ${v} at [${x.join(", ")}]`);
    return v;
  };
  const budget = options.maxIterations ?? 200 * x0.length;
  const restarts = options.restarts ?? 8;
  const minErrorDelta = options.minErrorDelta ?? 1e-9;
  let zeroDelta = options.zeroDelta ?? 0.001;
  let nonZeroDelta = options.nonZeroDelta ?? 1.05;
  let calls = 0;
  const counted = (x: number[]): number => {
    calls++;
    return checked(x);
  };
  let best = { x: Array.from(x0), fx: Number.POSITIVE_INFINITY };
  for (let r = 0; r <= restarts && calls < budget; r++) {
    const run = api.nelderMead(counted, best.x.slice(), {
      maxIterations: Math.max(1, budget - calls),
      minErrorDelta,
      zeroDelta,
      nonZeroDelta,
      sigma: 1,
    });
    const improved = run.fx < best.fx - minErrorDelta;
    if (run.fx < best.fx) best = { x: Array.from(run.x), fx: run.fx };
    if (!improved && r > 0) break;
    zeroDelta /= 2;
    nonZeroDelta = 1 + (nonZeroDelta - 1) / 2;
  }
  return best;
}
