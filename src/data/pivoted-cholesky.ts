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
 *
 * Column k of L is zero on the rows pivoted before step k, so the rows are kept in pivot order
 * while the factor is built (row `pos` of the working factor is row `order[pos]` of G): the rows
 * still to pivot are then the contiguous tail, and step k updates only its n − k − 1 entries
 * (about n·r²/2 − r³/3 multiplications instead of n·r²/2 over every row). Each entry is computed by
 * the same operations in the same order as row by row in G's order, so the factor is the same; it
 * is returned in G's row order.
 */
export function pivotedCholesky(g: Float64Array, n: number, stride: number = n): CholeskyFactor {
  const d = new Float64Array(n);
  const order = new Int32Array(n);
  let maxDiagonal = 0;
  for (let i = 0; i < n; i++) {
    order[i] = i;
    d[i] = g[i * stride + i]!;
    if (d[i]! > maxDiagonal) maxDiagonal = d[i]!;
  }
  const work = new Float64Array(n * n);
  const used = new Int32Array(n);
  const stop = RELATIVE_TOLERANCE * maxDiagonal;
  let rank = 0;
  for (; rank < n; rank++) {
    // The largest remaining diagonal entry; among equal ones, the first row of G.
    let pick = -1;
    let best = stop;
    for (let pos = rank; pos < n; pos++) {
      const v = d[pos]!;
      if (v > best || (v === best && pick >= 0 && order[pos]! < order[pick]!)) {
        best = v;
        pick = pos;
      }
    }
    if (pick < 0) break;
    if (pick !== rank) swapRows(work, d, order, n, rank, rank, pick);
    const j = order[rank]!;
    // Column `rank` of L on the rows not yet pivoted: (G[:, j] − Σ_m L[:, m]·L[j, m]) / √d[j].
    const base = rank * n;
    for (let pos = rank + 1; pos < n; pos++) work[base + pos] = g[order[pos]! * stride + j]!;
    // The columns m with L[j, m] ≠ 0, in order, subtracted four at a time (one pass over the
    // column being built per four, each entry still updated in the order of m).
    let terms = 0;
    for (let m = 0; m < rank; m++) if (work[m * n + rank] !== 0) used[terms++] = m;
    let t = 0;
    for (; t + 4 <= terms; t += 4) {
      const p0 = used[t]! * n;
      const p1 = used[t + 1]! * n;
      const p2 = used[t + 2]! * n;
      const p3 = used[t + 3]! * n;
      const l0 = work[p0 + rank]!;
      const l1 = work[p1 + rank]!;
      const l2 = work[p2 + rank]!;
      const l3 = work[p3 + rank]!;
      for (let pos = rank + 1; pos < n; pos++) {
        work[base + pos] = work[base + pos]! - work[p0 + pos]! * l0 - work[p1 + pos]! * l1 - work[p2 + pos]! * l2 - work[p3 + pos]! * l3;
      }
    }
    for (; t < terms; t++) {
      const prev = used[t]! * n;
      const lj = work[prev + rank]!;
      for (let pos = rank + 1; pos < n; pos++) work[base + pos]! -= work[prev + pos]! * lj;
    }
    const inverse = 1 / Math.sqrt(best);
    for (let pos = rank + 1; pos < n; pos++) {
      const l = work[base + pos]! * inverse;
      work[base + pos] = l;
      d[pos]! -= l * l;
    }
    work[base + rank] = Math.sqrt(best);
  }
  const columns = new Float64Array(rank * n);
  for (let m = 0; m < rank; m++) {
    const base = m * n;
    for (let pos = m; pos < n; pos++) columns[base + order[pos]!] = work[base + pos]!;
  }
  return { n, rank, columns };
}

/** Exchanges working rows p and q in the first `columns` columns, the remaining diagonal and the order. */
function swapRows(work: Float64Array, d: Float64Array, order: Int32Array, n: number, columns: number, p: number, q: number): void {
  for (let m = 0; m < columns; m++) {
    const x = work[m * n + p]!;
    work[m * n + p] = work[m * n + q]!;
    work[m * n + q] = x;
  }
  const dp = d[p]!;
  d[p] = d[q]!;
  d[q] = dp;
  const op = order[p]!;
  order[p] = order[q]!;
  order[q] = op;
}
