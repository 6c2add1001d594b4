// Gaussian elimination with partial pivoting on a dense complex matrix (Golub and Van Loan, Matrix Computations, 4th ed., Algorithm 3.4.1).

/**
 * Solves A·X = B in place for one dense complex system, by LU factorisation with partial (row) pivoting.
 *
 * Shapes: `a` is n×n, `b` is n×m, both row-major with interleaved re/im (`a[2 * (i * n + j)]` is Re A[i][j]).
 * On return `a` holds the LU factors (destroyed) and `b` holds X. Returns false, leaving `b` partly
 * overwritten, when a pivot is below `64 · ε · max|A|` (singular or numerically singular); the caller
 * raises its own named error, since only it knows which frequency and which part are involved.
 *
 * @example
 * const a = new Float64Array([2, 0]); const b = new Float64Array([4, 2]);
 * solveComplexInPlace(a, b, 1, 1); // b = [2, 1]: (4 + 2j) / 2
 */
export function solveComplexInPlace(a: Float64Array, b: Float64Array, n: number, m: number): boolean {
  let scale = 0;
  for (let p = 0; p < 2 * n * n; p += 2) {
    const mag = Math.hypot(a[p], a[p + 1]);
    if (mag > scale) scale = mag;
  }
  if (!(scale > 0) || !Number.isFinite(scale)) return false;
  const tiny = 64 * Number.EPSILON * scale;

  for (let k = 0; k < n; k++) {
    // Pick the largest remaining entry of column k as pivot.
    let piv = k;
    let best = -1;
    for (let i = k; i < n; i++) {
      const p = 2 * (i * n + k);
      const mag = Math.hypot(a[p], a[p + 1]);
      if (mag > best) {
        best = mag;
        piv = i;
      }
    }
    if (!(best > tiny)) return false;
    if (piv !== k) {
      swapRows(a, n, n, piv, k);
      swapRows(b, n, m, piv, k);
    }
    const pk = 2 * (k * n + k);
    const pr = a[pk];
    const pi = a[pk + 1];
    // 1 / pivot, scaled to stay safe for very large or very small pivots.
    let inr: number;
    let ini: number;
    if (Math.abs(pr) >= Math.abs(pi)) {
      const r = pi / pr;
      const d = pr + pi * r;
      inr = 1 / d;
      ini = -r / d;
    } else {
      const r = pr / pi;
      const d = pr * r + pi;
      inr = r / d;
      ini = -1 / d;
    }
    for (let i = k + 1; i < n; i++) {
      const pik = 2 * (i * n + k);
      const xr = a[pik];
      const xi = a[pik + 1];
      if (xr === 0 && xi === 0) continue;
      const lr = xr * inr - xi * ini;
      const li = xr * ini + xi * inr;
      a[pik] = lr;
      a[pik + 1] = li;
      for (let j = k + 1; j < n; j++) {
        const pkj = 2 * (k * n + j);
        const pij = 2 * (i * n + j);
        const ur = a[pkj];
        const ui = a[pkj + 1];
        a[pij] -= lr * ur - li * ui;
        a[pij + 1] -= lr * ui + li * ur;
      }
      for (let j = 0; j < m; j++) {
        const pkj = 2 * (k * m + j);
        const pij = 2 * (i * m + j);
        const ur = b[pkj];
        const ui = b[pkj + 1];
        b[pij] -= lr * ur - li * ui;
        b[pij + 1] -= lr * ui + li * ur;
      }
    }
  }
  // Back substitution with the upper factor.
  for (let i = n - 1; i >= 0; i--) {
    const pii = 2 * (i * n + i);
    const dr = a[pii];
    const di = a[pii + 1];
    const den = dr * dr + di * di;
    for (let j = 0; j < m; j++) {
      const pij = 2 * (i * m + j);
      let sr = b[pij];
      let si = b[pij + 1];
      for (let q = i + 1; q < n; q++) {
        const piq = 2 * (i * n + q);
        const pqj = 2 * (q * m + j);
        const ar = a[piq];
        const ai = a[piq + 1];
        const xr = b[pqj];
        const xi = b[pqj + 1];
        sr -= ar * xr - ai * xi;
        si -= ar * xi + ai * xr;
      }
      b[pij] = (sr * dr + si * di) / den;
      b[pij + 1] = (si * dr - sr * di) / den;
    }
  }
  for (let p = 0; p < 2 * n * m; p++) if (!Number.isFinite(b[p])) return false;
  return true;
}

function swapRows(x: Float64Array, rows: number, cols: number, r1: number, r2: number): void {
  void rows;
  const o1 = 2 * r1 * cols;
  const o2 = 2 * r2 * cols;
  for (let j = 0; j < 2 * cols; j++) {
    const t = x[o1 + j];
    x[o1 + j] = x[o2 + j];
    x[o2 + j] = t;
  }
}
