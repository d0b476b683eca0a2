/**
 * Direct evaluation of a layered model's surrogate function h(x_0 … x_{N−1}) modulo P, exactly as
 * the contributor guide defines the `tree` and `overlap` surrogates, and the probe rank built on
 * it. This is the oracle's main method: it knows nothing about tensor networks, cuts or bounds —
 * it runs the arithmetic circuit on numbers and measures the rank of what comes out.
 *
 * Probe rank: draw weights once, K random assignments of the side-A inputs and K of the side-B
 * inputs, fill F[i][j] = h(xA_i, xB_j) and take rank(F) mod P. Any non-zero minor mod P is a
 * non-zero integer polynomial in the weights and inputs, so the result is a certified lower bound
 * of the generic separation rank; with K above the rank it equals it with high probability.
 *
 * Reading of the guide where it is terse: an `overlap` conv with stride s > 1 is the strided
 * linear map of the guide's formula (output length ⌈n/s⌉ or ⌊(n−k)/s⌋+1) and adds no product
 * window; the product window for strides belongs to the `tree` surrogate only.
 */
import type { ConvLayer, LayeredModel, RecurrentLayer } from '../../src/config/model.js';
import { mul, mulAdd, randomVector, rankInPlace, type Rng } from './field.js';

export type SurrogateKind = 'tree' | 'overlap';

/**
 * Weights drawn on first request and cached by key, so that two independent constructions of the
 * same network (this evaluator and the tensor contraction) can share one draw. Keys:
 * `L{i}` / `L{i}@{pos}` (linear map of layer i, shared / per position), `L{i}t{tap}` /
 * `L{i}@{pos}t{tap}` (overlap taps), `L{i}:H{l}`, `L{i}:I{l}`, `L{i}:h0_{l}` (recurrent level l),
 * `head` (output vector).
 */
export class WeightStore {
  private readonly cache = new Map<string, Float64Array>();
  constructor(private readonly rng: Rng) {}

  get(key: string, length: number): Float64Array {
    const hit = this.cache.get(key);
    if (hit) {
      if (hit.length !== length) throw new Error(`weight ${key}: length ${hit.length}, requested ${length}`);
      return hit;
    }
    const v = randomVector(this.rng, length);
    this.cache.set(key, v);
    return v;
  }

  get size(): number {
    return this.cache.size;
  }
}

export function linearKey(layer: number, pos: number, shared: boolean): string {
  return shared ? `L${layer}` : `L${layer}@${pos}`;
}

export function tapKey(layer: number, pos: number, tap: number, shared: boolean): string {
  return shared ? `L${layer}t${tap}` : `L${layer}@${pos}t${tap}`;
}

export function recurrentKeys(layer: number, level: number): { h: string; i: string; h0: string } {
  return { h: `L${layer}:H${level}`, i: `L${layer}:I${level}`, h0: `L${layer}:h0_${level}` };
}

/** out = W·v mod P, W row-major rows×cols, v at v[vo .. vo+cols), out at out[oo .. oo+rows). */
function matVec(w: Float64Array, rows: number, cols: number, v: Float64Array, vo: number, out: Float64Array, oo: number): void {
  for (let r = 0; r < rows; r++) {
    let acc = 0;
    const wo = r * cols;
    for (let c = 0; c < cols; c++) acc = mulAdd(w[wo + c] as number, v[vo + c] as number, acc);
    out[oo + r] = acc;
  }
}

/** out += W·v mod P. */
function matVecAdd(w: Float64Array, rows: number, cols: number, v: Float64Array, vo: number, out: Float64Array, oo: number): void {
  for (let r = 0; r < rows; r++) {
    let acc = out[oo + r] as number;
    const wo = r * cols;
    for (let c = 0; c < cols; c++) acc = mulAdd(w[wo + c] as number, v[vo + c] as number, acc);
    out[oo + r] = acc;
  }
}

type Step = (input: Float64Array) => Float64Array;

interface Grid {
  dims: number[];
  dim: number;
}

function count(dims: readonly number[]): number {
  return dims.reduce((a, b) => a * b, 1);
}

/** Non-overlapping product windows: for each new position (row-major) its old positions. */
export function tiles(dims: readonly number[], window: readonly number[]): { dims: number[]; groups: number[][] } {
  if (window.length !== dims.length) throw new Error(`window [${window.join(',')}] does not match grid [${dims.join(',')}]`);
  dims.forEach((n, a) => {
    const w = window[a] as number;
    if (w < 1 || n % w !== 0) throw new Error(`window [${window.join(',')}] does not tile grid [${dims.join(',')}]`);
  });
  const newDims = dims.map((n, a) => n / (window[a] as number));
  const groups: number[][] = [];
  if (dims.length === 1) {
    const w = window[0] as number;
    for (let j = 0; j < (newDims[0] as number); j++) {
      const g: number[] = [];
      for (let t = 0; t < w; t++) g.push(j * w + t);
      groups.push(g);
    }
  } else if (dims.length === 2) {
    const [wh, ww] = window as [number, number];
    const width = dims[1] as number;
    for (let i = 0; i < (newDims[0] as number); i++) {
      for (let j = 0; j < (newDims[1] as number); j++) {
        const g: number[] = [];
        for (let a = 0; a < wh; a++) for (let b = 0; b < ww; b++) g.push((i * wh + a) * width + (j * ww + b));
        groups.push(g);
      }
    }
  } else {
    throw new Error(`grids of ${dims.length} dimensions are not supported`);
  }
  return { dims: newDims, groups };
}

function productStep(groups: number[][], dim: number): Step {
  const out = new Float64Array(groups.length * dim);
  const flat = groups.map((g) => Int32Array.from(g, (c) => c * dim));
  return (input) => {
    for (let q = 0; q < flat.length; q++) {
      const g = flat[q] as Int32Array;
      const oo = q * dim;
      for (let k = 0; k < dim; k++) {
        let acc = 1;
        for (let c = 0; c < g.length; c++) acc = mul(acc, input[(g[c] as number) + k] as number);
        out[oo + k] = acc;
      }
    }
    return out;
  };
}

/** Output length and left padding of one axis of an overlapping convolution. */
export function axisGeometry(n: number, k: number, s: number, padding: 'same' | 'valid'): { out: number; left: number } {
  if (padding === 'same') {
    const out = Math.ceil(n / s);
    const total = Math.max((out - 1) * s + k - n, 0);
    return { out, left: Math.floor(total / 2) };
  }
  if (n < k) throw new Error(`valid convolution with kernel ${k} on length ${n}`);
  return { out: Math.floor((n - k) / s) + 1, left: 0 };
}

function overlapConv(layer: ConvLayer, grid: Grid, shared: boolean, weights: WeightStore, steps: Step[]): Grid {
  const dims = grid.dims;
  if (layer.kernel.length !== dims.length || layer.stride.length !== dims.length) {
    throw new Error(`conv ${layer.index}: kernel/stride rank does not match grid [${dims.join(',')}]`);
  }
  const geo = dims.map((n, a) => axisGeometry(n, layer.kernel[a] as number, layer.stride[a] as number, layer.padding));
  const outDims = geo.map((g) => g.out);
  const r = layer.channels;
  const d = grid.dim;
  // For every output position: the (source position, tap) pairs that are in range.
  const plan: { src: number; w: Float64Array }[][] = [];
  const nOut = count(outDims);
  const taps = count(layer.kernel);
  for (let o = 0; o < nOut; o++) {
    const oIdx = dims.length === 1 ? [o] : [Math.floor(o / (outDims[1] as number)), o % (outDims[1] as number)];
    const list: { src: number; w: Float64Array }[] = [];
    for (let t = 0; t < taps; t++) {
      const tIdx = dims.length === 1 ? [t] : [Math.floor(t / (layer.kernel[1] as number)), t % (layer.kernel[1] as number)];
      let src = 0;
      let inRange = true;
      for (let a = 0; a < dims.length; a++) {
        const x = (oIdx[a] as number) * (layer.stride[a] as number) + (tIdx[a] as number) - (geo[a] as { left: number }).left;
        if (x < 0 || x >= (dims[a] as number)) inRange = false;
        src = src * (dims[a] as number) + x;
      }
      // Weights are drawn for every tap, in range or not, so that the draw does not depend on padding.
      const w = weights.get(tapKey(layer.index, o, t, shared), r * d);
      if (inRange) list.push({ src, w });
    }
    plan.push(list);
  }
  const out = new Float64Array(nOut * r);
  steps.push((input) => {
    out.fill(0);
    plan.forEach((list, o) => {
      for (const { src, w } of list) matVecAdd(w, r, d, input, src * d, out, o * r);
    });
    return out;
  });
  return { dims: outDims, dim: r };
}

function recurrentStep(layer: RecurrentLayer, grid: Grid, weights: WeightStore, steps: Step[]): Grid {
  if (grid.dims.length !== 1) throw new Error(`recurrent ${layer.index} needs a 1D grid, got [${grid.dims.join(',')}]`);
  const T = grid.dims[0] as number;
  const R = layer.hidden;
  const L = layer.depth;
  const wh: Float64Array[] = [];
  const wi: Float64Array[] = [];
  const h0: Float64Array[] = [];
  for (let l = 1; l <= L; l++) {
    const keys = recurrentKeys(layer.index, l);
    wh.push(weights.get(keys.h, R * R));
    wi.push(weights.get(keys.i, R * (l === 1 ? grid.dim : R)));
    h0.push(weights.get(keys.h0, R));
  }
  const d0 = grid.dim;
  const state = new Float64Array(L * R);
  const a = new Float64Array(R);
  const b = new Float64Array(R);
  const out = new Float64Array(R);
  steps.push((input) => {
    for (let l = 0; l < L; l++) state.set(h0[l] as Float64Array, l * R);
    for (let t = 0; t < T; t++) {
      for (let l = 0; l < L; l++) {
        // a = W_H h^l_{t-1}; b = W_I h^{l-1}_t (h^0_t = the input at t; h^{l-1}_t is already updated).
        matVec(wh[l] as Float64Array, R, R, state, l * R, a, 0);
        if (l === 0) matVec(wi[0] as Float64Array, R, d0, input, t * d0, b, 0);
        else matVec(wi[l] as Float64Array, R, R, state, (l - 1) * R, b, 0);
        for (let k = 0; k < R; k++) state[l * R + k] = mul(a[k] as number, b[k] as number);
      }
    }
    out.set(state.subarray((L - 1) * R, L * R));
    return out;
  });
  return { dims: [1], dim: R };
}

export interface Evaluator {
  readonly positions: number;
  readonly features: number;
  /** h(x) mod P; x holds the M features of every position, position-major. */
  evaluate(x: Float64Array): number;
}

/** Compiles a layered model under a surrogate into a numeric evaluator over the given weights. */
export function compile(model: LayeredModel, surrogate: SurrogateKind, weights: WeightStore): Evaluator {
  const shared = model.weightSharing;
  let grid: Grid = { dims: [...model.input.shape], dim: model.input.features };
  const steps: Step[] = [];
  const linear = (layerIndex: number, r: number, sharedHere: boolean): void => {
    const n = count(grid.dims);
    const d = grid.dim;
    const ws: Float64Array[] = [];
    for (let q = 0; q < n; q++) ws.push(weights.get(linearKey(layerIndex, q, sharedHere), r * d));
    const out = new Float64Array(n * r);
    steps.push((input) => {
      for (let q = 0; q < n; q++) matVec(ws[q] as Float64Array, r, d, input, q * d, out, q * r);
      return out;
    });
    grid = { dims: grid.dims, dim: r };
  };
  const product = (window: readonly number[] | 'global'): void => {
    const w = window === 'global' ? grid.dims : window;
    const t = tiles(grid.dims, w);
    steps.push(productStep(t.groups, grid.dim));
    grid = { dims: t.dims, dim: grid.dim };
  };
  for (const layer of model.layers) {
    switch (layer.kind) {
      case 'conv':
        if (surrogate === 'overlap') {
          grid = overlapConv(layer, grid, shared, weights, steps);
        } else {
          linear(layer.index, layer.channels, shared);
          if (layer.stride.some((s) => s > 1)) product(layer.stride);
        }
        break;
      case 'pool':
        product(layer.global ? 'global' : layer.window);
        break;
      case 'dense':
        if (count(grid.dims) !== 1) throw new Error(`dense ${layer.index} on ${count(grid.dims)} positions`);
        linear(layer.index, layer.units, true);
        break;
      case 'recurrent':
        grid = recurrentStep(layer, grid, weights, steps);
        break;
    }
  }
  if (count(grid.dims) > 1) product('global');
  const head = weights.get('head', grid.dim);
  const dim = grid.dim;
  return {
    positions: count(model.input.shape),
    features: model.input.features,
    evaluate(x: Float64Array): number {
      let v = x;
      for (const s of steps) v = s(v);
      let acc = 0;
      for (let k = 0; k < dim; k++) acc = mulAdd(head[k] as number, v[k] as number, acc);
      return acc;
    },
  };
}

/**
 * The probe matrix rank for one partition. `side[p] = 1` puts position p on side A. Weights come
 * from `weights` (drawn on demand); the probe inputs from `rng`.
 */
export function probeRankWith(ev: Evaluator, side: Uint8Array, k: number, rng: Rng): number {
  const m = ev.features;
  const a: number[] = [];
  const b: number[] = [];
  for (let p = 0; p < ev.positions; p++) ((side[p] ?? 0) === 1 ? a : b).push(p);
  const xa = Array.from({ length: k }, () => randomVector(rng, a.length * m));
  const xb = Array.from({ length: k }, () => randomVector(rng, b.length * m));
  const x = new Float64Array(ev.positions * m);
  const f = new Float64Array(k * k);
  const scatter = (src: Float64Array, where: readonly number[]): void => {
    for (let s = 0; s < where.length; s++) {
      const xo = (where[s] as number) * m;
      const so = s * m;
      for (let c = 0; c < m; c++) x[xo + c] = src[so + c] as number;
    }
  };
  for (let i = 0; i < k; i++) {
    scatter(xa[i] as Float64Array, a);
    for (let j = 0; j < k; j++) {
      scatter(xb[j] as Float64Array, b);
      f[i * k + j] = ev.evaluate(x);
    }
  }
  return rankInPlace(f, k, k);
}

/** Probe rank of a model under a surrogate with fresh weights drawn from `rng`. */
export function probeRank(model: LayeredModel, surrogate: SurrogateKind, side: Uint8Array, k: number, rng: Rng): number {
  const ev = compile(model, surrogate, new WeightStore(rng));
  return probeRankWith(ev, side, k, rng);
}
