/**
 * Dense LU factorisation with partial pivoting (Doolittle, row pivoting; Golub & Van Loan, "Matrix
 * Computations", 4th ed. 2013, Algorithm 3.4.1) and in-place forward/back substitution. Nets have tens
 * of nodes, so a dense matrix beats sparse bookkeeping; the factors are computed once per (circuit, step).
 */

export interface LuFactors {
  n: number;
  /** L (unit diagonal, below) and U (on and above the diagonal), row-major n×n. */
  lu: Float64Array;
  /** Row i of the factored matrix is row perm[i] of the original. */
  perm: Int32Array;
}

/**
 * Factors the row-major n×n matrix `a` (copied, not modified). Returns null when a pivot is smaller
 * than 1e-13 times the largest entry of the matrix (numerically singular).
 */
export function luFactor(a: Float64Array, n: number): LuFactors | null {
  const lu = a.slice();
  const perm = new Int32Array(n);
  let scale = 0;
  for (let i = 0; i < n * n; i++) scale = Math.max(scale, Math.abs(lu[i]));
  if (n > 0 && scale === 0) return null;
  for (let i = 0; i < n; i++) perm[i] = i;
  for (let k = 0; k < n; k++) {
    let p = k;
    let best = Math.abs(lu[k * n + k]);
    for (let i = k + 1; i < n; i++) {
      const v = Math.abs(lu[i * n + k]);
      if (v > best) {
        best = v;
        p = i;
      }
    }
    if (best <= 1e-13 * scale) return null;
    if (p !== k) {
      for (let j = 0; j < n; j++) {
        const t = lu[k * n + j];
        lu[k * n + j] = lu[p * n + j];
        lu[p * n + j] = t;
      }
      const t = perm[k];
      perm[k] = perm[p];
      perm[p] = t;
    }
    const pivot = lu[k * n + k];
    for (let i = k + 1; i < n; i++) {
      const f = (lu[i * n + k] /= pivot);
      if (f === 0) continue;
      for (let j = k + 1; j < n; j++) lu[i * n + j] -= f * lu[k * n + j];
    }
  }
  return { n, lu, perm };
}

/**
 * For a matrix luFactor refused: the column (unknown) whose pivot vanished, found by repeating the
 * same elimination; -1 when the matrix factors after all. Only for messages (it allocates).
 */
export function singularColumn(a: Float64Array, n: number): number {
  const lu = a.slice();
  let scale = 0;
  for (let i = 0; i < n * n; i++) scale = Math.max(scale, Math.abs(lu[i]));
  if (n > 0 && scale === 0) return 0;
  for (let k = 0; k < n; k++) {
    let p = k;
    let best = Math.abs(lu[k * n + k]);
    for (let i = k + 1; i < n; i++) {
      const v = Math.abs(lu[i * n + k]);
      if (v > best) {
        best = v;
        p = i;
      }
    }
    if (best <= 1e-13 * scale) return k;
    if (p !== k) {
      for (let j = 0; j < n; j++) {
        const t = lu[k * n + j];
        lu[k * n + j] = lu[p * n + j];
        lu[p * n + j] = t;
      }
    }
    const pivot = lu[k * n + k];
    for (let i = k + 1; i < n; i++) {
      const f = (lu[i * n + k] /= pivot);
      if (f === 0) continue;
      for (let j = k + 1; j < n; j++) lu[i * n + j] -= f * lu[k * n + j];
    }
  }
  return -1;
}

/** Solves A x = b with the factors; `b` is read, `x` written (distinct arrays, length >= n). No allocation. */
export function luSolve(f: LuFactors, b: Float64Array, x: Float64Array): void {
  const { n, lu, perm } = f;
  for (let i = 0; i < n; i++) {
    let s = b[perm[i]];
    const row = i * n;
    for (let j = 0; j < i; j++) s -= lu[row + j] * x[j];
    x[i] = s;
  }
  for (let i = n - 1; i >= 0; i--) {
    let s = x[i];
    const row = i * n;
    for (let j = i + 1; j < n; j++) s -= lu[row + j] * x[j];
    x[i] = s / lu[row + i];
  }
}

/**
 * The factors with their zeros dropped (compressed rows), for substitution that skips them. Net
 * matrices are very sparse: ends of lines are not coupled through the matrix (method of
 * characteristics), so most rows hold only a diagonal entry and the factors stay sparse.
 */
export interface SparseLu {
  n: number;
  perm: Int32Array;
  /** Row i of L (strictly below the diagonal): columns lCol[lStart[i] .. lStart[i+1]), values lVal. */
  lStart: Int32Array;
  lCol: Int32Array;
  lVal: Float64Array;
  /** Row i of U (strictly above the diagonal), same layout. */
  uStart: Int32Array;
  uCol: Int32Array;
  uVal: Float64Array;
  /** 1 / U[i][i]. */
  invDiag: Float64Array;
}

export function sparsify(f: LuFactors): SparseLu {
  const { n, lu, perm } = f;
  const lStart = new Int32Array(n + 1);
  const uStart = new Int32Array(n + 1);
  const lc: number[] = [];
  const lv: number[] = [];
  const uc: number[] = [];
  const uv: number[] = [];
  const invDiag = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    lStart[i] = lc.length;
    uStart[i] = uc.length;
    for (let j = 0; j < n; j++) {
      const x = lu[i * n + j];
      if (x === 0) continue;
      if (j < i) { lc.push(j); lv.push(x); }
      else if (j > i) { uc.push(j); uv.push(x); }
    }
    invDiag[i] = 1 / lu[i * n + i];
  }
  lStart[n] = lc.length;
  uStart[n] = uc.length;
  return {
    n, perm, lStart, lCol: Int32Array.from(lc), lVal: Float64Array.from(lv),
    uStart, uCol: Int32Array.from(uc), uVal: Float64Array.from(uv), invDiag,
  };
}

/** Solves A x = b with sparse factors; `b` read, `x` written (distinct arrays). No allocation. */
export function sparseLuSolve(f: SparseLu, b: Float64Array, x: Float64Array): void {
  const { n, perm, lStart, lCol, lVal, uStart, uCol, uVal, invDiag } = f;
  for (let i = 0; i < n; i++) {
    let s = b[perm[i]];
    for (let p = lStart[i], end = lStart[i + 1]; p < end; p++) s -= lVal[p] * x[lCol[p]];
    x[i] = s;
  }
  for (let i = n - 1; i >= 0; i--) {
    let s = x[i];
    for (let p = uStart[i], end = uStart[i + 1]; p < end; p++) s -= uVal[p] * x[uCol[p]];
    x[i] = s * invDiag[i];
  }
}
