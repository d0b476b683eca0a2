/**
 * The pivoted Cholesky factor of Gram matrices: it reproduces G, its rank is the number of
 * distinct samples, its first pivot is the first row among equal diagonal entries, and the factor
 * of a leading block read in place is that of the block copied out. Derived here (DEVELOPERS.md,
 * "Its matricisation through Gram matrices").
 */
import { describe, expect, test } from 'vitest';
import { valueBatch } from '../../src/data/feature-batch.js';
import { gramMatrix } from '../../src/data/gram-matrix.js';
import { pivotedCholesky, type CholeskyFactor } from '../../src/data/pivoted-cholesky.js';
import { seededRandom } from '../../src/data/seeded-random.js';

/** The Gram matrix over all positions of n samples of P values drawn from `levels` equally spaced levels; sample s copies sample s − 1 when `copy(s)`. */
function gram(n: number, P: number, levels: number, seed: number, copy: (s: number) => boolean = () => false): Float64Array {
  const random = seededRandom(seed);
  const values = new Float64Array(n * P);
  for (let s = 0; s < n; s++) {
    for (let p = 0; p < P; p++) values[s * P + p] = copy(s) ? values[(s - 1) * P + p]! : Math.floor(random() * levels) / (levels - 1);
  }
  const g = new Float64Array(n * n);
  gramMatrix(valueBatch(values, n, P, 1, { lo: 0, hi: 1 }), Int32Array.from({ length: P }, (_, p) => p), g);
  return g;
}

/** max |G − L Lᵀ| over the leading n × n block of g (row length `stride`). */
function residual(g: Float64Array, f: CholeskyFactor, stride: number): number {
  const n = f.n;
  let worst = 0;
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      let s = 0;
      for (let k = 0; k < f.rank; k++) s += f.columns[k * n + i]! * f.columns[k * n + j]!;
      worst = Math.max(worst, Math.abs(g[i * stride + j]! - s));
    }
  }
  return worst;
}

describe('pivoted Cholesky of a Gram matrix', () => {
  test('distinct samples: full rank, L Lᵀ = G to rounding, column k zero on the k rows pivoted before it', () => {
    const n = 60;
    const g = gram(n, 12, 256, 3);
    const f = pivotedCholesky(g, n);
    expect(f.rank).toBe(n);
    expect(residual(g, f, n)).toBeLessThan(1e-12);
    for (let k = 0; k < f.rank; k++) {
      let zeros = 0;
      for (let i = 0; i < n; i++) if (f.columns[k * n + i] === 0) zeros++;
      expect(zeros).toBeGreaterThanOrEqual(k);
    }
  });

  test('every third sample a copy of the one before: rank is the number of distinct samples', () => {
    const n = 45;
    const g = gram(n, 10, 256, 4, (s) => s % 3 === 1);
    const f = pivotedCholesky(g, n);
    expect(f.rank).toBe(30);
    expect(residual(g, f, n)).toBeLessThan(1e-10);
  });

  test('every diagonal entry is 1, so the first pivot is row 0: column 0 of L is column 0 of G', () => {
    const n = 20;
    const g = gram(n, 6, 5, 5);
    const f = pivotedCholesky(g, n);
    for (let i = 0; i < n; i++) expect(f.columns[i]).toBe(g[i * n]);
  });

  test('the leading half read in place equals the half copied out, bit for bit', () => {
    const n = 50;
    const half = 25;
    const g = gram(n, 8, 17, 6, (s) => s % 5 === 4);
    const block = new Float64Array(half * half);
    for (let i = 0; i < half; i++) block.set(g.subarray(i * n, i * n + half), i * half);
    const inPlace = pivotedCholesky(g, half, n);
    const copied = pivotedCholesky(block, half);
    expect(inPlace.rank).toBe(copied.rank);
    expect(Array.from(inPlace.columns)).toEqual(Array.from(copied.columns));
  });
});
