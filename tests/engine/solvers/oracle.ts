// Test oracle: Gaussian elimination with partial pivoting on small dense systems (no library).
export function solveDense(a: number[][], b: number[]): number[] {
  const n = b.length;
  const m = a.map((row, i) => [...row, b[i]]);
  for (let col = 0; col < n; col++) {
    let piv = col;
    for (let r = col + 1; r < n; r++) if (Math.abs(m[r][col]) > Math.abs(m[piv][col])) piv = r;
    [m[col], m[piv]] = [m[piv], m[col]];
    for (let r = col + 1; r < n; r++) {
      const f = m[r][col] / m[col][col];
      for (let c = col; c <= n; c++) m[r][c] -= f * m[col][c];
    }
  }
  const x = new Array<number>(n).fill(0);
  for (let r = n - 1; r >= 0; r--) {
    let s = m[r][n];
    for (let c = r + 1; c < n; c++) s -= m[r][c] * x[c];
    x[r] = s / m[r][r];
  }
  return x;
}

/** Normal equations (AᵀA + λI)·x = Aᵀb, solved by {@link solveDense}. */
export function normalEquations(a: number[][], b: number[], lambda = 0): number[] {
  const n = a[0].length;
  const ata = Array.from({ length: n }, (_, i) =>
    Array.from({ length: n }, (_, j) => a.reduce((s, row) => s + row[i] * row[j], 0) + (i === j ? lambda : 0)),
  );
  const atb = Array.from({ length: n }, (_, i) => a.reduce((s, row, r) => s + row[i] * b[r], 0));
  return solveDense(ata, atb);
}
