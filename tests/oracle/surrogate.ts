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
import { mul as fieldMul, mulAdd as fieldMulAdd, randomVector, rankInPlace, type Rng } from './field.js';

// Local bindings of the hot arithmetic: under the test runner's module transform every call
// through an imported binding is a property load on a module object, which V8 does not inline
// (measured: about a third slower).
const mul = fieldMul;
const mulAdd = fieldMulAdd;

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

/**
 * The compiled circuit is a list of stages; a stage is a list of units, each unit a vector at one
 * grid position (or a recurrent state) computed from units of the previous stage. Stage 0 holds
 * the inputs, one unit of M values per position. Knowing which inputs every unit depends on lets
 * the probe compute each side-only unit once per row or column instead of once per matrix entry;
 * `evaluate` runs every unit and is the plain reference the fast path is tested against.
 */
interface Unit {
  readonly offset: number;
  readonly length: number;
  /** Units of the previous stage that this one reads. */
  readonly deps: readonly number[];
  /** Writes out[offset .. offset+length) from the previous stage's buffer. */
  readonly compute: (input: Float64Array, out: Float64Array) => void;
}

interface Stage {
  readonly units: Unit[];
  readonly size: number;
}

class StageBuilder {
  readonly units: Unit[] = [];
  private size = 0;
  add(length: number, deps: readonly number[], compute: (input: Float64Array, out: Float64Array, offset: number) => void): void {
    const offset = this.size;
    this.units.push({ offset, length, deps, compute: (input, out) => compute(input, out, offset) });
    this.size += length;
  }
  done(): Stage {
    return { units: this.units, size: this.size };
  }
}

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

function productStage(prev: Stage, groups: number[][], dim: number): Stage {
  const b = new StageBuilder();
  for (const g of groups) {
    const offs = Int32Array.from(g, (c) => (prev.units[c] as Unit).offset);
    b.add(dim, g, (input, out, oo) => {
      for (let k = 0; k < dim; k++) {
        let acc = 1;
        for (let c = 0; c < offs.length; c++) acc = mul(acc, input[(offs[c] as number) + k] as number);
        out[oo + k] = acc;
      }
    });
  }
  return b.done();
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

function overlapConv(layer: ConvLayer, grid: Grid, shared: boolean, weights: WeightStore, stages: Stage[]): Grid {
  const dims = grid.dims;
  if (layer.kernel.length !== dims.length || layer.stride.length !== dims.length) {
    throw new Error(`conv ${layer.index}: kernel/stride rank does not match grid [${dims.join(',')}]`);
  }
  const geo = dims.map((n, a) => axisGeometry(n, layer.kernel[a] as number, layer.stride[a] as number, layer.padding));
  const outDims = geo.map((g) => g.out);
  const r = layer.channels;
  const d = grid.dim;
  const prev = stages[stages.length - 1] as Stage;
  const nOut = count(outDims);
  const taps = count(layer.kernel);
  const b = new StageBuilder();
  for (let o = 0; o < nOut; o++) {
    const oIdx = dims.length === 1 ? [o] : [Math.floor(o / (outDims[1] as number)), o % (outDims[1] as number)];
    // The (source position, tap weights) pairs that are in range.
    const srcs: number[] = [];
    const ws: Float64Array[] = [];
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
      if (inRange) {
        srcs.push(src);
        ws.push(w);
      }
    }
    const offs = srcs.map((src) => (prev.units[src] as Unit).offset);
    b.add(r, srcs, (input, out, oo) => {
      out.fill(0, oo, oo + r);
      for (let i = 0; i < offs.length; i++) matVecAdd(ws[i] as Float64Array, r, d, input, offs[i] as number, out, oo);
    });
  }
  stages.push(b.done());
  return { dims: outDims, dim: r };
}

/**
 * A recurrence over T steps becomes T stages: stage t holds the states of all levels after step t
 * (one unit of L·R values) and passes the inputs not yet read through unchanged; a last stage
 * extracts h^L_T.
 */
function recurrentStages(layer: RecurrentLayer, grid: Grid, weights: WeightStore, stages: Stage[]): Grid {
  if (grid.dims.length !== 1) throw new Error(`recurrent ${layer.index} needs a 1D grid, got [${grid.dims.join(',')}]`);
  const T = grid.dims[0] as number;
  const R = layer.hidden;
  const L = layer.depth;
  const d0 = grid.dim;
  const wh: Float64Array[] = [];
  const wi: Float64Array[] = [];
  const h0 = new Float64Array(L * R);
  for (let l = 1; l <= L; l++) {
    const keys = recurrentKeys(layer.index, l);
    wh.push(weights.get(keys.h, R * R));
    wi.push(weights.get(keys.i, R * (l === 1 ? d0 : R)));
    h0.set(weights.get(keys.h0, R), (l - 1) * R);
  }
  const a = new Float64Array(R);
  const bv = new Float64Array(R);
  // One step: states (at input[so], or h0 when so < 0) and input x_t (at input[xo]) → out[oo].
  const step = (input: Float64Array, so: number, xo: number, out: Float64Array, oo: number): void => {
    for (let l = 0; l < L; l++) {
      // a = W_H h^l_{t-1}; b = W_I h^{l-1}_t (h^0_t = x_t; h^{l-1}_t is already in out).
      if (so < 0) matVec(wh[l] as Float64Array, R, R, h0, l * R, a, 0);
      else matVec(wh[l] as Float64Array, R, R, input, so + l * R, a, 0);
      if (l === 0) matVec(wi[0] as Float64Array, R, d0, input, xo, bv, 0);
      else matVec(wi[l] as Float64Array, R, R, out, oo + (l - 1) * R, bv, 0);
      for (let k = 0; k < R; k++) out[oo + l * R + k] = mul(a[k] as number, bv[k] as number);
    }
  };
  for (let t = 0; t < T; t++) {
    const prev = stages[stages.length - 1] as Stage;
    const b = new StageBuilder();
    // Previous stage: t = 0: the T positions; t > 0: [state, x_t, …, x_{T−1}].
    const stateUnit = t === 0 ? -1 : 0;
    const xUnit = t === 0 ? 0 : 1;
    const so = stateUnit < 0 ? -1 : (prev.units[stateUnit] as Unit).offset;
    const xo = (prev.units[xUnit] as Unit).offset;
    b.add(L * R, stateUnit < 0 ? [xUnit] : [stateUnit, xUnit], (input, out, oo) => step(input, so, xo, out, oo));
    for (let u = xUnit + 1; u < prev.units.length; u++) {
      const src = prev.units[u] as Unit;
      b.add(src.length, [u], (input, out, oo) => {
        for (let k = 0; k < src.length; k++) out[oo + k] = input[src.offset + k] as number;
      });
    }
    stages.push(b.done());
  }
  const last = new StageBuilder();
  last.add(R, [0], (input, out, oo) => {
    for (let k = 0; k < R; k++) out[oo + k] = input[(L - 1) * R + k] as number;
  });
  stages.push(last.done());
  return { dims: [1], dim: R };
}

export interface Evaluator {
  readonly positions: number;
  readonly features: number;
  /** h(x) mod P by running every unit; x holds the M features of every position, position-major. */
  evaluate(x: Float64Array): number;
  /** The k×k probe matrix F[i][j] = h(xA_i, xB_j), computing side-only units once per row/column. */
  probeMatrix(side: Uint8Array, xa: readonly Float64Array[], xb: readonly Float64Array[]): Float64Array;
}

/** Compiles a layered model under a surrogate into a numeric evaluator over the given weights. */
export function compile(model: LayeredModel, surrogate: SurrogateKind, weights: WeightStore): Evaluator {
  const shared = model.weightSharing;
  const m = model.input.features;
  let grid: Grid = { dims: [...model.input.shape], dim: m };
  const n = count(grid.dims);
  const input = new StageBuilder();
  for (let p = 0; p < n; p++) input.add(m, [], () => undefined);
  const stages: Stage[] = [input.done()];
  const linear = (layerIndex: number, r: number, sharedHere: boolean): void => {
    const prev = stages[stages.length - 1] as Stage;
    const d = grid.dim;
    const b = new StageBuilder();
    prev.units.forEach((u, q) => {
      const w = weights.get(linearKey(layerIndex, q, sharedHere), r * d);
      b.add(r, [q], (inp, out, oo) => matVec(w, r, d, inp, u.offset, out, oo));
    });
    stages.push(b.done());
    grid = { dims: grid.dims, dim: r };
  };
  const product = (window: readonly number[] | 'global'): void => {
    const w = window === 'global' ? grid.dims : window;
    const t = tiles(grid.dims, w);
    stages.push(productStage(stages[stages.length - 1] as Stage, t.groups, grid.dim));
    grid = { dims: t.dims, dim: grid.dim };
  };
  for (const layer of model.layers) {
    switch (layer.kind) {
      case 'conv':
        if (surrogate === 'overlap') {
          grid = overlapConv(layer, grid, shared, weights, stages);
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
        grid = recurrentStages(layer, grid, weights, stages);
        break;
    }
  }
  if (count(grid.dims) > 1) product('global');
  const head = weights.get('head', grid.dim);
  const dim = grid.dim;
  const headStage = new StageBuilder();
  headStage.add(1, [0], (inp, out, oo) => {
    let acc = 0;
    for (let k = 0; k < dim; k++) acc = mulAdd(head[k] as number, inp[k] as number, acc);
    out[oo] = acc;
  });
  stages.push(headStage.done());
  const buffers = stages.map((s) => new Float64Array(s.size));

  const evaluate = (x: Float64Array): number => {
    buffers[0]!.set(x);
    for (let s = 1; s < stages.length; s++) {
      const inp = buffers[s - 1] as Float64Array;
      const out = buffers[s] as Float64Array;
      for (const u of (stages[s] as Stage).units) u.compute(inp, out);
    }
    return (buffers[buffers.length - 1] as Float64Array)[0] as number;
  };

  const probeMatrix = (side: Uint8Array, xa: readonly Float64Array[], xb: readonly Float64Array[]): Float64Array => {
    // Class of every unit: bit 1 = depends on side A, bit 2 = on side B (3: both; 0: constant).
    const cls: Uint8Array[] = stages.map((s) => new Uint8Array(s.units.length));
    for (let p = 0; p < n; p++) cls[0]![p] = (side[p] ?? 0) === 1 ? 1 : 2;
    for (let s = 1; s < stages.length; s++) {
      (stages[s] as Stage).units.forEach((u, q) => {
        let c = 0;
        for (const d of u.deps) c |= cls[s - 1]![d] as number;
        cls[s]![q] = c;
      });
    }
    // Units of class c in stage s; the B-only units that a mixed unit (or the output) reads.
    const ofClass = (s: number, c: number): Unit[] => (stages[s] as Stage).units.filter((_, q) => cls[s]![q] === c);
    const frontier: { s: number; offset: number; length: number }[] = [];
    for (let s = 0; s < stages.length; s++) {
      const needed = new Set<number>();
      if (s + 1 < stages.length) {
        (stages[s + 1] as Stage).units.forEach((u, q) => {
          if (cls[s + 1]![q] === 3) for (const d of u.deps) if (cls[s]![d] === 2) needed.add(d);
        });
      } else if (cls[s]![0] === 2) {
        needed.add(0);
      }
      for (const q of needed) {
        const u = (stages[s] as Stage).units[q] as Unit;
        frontier.push({ s, offset: u.offset, length: u.length });
      }
    }
    const frontierSize = frontier.reduce((a, f) => a + f.length, 0);
    const posA: number[] = [];
    const posB: number[] = [];
    for (let p = 0; p < n; p++) ((side[p] ?? 0) === 1 ? posA : posB).push(p);
    const scatter = (src: Float64Array, where: readonly number[]): void => {
      const x = buffers[0] as Float64Array;
      for (let i = 0; i < where.length; i++) {
        const xo = (where[i] as number) * m;
        for (let c = 0; c < m; c++) x[xo + c] = src[i * m + c] as number;
      }
    };
    // Precomputed unit lists per class, so that the inner loop does no filtering.
    const lists = [0, 1, 2, 3].map((c) => stages.map((_, s) => (s === 0 ? [] : ofClass(s, c))));
    const runList = (c: number): void => {
      const ls = lists[c] as Unit[][];
      for (let s = 1; s < stages.length; s++) {
        const inp = buffers[s - 1] as Float64Array;
        const out = buffers[s] as Float64Array;
        for (const u of ls[s] as Unit[]) u.compute(inp, out);
      }
    };
    runList(0);
    // Side-B units once per column; keep the ones mixed units read.
    const cache = xb.map((vb) => {
      scatter(vb, posB);
      runList(2);
      const saved = new Float64Array(frontierSize);
      let o = 0;
      for (const f of frontier) {
        saved.set((buffers[f.s] as Float64Array).subarray(f.offset, f.offset + f.length), o);
        o += f.length;
      }
      return saved;
    });
    const k = xa.length;
    const kb = xb.length;
    const last = buffers[buffers.length - 1] as Float64Array;
    const f = new Float64Array(k * kb);
    for (let i = 0; i < k; i++) {
      scatter(xa[i] as Float64Array, posA);
      runList(1);
      for (let j = 0; j < kb; j++) {
        const saved = cache[j] as Float64Array;
        let o = 0;
        for (const fr of frontier) {
          const buf = buffers[fr.s] as Float64Array;
          for (let t = 0; t < fr.length; t++) buf[fr.offset + t] = saved[o + t] as number;
          o += fr.length;
        }
        runList(3);
        f[i * kb + j] = last[0] as number;
      }
    }
    return f;
  };

  return { positions: n, features: m, evaluate, probeMatrix };
}

/** Probe inputs: k random assignments of each side's inputs. */
export function probeInputs(ev: Evaluator, side: Uint8Array, k: number, rng: Rng): { xa: Float64Array[]; xb: Float64Array[] } {
  let a = 0;
  for (let p = 0; p < ev.positions; p++) if ((side[p] ?? 0) === 1) a++;
  const b = ev.positions - a;
  const xa = Array.from({ length: k }, () => randomVector(rng, a * ev.features));
  const xb = Array.from({ length: k }, () => randomVector(rng, b * ev.features));
  return { xa, xb };
}

/** The probe matrix by plain evaluation of every entry (the reference for `probeMatrix`). */
export function probeMatrixNaive(ev: Evaluator, side: Uint8Array, xa: readonly Float64Array[], xb: readonly Float64Array[]): Float64Array {
  const m = ev.features;
  const posA: number[] = [];
  const posB: number[] = [];
  for (let p = 0; p < ev.positions; p++) ((side[p] ?? 0) === 1 ? posA : posB).push(p);
  const x = new Float64Array(ev.positions * m);
  const scatter = (src: Float64Array, where: readonly number[]): void => {
    for (let i = 0; i < where.length; i++) for (let c = 0; c < m; c++) x[(where[i] as number) * m + c] = src[i * m + c] as number;
  };
  const f = new Float64Array(xa.length * xb.length);
  xa.forEach((va, i) => {
    scatter(va, posA);
    xb.forEach((vb, j) => {
      scatter(vb, posB);
      f[i * xb.length + j] = ev.evaluate(x);
    });
  });
  return f;
}

/**
 * The probe matrix rank for one partition. `side[p] = 1` puts position p on side A. The probe
 * inputs come from `rng`.
 */
export function probeRankWith(ev: Evaluator, side: Uint8Array, k: number, rng: Rng): number {
  const { xa, xb } = probeInputs(ev, side, k, rng);
  return rankInPlace(ev.probeMatrix(side, xa, xb), k, k);
}

/** Probe rank of a model under a surrogate with fresh weights drawn from `rng`. */
export function probeRank(model: LayeredModel, surrogate: SurrogateKind, side: Uint8Array, k: number, rng: Rng): number {
  const ev = compile(model, surrogate, new WeightStore(rng));
  return probeRankWith(ev, side, k, rng);
}
