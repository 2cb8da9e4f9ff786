/**
 * Dense Gaussian elimination with partial pivoting, for the small moment-method reference solvers in
 * the stackup tests (a few hundred unknowns). Textbook algorithm (e.g. Golub & Van Loan, Matrix
 * Computations, alg. 3.4.1); written apart from the LU factorisation of core/solver/lu.ts.
 */
export function solveLinear(a: number[][], rhs: number[]): number[] {
  const n = rhs.length;
  const m = a.map((row, i) => [...row, rhs[i]]);
  for (let c = 0; c < n; c++) {
    let p = c;
    for (let r = c + 1; r < n; r++) if (Math.abs(m[r][c]) > Math.abs(m[p][c])) p = r;
    [m[c], m[p]] = [m[p], m[c]];
    for (let r = c + 1; r < n; r++) {
      const f = m[r][c] / m[c][c];
      for (let k = c; k <= n; k++) m[r][k] -= f * m[c][k];
    }
  }
  const x = new Array<number>(n).fill(0);
  for (let r = n - 1; r >= 0; r--) {
    let v = m[r][n];
    for (let k = r + 1; k < n; k++) v -= m[r][k] * x[k];
    x[r] = v / m[r][r];
  }
  return x;
}
