/**
 * The eigenvalue-only symmetric solver against spectra known in closed form, and against
 * ml-matrix's decomposition with eigenvectors, whose arithmetic on the eigenvalues it repeats.
 */
import { EigenvalueDecomposition, Matrix } from 'ml-matrix';
import { describe, expect, test } from 'vitest';
import { seededRandom } from '../../src/data/seeded-random.js';
import { symmetricEigenvalues } from '../../src/data/symmetric-eigenvalues.js';

const ascending = (xs: Float64Array | number[]): number[] => Array.from(xs).sort((x, y) => x - y);

/** Row-major n × n from a function of (row, column). */
function matrix(n: number, entry: (i: number, j: number) => number): Float64Array {
  return Float64Array.from({ length: n * n }, (_, k) => entry(Math.floor(k / n), k % n));
}

/**
 * X Xᵀ for a random n × k matrix X with entries from `draw`, rows for which `zero` holds left 0:
 * symmetric, positive semidefinite, rank ≤ k.
 */
function gramOfRandom(n: number, k: number, seed: number, draw: (u: number) => number, zero: (row: number) => boolean = () => false): Float64Array {
  const random = seededRandom(seed);
  const x = Float64Array.from({ length: n * k }, (_, i) => (zero(Math.floor(i / k)) ? 0 : draw(random())));
  const g = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j <= i; j++) {
      let s = 0;
      for (let q = 0; q < k; q++) s += x[i * k + q]! * x[j * k + q]!;
      g[i * n + j] = s;
      g[j * n + i] = s;
    }
  }
  return g;
}

describe('spectra known in closed form', () => {
  test.each([1, 2, 7, 40])('tridiag(−1, 2, −1) of size %d: 2 − 2·cos(kπ/(n+1)) (eigenvectors sin(jkπ/(n+1)), checked by substitution)', (n) => {
    const a = matrix(n, (i, j) => (i === j ? 2 : Math.abs(i - j) === 1 ? -1 : 0));
    const expected = Array.from({ length: n }, (_, k) => 2 - 2 * Math.cos(((k + 1) * Math.PI) / (n + 1)));
    ascending(symmetricEigenvalues(a, n)).forEach((v, k) => expect(v).toBeCloseTo(ascending(expected)[k]!, 12));
  });

  test('a diagonal matrix: its diagonal', () => {
    expect(ascending(symmetricEigenvalues(matrix(4, (i, j) => (i === j ? [3, -1, 0, 8][i]! : 0)), 4))).toEqual([-1, 0, 3, 8]);
  });

  test('the all-ones matrix of size 5: 5 once and 0 four times', () => {
    const values = ascending(symmetricEigenvalues(matrix(5, () => 1), 5));
    values.slice(0, 4).forEach((v) => expect(Math.abs(v)).toBeLessThan(1e-14));
    expect(values[4]).toBeCloseTo(5, 13);
  });

  test('the zero matrix and the empty matrix', () => {
    expect(ascending(symmetricEigenvalues(new Float64Array(9), 3))).toEqual([0, 0, 0]);
    expect(symmetricEigenvalues(new Float64Array(0), 0).length).toBe(0);
  });
});

describe('the same eigenvalues, bit for bit, as the decomposition with eigenvectors (ml-matrix, tred2/tql2)', () => {
  test.each([
    [3, 3, 'uniform'],
    [30, 30, 'uniform'],
    [64, 20, 'uniform'],
    [97, 97, 'small integers'],
    [128, 128, 'uniform'],
  ])('X Xᵀ, X of %d × %d, %s entries', (n, k, kind) => {
    const g = gramOfRandom(n, k, n * 1000 + k, kind === 'uniform' ? (u) => u - 0.5 : (u) => Math.floor(u * 5) - 2);
    const rows = Array.from({ length: n }, (_, i) => Array.from(g.subarray(i * n, i * n + n)));
    const reference = new EigenvalueDecomposition(new Matrix(rows), { assumeSymmetric: true }).realEigenvalues;
    expect(ascending(symmetricEigenvalues(g, n))).toEqual(ascending(reference));
  });

  test.each([
    ['every fifth row and column zero', 41, (row: number) => row % 5 === 2],
    ['the last rows and columns zero', 33, (row: number) => row >= 28],
    ['the first rows and columns zero', 33, (row: number) => row < 6],
  ])('X Xᵀ with %s (columns with nothing to reflect)', (_, n, zero) => {
    const g = gramOfRandom(n, 12, n, (u) => u - 0.5, zero);
    const rows = Array.from({ length: n }, (_, i) => Array.from(g.subarray(i * n, i * n + n)));
    const reference = new EigenvalueDecomposition(new Matrix(rows), { assumeSymmetric: true }).realEigenvalues;
    expect(ascending(symmetricEigenvalues(g, n))).toEqual(ascending(reference));
  });
});
