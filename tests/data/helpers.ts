/**
 * Shared helpers for the data-measurement tests: in-memory sources (no file), a temporary folder,
 * and an explicit matricisation of the empirical data tensor built entry by entry, written from
 * the definitions in DEVELOPERS.md and independent of the Gram-matrix route.
 */
import { mkdtempSync, realpathSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { SingularValueDecomposition, Matrix } from 'ml-matrix';
import type { DataSource } from '../../src/data/data-source.js';
import { tokenBatch, valueBatch } from '../../src/data/feature-batch.js';

export function tokenSource(rows: readonly (readonly number[])[]): DataSource {
  const P = rows[0]!.length;
  return {
    file: 'memory',
    format: 'jsonl',
    count: rows.length,
    shape: [P],
    kind: 'tokens',
    channels: 1,
    modified: new Date(0),
    read(indices) {
      const ids = new Int32Array(indices.length * P);
      for (let k = 0; k < indices.length; k++) rows[indices[k]!]!.forEach((v, p) => (ids[k * P + p] = v));
      return { ok: true, batch: tokenBatch(ids, indices.length, P) };
    },
    close: () => undefined,
  };
}

/** Rows of values in [0, 1] (scale 0 … 1), `channels` values per position. */
export function valueSource(rows: readonly (readonly number[])[], shape: readonly number[], channels = 1): DataSource {
  const width = rows[0]!.length;
  return {
    file: 'memory',
    format: 'csv',
    count: rows.length,
    shape,
    kind: 'values',
    channels,
    range: { lo: 0, hi: 1 },
    modified: new Date(0),
    read(indices) {
      const values = new Float64Array(indices.length * width);
      for (let k = 0; k < indices.length; k++) rows[indices[k]!]!.forEach((v, i) => (values[k * width + i] = v));
      return { ok: true, batch: valueBatch(values, indices.length, width / channels, channels, { lo: 0, hi: 1 }) };
    },
    close: () => undefined,
  };
}

/** Every combination of `values` over `positions` positions (a product set). */
export function productSet(values: readonly number[], positions: number): number[][] {
  let rows: number[][] = [[]];
  for (let p = 0; p < positions; p++) rows = rows.flatMap((r) => values.map((v) => [...r, v]));
  return rows;
}

export function tempDir(prefix = 'rankfloor-data-'): { path: string; remove(): void } {
  const path = realpathSync(mkdtempSync(join(tmpdir(), prefix)));
  return { path, remove: () => rmSync(path, { recursive: true, force: true }) };
}

/** φ(t) = (cos πt/2, sin πt/2) for t in [0, 1]. */
function phi(t: number): number[] {
  return [Math.cos((Math.PI / 2) * t), Math.sin((Math.PI / 2) * t)];
}

function kron(a: readonly number[], b: readonly number[]): number[] {
  return a.flatMap((x) => b.map((y) => x * y));
}

/**
 * The normalised squared singular values (largest first) of the matricisation of
 * D = Σ_s w_s ⊗_p φ(x_{s,p}) with `sideA` as rows, built explicitly (M^N entries) and decomposed by
 * a singular value decomposition. Values: rows of positions × channels in [0, 1]; tokens: ids < V.
 */
export function explicitSpectrum(
  rows: readonly (readonly number[])[],
  sideA: readonly number[],
  options: { channels?: number; vocabulary?: number; weights?: readonly number[] },
): number[] {
  const channels = options.channels ?? 1;
  const P = rows[0]!.length / channels;
  const feature = (row: readonly number[], p: number): number[] => {
    if (options.vocabulary !== undefined) return Array.from({ length: options.vocabulary }, (_, u) => (row[p] === u ? 1 : 0));
    let f = [1];
    for (let c = 0; c < channels; c++) f = kron(f, phi(row[p * channels + c]!));
    return f;
  };
  const sideB = Array.from({ length: P }, (_, p) => p).filter((p) => !sideA.includes(p));
  const tensorOf = (row: readonly number[], side: readonly number[]) => side.reduce((acc, p) => kron(acc, feature(row, p)), [1]);
  const aVectors = rows.map((r) => tensorOf(r, sideA));
  const bVectors = rows.map((r) => tensorOf(r, sideB));
  const d = new Matrix(aVectors[0]!.length, bVectors[0]!.length);
  rows.forEach((_, s) => {
    const w = options.weights?.[s] ?? 1;
    aVectors[s]!.forEach((x, i) => bVectors[s]!.forEach((y, j) => d.set(i, j, d.get(i, j) + w * x * y)));
  });
  const sigma = new SingularValueDecomposition(d, { computeLeftSingularVectors: false, computeRightSingularVectors: false, autoTranspose: true }).diagonal;
  const squares = sigma.map((x) => x * x).sort((x, y) => y - x);
  const total = squares.reduce((a, b) => a + b, 0);
  return squares.map((x) => x / total);
}
