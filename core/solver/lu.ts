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
 * The elimination itself, in place and without allocation: row-pivoted Doolittle on the row-major
 * n×n `lu`, leaving L (unit diagonal, below) and U (on and above), and the row order in `perm`
 * (row i of the result is row perm[i] of the input; perm is set here). Stops at the first column
 * whose largest pivot candidate is at most `tiny` and returns that column; -1 when every pivot is
 * larger. The one copy of the loop: luFactor, singularColumn and the pads' small systems use it.
 */
export function eliminate(lu: Float64Array, n: number, perm: Int32Array, tiny: number): number {
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
    if (best <= tiny) return k;
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
  return -1;
}

/** Largest magnitude of the entries, for the singularity threshold. */
function largest(a: Float64Array, n: number): number {
  let scale = 0;
  for (let i = 0; i < n * n; i++) scale = Math.max(scale, Math.abs(a[i]));
  return scale;
}

/**
 * Factors the row-major n×n matrix `a` (copied, not modified). Returns null when a pivot is smaller
 * than 1e-13 times the largest entry of the matrix (numerically singular).
 */
export function luFactor(a: Float64Array, n: number): LuFactors | null {
  return luFactorInPlace(a.slice(), n);
}

/** luFactor without the copy: `a` becomes the factors (and is left part-eliminated when null is returned). */
export function luFactorInPlace(a: Float64Array, n: number): LuFactors | null {
  const scale = largest(a, n);
  if (n > 0 && scale === 0) return null;
  const perm = new Int32Array(n);
  return eliminate(a, n, perm, 1e-13 * scale) < 0 ? { n, lu: a, perm } : null;
}

/**
 * For a matrix luFactor refused: the column (unknown) whose pivot vanished, found by repeating the
 * same elimination; -1 when the matrix factors after all. Only for messages (it allocates).
 */
export function singularColumn(a: Float64Array, n: number): number {
  const scale = largest(a, n);
  if (n > 0 && scale === 0) return 0;
  return eliminate(a.slice(), n, new Int32Array(n), 1e-13 * scale);
}

/**
 * Forward and back substitution with factors in the layout of `eliminate`: solves A x = b, `b` read,
 * `x` written (distinct arrays, length >= n). No allocation.
 */
export function substitute(lu: Float64Array, n: number, perm: Int32Array, b: Float64Array, x: Float64Array): void {
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

/** Solves A x = b with the factors; `b` is read, `x` written (distinct arrays, length >= n). No allocation. */
export function luSolve(f: LuFactors, b: Float64Array, x: Float64Array): void {
  substitute(f.lu, f.n, f.perm, b, x);
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
  let nl = 0;
  let nu = 0;
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      if (lu[i * n + j] === 0 || j === i) continue;
      if (j < i) nl++;
      else nu++;
    }
  }
  const lCol = new Int32Array(nl);
  const lVal = new Float64Array(nl);
  const uCol = new Int32Array(nu);
  const uVal = new Float64Array(nu);
  const invDiag = new Float64Array(n);
  nl = 0;
  nu = 0;
  for (let i = 0; i < n; i++) {
    lStart[i] = nl;
    uStart[i] = nu;
    for (let j = 0; j < n; j++) {
      const x = lu[i * n + j];
      if (x === 0) continue;
      if (j < i) { lCol[nl] = j; lVal[nl++] = x; }
      else if (j > i) { uCol[nu] = j; uVal[nu++] = x; }
    }
    invDiag[i] = 1 / lu[i * n + i];
  }
  lStart[n] = nl;
  uStart[n] = nu;
  return { n, perm, lStart, lCol, lVal, uStart, uCol, uVal, invDiag };
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
