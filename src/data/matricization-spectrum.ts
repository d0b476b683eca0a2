/**
 * The squared singular values of the matricisation (1/n)·Φ_A W Φ_Bᵀ of the empirical data tensor,
 * from the two sides' Cholesky factors: they are the singular values of C = L_Aᵀ W L_B (up to the
 * factor 1/n, which normalisation removes), taken here as the eigenvalues of the symmetric
 * C Cᵀ or Cᵀ C, whichever is smaller (eigenvalues only, `symmetric-eigenvalues.ts`).
 * Derivation in DEVELOPERS.md.
 */
import type { CholeskyFactor } from './pivoted-cholesky.js';
import { symmetricEigenvalues } from './symmetric-eigenvalues.js';

/**
 * Eigenvalues (largest first, clipped at 0) of C Cᵀ, C = L_Aᵀ diag(w) L_B; `weights` undefined
 * means all 1.
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
  rowProducts(weighted, rs, large.columns, rl, n, c, false);
  // M = C Cᵀ (rs × rs), symmetric by construction.
  const m = new Float64Array(rs * rs);
  rowProducts(c, rs, c, rs, rl, m, true);
  const out = symmetricEigenvalues(m, rs);
  for (let i = 0; i < rs; i++) if (!(out[i]! > 0)) out[i] = 0;
  out.sort();
  out.reverse();
  return out;
}

/**
 * out[i·yRows + j] = Σ_k x[i·length + k]·y[j·length + k] (the products of the rows of x with the
 * rows of y); with `symmetric` (x = y), only j ≤ i is computed and mirrored. Each product has four
 * running sums (term k into sum k mod 4, added up at the end), so that the additions overlap; two
 * rows of x against two rows of y at a time, so that each value read serves two products.
 */
function rowProducts(x: Float64Array, xRows: number, y: Float64Array, yRows: number, length: number, out: Float64Array, symmetric: boolean): void {
  const end4 = length - (length % 4);
  let i = 0;
  for (; i + 2 <= xRows; i += 2) {
    const x0 = i * length;
    const x1 = x0 + length;
    const jEnd = symmetric ? i + 2 : yRows;
    let j = 0;
    for (; j + 2 <= jEnd; j += 2) {
      const y0 = j * length;
      const y1 = y0 + length;
      // Running sums: a for x row i · y row j, b for i · j + 1, c for i + 1 · j, d for i + 1 · j + 1.
      let a0 = 0;
      let a1 = 0;
      let a2 = 0;
      let a3 = 0;
      let b0 = 0;
      let b1 = 0;
      let b2 = 0;
      let b3 = 0;
      let c0 = 0;
      let c1 = 0;
      let c2 = 0;
      let c3 = 0;
      let d0 = 0;
      let d1 = 0;
      let d2 = 0;
      let d3 = 0;
      let k = 0;
      for (; k < end4; k += 4) {
        let p = x[x0 + k]!;
        let q = x[x1 + k]!;
        let u = y[y0 + k]!;
        let v = y[y1 + k]!;
        a0 += p * u;
        b0 += p * v;
        c0 += q * u;
        d0 += q * v;
        p = x[x0 + k + 1]!;
        q = x[x1 + k + 1]!;
        u = y[y0 + k + 1]!;
        v = y[y1 + k + 1]!;
        a1 += p * u;
        b1 += p * v;
        c1 += q * u;
        d1 += q * v;
        p = x[x0 + k + 2]!;
        q = x[x1 + k + 2]!;
        u = y[y0 + k + 2]!;
        v = y[y1 + k + 2]!;
        a2 += p * u;
        b2 += p * v;
        c2 += q * u;
        d2 += q * v;
        p = x[x0 + k + 3]!;
        q = x[x1 + k + 3]!;
        u = y[y0 + k + 3]!;
        v = y[y1 + k + 3]!;
        a3 += p * u;
        b3 += p * v;
        c3 += q * u;
        d3 += q * v;
      }
      for (; k < length; k++) {
        const p = x[x0 + k]!;
        const q = x[x1 + k]!;
        const u = y[y0 + k]!;
        const v = y[y1 + k]!;
        a0 += p * u;
        b0 += p * v;
        c0 += q * u;
        d0 += q * v;
      }
      out[i * yRows + j] = a0 + a1 + a2 + a3;
      out[i * yRows + j + 1] = b0 + b1 + b2 + b3;
      out[(i + 1) * yRows + j] = c0 + c1 + c2 + c3;
      out[(i + 1) * yRows + j + 1] = d0 + d1 + d2 + d3;
    }
    for (; j < jEnd; j++) {
      out[i * yRows + j] = dot(x, x0, y, j * length, length);
      out[(i + 1) * yRows + j] = dot(x, x1, y, j * length, length);
    }
  }
  for (; i < xRows; i++) {
    const jEnd = symmetric ? i + 1 : yRows;
    for (let j = 0; j < jEnd; j++) out[i * yRows + j] = dot(x, i * length, y, j * length, length);
  }
  if (symmetric) {
    for (let r = 0; r < xRows; r++) for (let t = 0; t < r; t++) out[t * yRows + r] = out[r * yRows + t]!;
  }
}

/** Σ_i x[xi + i]·y[yi + i], with four running sums so that the additions overlap. */
function dot(x: Float64Array, xi: number, y: Float64Array, yi: number, length: number): number {
  let s0 = 0;
  let s1 = 0;
  let s2 = 0;
  let s3 = 0;
  let i = 0;
  for (; i + 4 <= length; i += 4) {
    s0 += x[xi + i]! * y[yi + i]!;
    s1 += x[xi + i + 1]! * y[yi + i + 1]!;
    s2 += x[xi + i + 2]! * y[yi + i + 2]!;
    s3 += x[xi + i + 3]! * y[yi + i + 3]!;
  }
  for (; i < length; i++) s0 += x[xi + i]! * y[yi + i]!;
  return s0 + s1 + s2 + s3;
}
