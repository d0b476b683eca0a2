/**
 * The grid arithmetic of the contributor guide ("Grid arithmetic", "conv", "conv-transpose",
 * "upsample"), written again from its text for the oracle: output lengths, window taps, the tree
 * surrogate's product positions, transposed-conv sources and linear-upsampling weights, per axis.
 * The product has its own copy (src/config/grid-geometry.ts); the oracle does not import it, so
 * that a misreading of the text in one is caught by the other (tests/oracle/plan.test.ts compares
 * the shapes).
 *
 * Everything here throws on a window that does not fit: the oracle evaluates models that are
 * valid by construction, so a throw is a bug in a test or a family.
 */
import type { Padding } from '../../src/config/model.js';

/** Positions spanned by k taps with dilation d: e = d(k−1)+1. */
export function extent(k: number, d: number): number {
  return d * (k - 1) + 1;
}

/** One axis of a window op: output length and the zeros before position 0. */
export interface AxisWindow {
  readonly out: number;
  readonly left: number;
}

/** The guide's table: output length and `left` for an input length n. */
export function windowAxis(n: number, k: number, s: number, d: number, padding: Padding, axis: number): AxisWindow {
  if (k < 1 || s < 1 || d < 1 || n < 1) throw new Error(`window k=${k} s=${s} d=${d} on length ${n}`);
  const e = extent(k, d);
  switch (padding.mode) {
    case 'same': {
      const out = Math.ceil(n / s);
      return { out, left: Math.floor(Math.max((out - 1) * s + e - n, 0) / 2) };
    }
    case 'valid':
      if (n < e) throw new Error(`valid window of extent ${e} on length ${n}`);
      return { out: Math.floor((n - e) / s) + 1, left: 0 };
    case 'causal':
      return { out: Math.floor((n - 1) / s) + 1, left: e - 1 };
    case 'explicit': {
      const p = padding.amount[axis];
      if (p === undefined || p < 0) throw new Error(`explicit padding has no amount for axis ${axis}`);
      if (n + 2 * p < e) throw new Error(`window of extent ${e} on length ${n} padded by ${p}`);
      return { out: Math.floor((n + 2 * p - e) / s) + 1, left: p };
    }
  }
}

/** Output j's taps j·s − left + t·d, t = 0..k−1 (positions outside [0, n) are padding). */
export function axisTaps(j: number, w: AxisWindow, k: number, s: number, d: number): number[] {
  const taps: number[] = [];
  for (let t = 0; t < k; t++) taps.push(j * s - w.left + t * d);
  return taps;
}

/**
 * Tree conv: P(j), the m = min(k, s) consecutive positions starting at j·s − left + ⌊(e−m)/2⌋
 * (causal: j·s − left + e − m), those inside [0, n).
 */
export function treeConvAxis(j: number, n: number, w: AxisWindow, k: number, s: number, d: number, causal: boolean): number[] {
  const e = extent(k, d);
  const m = Math.min(k, s);
  const start = j * s - w.left + (causal ? e - m : Math.floor((e - m) / 2));
  const ps: number[] = [];
  for (let i = start; i < start + m; i++) if (i >= 0 && i < n) ps.push(i);
  return ps;
}

/**
 * Tree conv over a whole grid: the output dims and, per output position (row-major), the flat
 * input positions of P(j) = P_h(j_h) × P_w(j_w).
 */
export function treeConvGroups(
  dims: readonly number[],
  kernel: readonly number[],
  stride: readonly number[],
  dilation: readonly number[],
  padding: Padding,
): { dims: number[]; groups: number[][] } {
  const causal = padding.mode === 'causal';
  const axes = dims.map((n, a) => {
    const k = kernel[a] as number;
    const s = stride[a] as number;
    const d = dilation[a] as number;
    const w = windowAxis(n, k, s, d, padding, a);
    return Array.from({ length: w.out }, (_, j) => treeConvAxis(j, n, w, k, s, d, causal));
  });
  const outDims = axes.map((a) => a.length);
  const groups = multiIndices(outDims).map((j) => cartesian(j.map((jj, a) => (axes[a] as number[][])[jj] as number[])).map((idx) => flatIndex(idx, dims)));
  return { dims: outDims, groups };
}

/**
 * A pool window op over a whole grid (k = window, d = 1): the output dims and, per output
 * position, the flat positions of its taps inside the grid (padding taps left out).
 */
export function poolGroups(dims: readonly number[], window: readonly number[], stride: readonly number[], padding: Padding): { dims: number[]; groups: number[][] } {
  const geo = dims.map((n, a) => windowAxis(n, window[a] as number, stride[a] as number, 1, padding, a));
  const outDims = geo.map((w) => w.out);
  const groups = multiIndices(outDims).map((j) =>
    cartesian(j.map((jj, a) => axisTaps(jj, geo[a] as AxisWindow, window[a] as number, stride[a] as number, 1)))
      .filter((pos) => pos.every((x, a) => x >= 0 && x < (dims[a] as number)))
      .map((pos) => flatIndex(pos, dims)),
  );
  return { dims: outDims, groups };
}

/** Transposed conv output length (n−1)·s − 2p + e + q. */
export function transposeLength(n: number, k: number, s: number, d: number, p: number, q: number): number {
  return (n - 1) * s - 2 * p + extent(k, d) + q;
}

/** Overlap transposed conv: the pairs (i, t) with i·s − p + t·d = j, 0 ≤ i < n, 0 ≤ t < k. */
export function transposePairs(j: number, n: number, k: number, s: number, d: number, p: number): [number, number][] {
  const pairs: [number, number][] = [];
  for (let t = 0; t < k; t++) {
    const x = j + p - t * d;
    if (x >= 0 && x % s === 0 && x / s < n) pairs.push([x / s, t]);
  }
  return pairs;
}

/** Tree transposed conv: output j reads input min(⌊j/s⌋, n−1) through the map of offset j mod s. */
export function treeTransposeAxis(j: number, n: number, s: number): { source: number; offset: number } {
  return { source: Math.min(Math.floor(j / s), n - 1), offset: j % s };
}

/**
 * Linear upsampling by f on an axis of length n, output j: (1−λ)·v_{i0} + λ·v_{i1} with λ =
 * num/den, from c = 2j+1−f as the guide states.
 */
export function linearAxis(j: number, n: number, f: number): { i0: number; i1: number; num: number; den: number } {
  const c = 2 * j + 1 - f;
  const den = 2 * f;
  if (c <= 0) return { i0: 0, i1: 0, num: 0, den };
  const i0 = Math.floor(c / den);
  if (i0 >= n - 1) return { i0: n - 1, i1: n - 1, num: 0, den };
  return { i0, i1: i0 + 1, num: c - den * i0, den };
}

/** Row-major multi-indices of a grid. */
export function multiIndices(dims: readonly number[]): number[][] {
  let out: number[][] = [[]];
  for (const n of dims) {
    const next: number[][] = [];
    for (const prefix of out) for (let i = 0; i < n; i++) next.push([...prefix, i]);
    out = next;
  }
  return out;
}

/** Row-major flat index of a multi-index. */
export function flatIndex(idx: readonly number[], dims: readonly number[]): number {
  let f = 0;
  for (let a = 0; a < dims.length; a++) f = f * (dims[a] as number) + (idx[a] as number);
  return f;
}

/** The cartesian product of per-axis lists, row-major (first axis slowest). */
export function cartesian<T>(lists: readonly (readonly T[])[]): T[][] {
  let out: T[][] = [[]];
  for (const l of lists) {
    const next: T[][] = [];
    for (const prefix of out) for (const x of l) next.push([...prefix, x]);
    out = next;
  }
  return out;
}

export function count(dims: readonly number[]): number {
  return dims.reduce((a, b) => a * b, 1);
}
