/**
 * The grid arithmetic of window layers along one axis, in one place: output lengths, padding and
 * which input positions each output reads. Shape inference, the network builder and the
 * parameter count all follow these functions, so a config's grids are the real network's grids
 * under both surrogates. DEVELOPERS.md ("Grid arithmetic") states the same formulas.
 */
import type { Padding } from './model.js';

export interface AxisPlan {
  /** Output length along the axis. */
  readonly out: number;
  /** Zeros added before position 0. */
  readonly left: number;
}

/** Span of a kernel with k taps spaced d apart. */
export function extent(k: number, d: number): number {
  return d * (k - 1) + 1;
}

/**
 * Output length and left padding of a window of k taps (dilation d) moved by stride s over n
 * positions, or a message saying why the window does not fit.
 */
export function windowAxis(n: number, k: number, s: number, d: number, padding: Padding, axis: number): AxisPlan | string {
  const e = extent(k, d);
  switch (padding.mode) {
    case 'same': {
      const out = Math.ceil(n / s);
      const total = Math.max((out - 1) * s + e - n, 0);
      return { out, left: Math.floor(total / 2) };
    }
    case 'valid':
      if (n < e) return `a window spanning ${e} positions does not fit the ${n} positions of the grid without padding`;
      return { out: Math.floor((n - e) / s) + 1, left: 0 };
    case 'causal':
      return { out: Math.floor((n - 1) / s) + 1, left: e - 1 };
    case 'explicit': {
      const p = padding.amount[axis] ?? 0;
      if (n + 2 * p < e) return `a window spanning ${e} positions does not fit the ${n} positions of the grid with ${p} padding on each side`;
      return { out: Math.floor((n + 2 * p - e) / s) + 1, left: p };
    }
  }
}

/**
 * The taps t = 0..k−1 of output j that land inside the grid (j·s − left + t·d in [0, n)), found by
 * arithmetic: a kernel may be far wider than the grid, and only the taps inside are visited.
 */
function tapRange(j: number, n: number, k: number, s: number, d: number, left: number): [number, number] {
  const base = j * s - left;
  const first = Math.max(0, Math.ceil(-base / d));
  const last = Math.min(k - 1, Math.floor((n - 1 - base) / d));
  return [first, last];
}

/** Input positions read by output j through taps t = 0..k−1 (padding positions left out). */
export function windowTaps(j: number, n: number, k: number, s: number, d: number, left: number): number[] {
  const [first, last] = tapRange(j, n, k, s, d, left);
  const at: number[] = [];
  for (let t = first; t <= last; t++) at.push(j * s - left + t * d);
  return at;
}

/** Tap index of each position returned by `windowTaps`, in the same order. */
export function windowTapIndices(j: number, n: number, k: number, s: number, d: number, left: number): number[] {
  const [first, last] = tapRange(j, n, k, s, d, left);
  const taps: number[] = [];
  for (let t = first; t <= last; t++) taps.push(t);
  return taps;
}

/**
 * The positions a conv merges under the `tree` surrogate: min(k, s) consecutive positions at the
 * middle of its window (at its end for causal padding), cut to the grid. With stride 1 that is
 * the centre tap alone; with a kernel at least as wide as its stride, the whole stride window.
 */
export function treeConvPositions(j: number, n: number, k: number, s: number, d: number, plan: AxisPlan, causal: boolean): number[] {
  const m = Math.min(k, s);
  const e = extent(k, d);
  const start = j * s - plan.left + (causal ? e - m : Math.floor((e - m) / 2));
  const at: number[] = [];
  for (let p = Math.max(start, 0); p < Math.min(start + m, n); p++) at.push(p);
  return at;
}

/** Output length of a transposed convolution along one axis. */
export function transposeLength(n: number, k: number, s: number, d: number, padding: number, outputPadding: number): number {
  return (n - 1) * s - 2 * padding + extent(k, d) + outputPadding;
}

/**
 * Under `overlap`: the (input position, tap) pairs that reach output j of a transposed
 * convolution, i.e. i·s − padding + t·d = j.
 */
export function transposeSources(j: number, n: number, k: number, s: number, d: number, padding: number): [number, number][] {
  const out: [number, number][] = [];
  // i = (j + p − t·d)/s must lie in [0, n): t·d in (j + p − n·s, j + p], visited only there.
  const first = Math.max(0, Math.ceil((j + padding - (n - 1) * s) / d));
  const last = Math.min(k - 1, Math.floor((j + padding) / d));
  for (let t = first; t <= last; t++) {
    const num = j + padding - t * d;
    if (num % s !== 0) continue;
    out.push([num / s, t]);
  }
  return out;
}

/**
 * Under `tree`: output j of a transposed convolution reads input min(⌊j/s⌋, n − 1) through the
 * map of offset j mod s (each input position expands into s positions with maps of their own).
 */
export function treeTransposeSource(j: number, n: number, s: number): [number, number] {
  return [Math.min(Math.floor(j / s), n - 1), j % s];
}

/**
 * Linear upsampling by f (half-pixel centres, edges clamped): output j reads positions i0 and i1
 * with weights (1 − λ, λ), λ = num/den, as exact integers so that the oracle can follow it
 * modulo a prime. Output j's centre maps to input coordinate (2j + 1 − f) / (2f).
 */
export function linearSources(j: number, n: number, f: number): { i0: number; i1: number; num: number; den: number } {
  const den = 2 * f;
  const coord = 2 * j + 1 - f; // input coordinate × den
  if (coord <= 0) return { i0: 0, i1: 0, num: 0, den };
  const i0 = Math.floor(coord / den);
  if (i0 >= n - 1) return { i0: n - 1, i1: n - 1, num: 0, den };
  return { i0, i1: i0 + 1, num: coord - i0 * den, den };
}
