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
  const weighted = new Float64Array(rs * n);
  for (let i = 0; i < rs; i++) {
    for (let s = 0; s < n; s++) weighted[i * n + s] = small.columns[i * n + s]! * (weights ? weights[s]! : 1);
  }
  const c = new Float64Array(rs * rl);
  for (let i = 0; i < rs; i++) {
    for (let j = 0; j < rl; j++) {
      c[i * rl + j] = dot(weighted, i * n, large.columns, j * n, n);
    }
  }
  // M = C Cᵀ (rs × rs), symmetric by construction.
  const m = new Float64Array(rs * rs);
  for (let i = 0; i < rs; i++) {
    for (let k = 0; k <= i; k++) {
      const sum = dot(c, i * rl, c, k * rl, rl);
      m[i * rs + k] = sum;
      m[k * rs + i] = sum;
    }
  }
  const out = symmetricEigenvalues(m, rs);
  for (let i = 0; i < rs; i++) if (!(out[i]! > 0)) out[i] = 0;
  out.sort();
  out.reverse();
  return out;
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
