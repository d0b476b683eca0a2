/**
 * The squared singular values of the matricisation (1/n)·Φ_A W Φ_Bᵀ of the empirical data tensor,
 * from the two sides' Cholesky factors: they are the singular values of C = L_Aᵀ W L_B (up to the
 * factor 1/n, which normalisation removes), taken from ml-matrix's singular value decomposition of
 * C without its singular vectors. Derivation in DEVELOPERS.md.
 */
import type { CholeskyFactor } from './pivoted-cholesky.js';
import { Matrix, SingularValueDecomposition } from 'ml-matrix';

/**
 * Squared singular values (largest first) of C = L_Aᵀ diag(w) L_B, i.e. the eigenvalues of C Cᵀ;
 * `weights` undefined means all 1.
 */
export function matricizationSpectrum(a: CholeskyFactor, b: CholeskyFactor, weights?: Float64Array): Float64Array {
  const n = a.n;
  if (b.n !== n) throw new RangeError('matricizationSpectrum: factors of different sizes');
  const [small, large] = a.rank <= b.rank ? [a, b] : [b, a];
  const rs = small.rank;
  const rl = large.rank;
  if (rs === 0) return new Float64Array(0);
  // C (rs × rl), C[i][j] = Σ_s small_i[s]·w_s·large_j[s].
  let weighted = small.columns;
  if (weights) {
    weighted = new Float64Array(rs * n);
    for (let i = 0; i < rs; i++) {
      for (let s = 0; s < n; s++) weighted[i * n + s] = small.columns[i * n + s]! * weights[s]!;
    }
  }
  const c = new Float64Array(rs * rl);
  rowProducts(weighted, rs, large.columns, rl, n, c);
  const svd = new SingularValueDecomposition(Matrix.from1DArray(rs, rl, c), { computeLeftSingularVectors: false, computeRightSingularVectors: false, autoTranspose: true });
  const sv = svd.diagonal;
  const out = new Float64Array(rs);
  for (let i = 0; i < rs; i++) out[i] = sv[i]! * sv[i]!;
  out.sort();
  out.reverse();
  return out;
}

/**
 * out[i·yRows + j] = Σ_k x[i·length + k]·y[j·length + k] (the products of the rows of x with the
 * rows of y, all finite).
 *
 * Each sum is taken as a dot product with four running sums would take it — term k into sum
 * k mod 4 (the terms past the last multiple of 4 into sum 0), the four added in order at the
 * end — but without the terms whose x value is 0: such a term is ±0, and adding ±0 leaves a sum
 * that started at +0 unchanged. A column of a pivoted Cholesky factor is zero on the rows pivoted
 * before it, so half the terms of C go. Row i's other terms are listed once, by running sum, and
 * serve eight rows of y at a time.
 */
function rowProducts(x: Float64Array, xRows: number, y: Float64Array, yRows: number, length: number, out: Float64Array): void {
  const end4 = length - (length % 4);
  const index = new Int32Array(length);
  const value = new Float64Array(length);
  const start = new Int32Array(5);
  for (let i = 0; i < xRows; i++) {
    const row = i * length;
    let count = 0;
    for (let b = 0; b < 4; b++) {
      start[b] = count;
      for (let k = b; k < end4; k += 4) {
        const v = x[row + k]!;
        if (v === 0) continue;
        index[count] = k;
        value[count++] = v;
      }
      if (b > 0) continue;
      for (let k = end4; k < length; k++) {
        const v = x[row + k]!;
        if (v === 0) continue;
        index[count] = k;
        value[count++] = v;
      }
    }
    start[4] = count;
    const jEnd = yRows;
    let j = 0;
    for (; j + 8 <= jEnd; j += 8) eightProducts(index, value, start, y, j * length, length, out, i * yRows + j);
    for (; j < jEnd; j++) out[i * yRows + j] = oneProduct(index, value, start, y, j * length);
  }
}

/** The listed terms against rows of y starting at y[from], y[from + length], … (eight of them), into out[at …]. */
function eightProducts(index: Int32Array, value: Float64Array, start: Int32Array, y: Float64Array, from: number, length: number, out: Float64Array, at: number): void {
  let r0 = 0;
  let r1 = 0;
  let r2 = 0;
  let r3 = 0;
  let r4 = 0;
  let r5 = 0;
  let r6 = 0;
  let r7 = 0;
  for (let b = 0; b < 4; b++) {
    let t0 = 0;
    let t1 = 0;
    let t2 = 0;
    let t3 = 0;
    let t4 = 0;
    let t5 = 0;
    let t6 = 0;
    let t7 = 0;
    for (let q = start[b]!, end = start[b + 1]!; q < end; q++) {
      const k = from + index[q]!;
      const v = value[q]!;
      t0 += v * y[k]!;
      t1 += v * y[k + length]!;
      t2 += v * y[k + 2 * length]!;
      t3 += v * y[k + 3 * length]!;
      t4 += v * y[k + 4 * length]!;
      t5 += v * y[k + 5 * length]!;
      t6 += v * y[k + 6 * length]!;
      t7 += v * y[k + 7 * length]!;
    }
    if (b === 0) {
      r0 = t0;
      r1 = t1;
      r2 = t2;
      r3 = t3;
      r4 = t4;
      r5 = t5;
      r6 = t6;
      r7 = t7;
    } else {
      r0 += t0;
      r1 += t1;
      r2 += t2;
      r3 += t3;
      r4 += t4;
      r5 += t5;
      r6 += t6;
      r7 += t7;
    }
  }
  out[at] = r0;
  out[at + 1] = r1;
  out[at + 2] = r2;
  out[at + 3] = r3;
  out[at + 4] = r4;
  out[at + 5] = r5;
  out[at + 6] = r6;
  out[at + 7] = r7;
}

/** The listed terms against the row of y starting at y[from]. */
function oneProduct(index: Int32Array, value: Float64Array, start: Int32Array, y: Float64Array, from: number): number {
  let r = 0;
  for (let b = 0; b < 4; b++) {
    let t = 0;
    for (let q = start[b]!, end = start[b + 1]!; q < end; q++) t += value[q]! * y[from + index[q]!]!;
    r = b === 0 ? t : r + t;
  }
  return r;
}
