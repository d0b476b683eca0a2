/**
 * G ≈ L Lᵀ for a symmetric positive semidefinite matrix G (a Gram matrix), with L of full column
 * rank r: diagonal pivoting, stopped when the largest remaining diagonal entry is at most
 * `RELATIVE_TOLERANCE` times the largest diagonal entry of G. The remainder G − L Lᵀ is then
 * positive semidefinite with trace at most n·tolerance·max diag (Higham, "Accuracy and stability
 * of numerical algorithms", 2nd ed., §10.3). Work O(n·r²).
 */

export const RELATIVE_TOLERANCE = 1e-12;

export interface CholeskyFactor {
  /** Rows of G. */
  readonly n: number;
  /** Columns of L. */
  readonly rank: number;
  /** Column-major: column k is columns[k·n … k·n + n − 1]. */
  readonly columns: Float64Array;
}

/**
 * Factors the leading `n` × `n` block of `g` (row-major with row length `stride`), so that the
 * first half of a batch reuses the batch's Gram matrix.
 */
export function pivotedCholesky(g: Float64Array, n: number, stride: number = n): CholeskyFactor {
  const d = new Float64Array(n);
  let maxDiagonal = 0;
  for (let i = 0; i < n; i++) {
    d[i] = g[i * stride + i]!;
    if (d[i]! > maxDiagonal) maxDiagonal = d[i]!;
  }
  const columns = new Float64Array(n * n);
  const pivoted = new Uint8Array(n);
  const stop = RELATIVE_TOLERANCE * maxDiagonal;
  let rank = 0;
  for (; rank < n; rank++) {
    let j = -1;
    let best = stop;
    for (let i = 0; i < n; i++) {
      if (pivoted[i] === 0 && d[i]! > best) {
        best = d[i]!;
        j = i;
      }
    }
    if (j < 0) break;
    pivoted[j] = 1;
    // Column `rank` of L: (G[:, j] − Σ_m L[:, m]·L[j, m]) / √d[j], zero on the rows pivoted before.
    const base = rank * n;
    for (let i = 0; i < n; i++) columns[base + i] = g[i * stride + j]!;
    for (let m = 0; m < rank; m++) {
      const prev = m * n;
      const lj = columns[prev + j]!;
      if (lj === 0) continue;
      for (let i = 0; i < n; i++) columns[base + i]! -= columns[prev + i]! * lj;
    }
    const inverse = 1 / Math.sqrt(best);
    for (let i = 0; i < n; i++) {
      if (pivoted[i] === 1) {
        columns[base + i] = 0;
        continue;
      }
      const l = columns[base + i]! * inverse;
      columns[base + i] = l;
      d[i]! -= l * l;
    }
    columns[base + j] = Math.sqrt(best);
  }
  return { n, rank, columns: columns.slice(0, rank * n) };
}
