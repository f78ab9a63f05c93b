// The Wiener–Hopf solution of a linear estimator: optimum weights and minimum mean-square error.
import { CholeskyDecomposition, EigenvalueDecomposition, LuDecomposition, Matrix } from "ml-matrix";

/** Optimum weights and the minimum MSE. */
export interface WienerSolution {
  /** `w = R⁻¹·p`. */
  readonly w: Float64Array;
  /** `Jmin = σd² − pᵀ·w`. */
  readonly jMin: number;
}

const toMatrix = (r: Matrix | ArrayLike<ArrayLike<number>>, name: string): Matrix => {
  const m = r instanceof Matrix ? r : new Matrix(Array.from(r, (row) => Array.from(row)));
  if (!m.isSquare() || m.rows === 0) throw new RangeError(`${name} must be a non-empty square matrix`);
  for (let i = 0; i < m.rows; i++) {
    for (let j = 0; j < m.columns; j++) {
      if (!Number.isFinite(m.get(i, j))) throw new RangeError(`${name}[${i}][${j}] must be finite`);
    }
  }
  return m;
};

/**
 * Solves the Wiener–Hopf equations `R·w = p` for a correlation matrix `R` (symmetric, positive
 * definite; Cholesky, with LU as a fallback for a merely non-singular R) and returns the
 * minimum mean-square error `σd² − pᵀw`.
 *
 * @param R - input correlation matrix (n × n).
 * @param p - cross-correlation of input and desired response (length n).
 * @param varianceD - variance of the desired response σd².
 * @see Haykin, *Adaptive Filter Theory*, 4th ed., ch. 2 (Wiener filters).
 */
export function wienerSolve(
  R: Matrix | ArrayLike<ArrayLike<number>>,
  p: ArrayLike<number>,
  varianceD: number,
): WienerSolution {
  const r = toMatrix(R, "R");
  if (p.length !== r.rows) throw new RangeError(`p must have ${r.rows} entries, got ${p.length}`);
  for (let i = 0; i < p.length; i++) if (!Number.isFinite(p[i])) throw new RangeError(`p[${i}] must be finite`);
  if (!Number.isFinite(varianceD)) throw new RangeError(`varianceD must be finite, got ${String(varianceD)}`);
  const pv = Matrix.columnVector(Array.from(p));
  const chol = r.isSymmetric() ? new CholeskyDecomposition(r) : null;
  let w: Matrix;
  if (chol !== null && chol.isPositiveDefinite()) {
    w = chol.solve(pv);
  } else {
    const lu = new LuDecomposition(r);
    if (lu.isSingular()) throw new RangeError("R is singular; the Wiener solution is not unique");
    w = lu.solve(pv);
  }
  const wv = Float64Array.from(w.getColumn(0));
  let pw = 0;
  for (let i = 0; i < wv.length; i++) pw += p[i] * wv[i];
  return { w: wv, jMin: varianceD - pw };
}

/**
 * Step-size bounds of LMS for input correlation `R`: mean convergence needs `0 < μ < 2/λmax`;
 * `2/tr(R)` is the conservative bound that needs no eigenvalues.
 *
 * @returns `{ eigenvalues (ascending), meanBound: 2/λmax, traceBound: 2/tr(R) }`.
 * @see Haykin, *Adaptive Filter Theory*, 4th ed., LMS chapter.
 */
export function lmsStepBounds(R: Matrix | ArrayLike<ArrayLike<number>>): {
  eigenvalues: Float64Array;
  meanBound: number;
  traceBound: number;
} {
  const r = toMatrix(R, "R");
  const eig = new EigenvalueDecomposition(r, { assumeSymmetric: true });
  const eigenvalues = Float64Array.from(eig.realEigenvalues).sort();
  return { eigenvalues, meanBound: 2 / eigenvalues[eigenvalues.length - 1], traceBound: 2 / r.trace() };
}
