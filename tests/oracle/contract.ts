/**
 * The oracle's second, independent method: build the explicit coefficient tensor of a network by
 * contracting its tensors, matricise it by the partition and take its rank mod P. It serves
 * explicit (`network:`) models directly, and small `tree`-surrogate layered models as a
 * cross-check of the probe evaluator: those functions are multilinear in the inputs, so the
 * separation rank is exactly the rank of the matricised coefficient tensor.
 *
 * The tensor network of a tree-surrogate model is rebuilt here from the contributor guide's
 * definition (a matrix per conv position, a copy tensor per product window, a chain for a depth-1
 * recurrence, a vector for the head) — not from the product's network code. A copy tensor is
 * realised by identifying the indices it joins; a hyperedge of an explicit network is one index
 * shared by all its tensors. Contraction is variable elimination with a greedy smallest-result
 * order, exact mod P.
 */
import type { ExplicitModel, LayeredModel } from '../../src/config/model.js';
import { add, mul, randomVector, rankInPlace, type Rng } from './field.js';
import { WeightStore, linearKey, recurrentKeys } from './surrogate.js';

export interface Factor {
  readonly vars: readonly number[];
  readonly data: Float64Array;
}

/** A network of factors over indices; `open` are the indices that stay, in the order given. */
export interface FactorNetwork {
  readonly dims: number[];
  readonly factors: Factor[];
}

const MAX_FACTOR = 1 << 22;

/**
 * Σ over `sum` (or no sum when null) of the product of `fs`, as a factor over `keep` (row-major,
 * first index most significant). Indices of `fs` must all lie in keep ∪ {sum}.
 */
function productSum(net: FactorNetwork, fs: readonly Factor[], keep: readonly number[], sum: number | null): Factor {
  const dims = net.dims;
  const size = keep.reduce((a, v) => a * (dims[v] as number), 1);
  if (size > MAX_FACTOR) throw new Error(`intermediate factor of ${size} entries`);
  // Stride of every keep/sum index inside every factor.
  const strideIn = (f: Factor, v: number): number => {
    let s = 1;
    for (let i = f.vars.length - 1; i >= 0; i--) {
      if (f.vars[i] === v) return s;
      s *= dims[f.vars[i] as number] as number;
    }
    return 0;
  };
  const keepStrides = fs.map((f) => keep.map((v) => strideIn(f, v)));
  const sumStrides = fs.map((f) => (sum === null ? 0 : strideIn(f, sum)));
  const sumDim = sum === null ? 1 : (dims[sum] as number);
  const out = new Float64Array(size);
  const idx = new Array<number>(keep.length).fill(0);
  const base = new Array<number>(fs.length).fill(0);
  for (let flat = 0; flat < size; flat++) {
    // base offsets from the current multi-index
    for (let f = 0; f < fs.length; f++) {
      let o = 0;
      const ks = keepStrides[f] as number[];
      for (let i = 0; i < keep.length; i++) o += (idx[i] as number) * (ks[i] as number);
      base[f] = o;
    }
    let acc = 0;
    for (let s = 0; s < sumDim; s++) {
      let prod = 1;
      for (let f = 0; f < fs.length; f++) {
        prod = mul(prod, (fs[f] as Factor).data[(base[f] as number) + s * (sumStrides[f] as number)] as number);
        if (prod === 0) break;
      }
      acc = add(acc, prod);
    }
    out[flat] = acc;
    // odometer
    for (let i = keep.length - 1; i >= 0; i--) {
      const d = dims[keep[i] as number] as number;
      idx[i] = (idx[i] as number) + 1;
      if ((idx[i] as number) < d) break;
      idx[i] = 0;
    }
  }
  return { vars: [...keep], data: out };
}

/** Contracts every index not in `open`; returns the full tensor over `open` (row-major). */
export function contract(net: FactorNetwork, open: readonly number[]): Float64Array {
  const openSet = new Set(open);
  let factors = net.factors.slice();
  const internal = new Set<number>();
  for (const f of factors) {
    if (new Set(f.vars).size !== f.vars.length) throw new Error('a factor lists one index twice');
    for (const v of f.vars) if (!openSet.has(v)) internal.add(v);
  }
  while (internal.size > 0) {
    // Greedy: eliminate the index whose result factor is smallest.
    let best = -1;
    let bestSize = Infinity;
    for (const v of internal) {
      const union = new Set<number>();
      for (const f of factors) if (f.vars.includes(v)) for (const u of f.vars) if (u !== v) union.add(u);
      let size = 1;
      for (const u of union) size *= net.dims[u] as number;
      if (size < bestSize) {
        bestSize = size;
        best = v;
      }
    }
    const touching = factors.filter((f) => f.vars.includes(best));
    const rest = factors.filter((f) => !f.vars.includes(best));
    const keep: number[] = [];
    for (const f of touching) for (const u of f.vars) if (u !== best && !keep.includes(u)) keep.push(u);
    rest.push(productSum(net, touching, keep, best));
    factors = rest;
    internal.delete(best);
  }
  for (const f of factors) for (const v of f.vars) if (!openSet.has(v)) throw new Error('unexpected index left');
  return productSum(net, factors, open, null).data;
}

/** Rank mod P of the tensor over rows ++ cols, matricised with `rows` as the row indices. */
export function matricisedRank(net: FactorNetwork, rows: readonly number[], cols: readonly number[]): number {
  const t = contract(net, [...rows, ...cols]);
  const r = rows.reduce((a, v) => a * (net.dims[v] as number), 1);
  const c = cols.reduce((a, v) => a * (net.dims[v] as number), 1);
  return rankInPlace(t, r, c);
}

/** Total dimension of the open legs of an explicit model. */
export function explicitOpenSize(model: ExplicitModel): number {
  let s = 1;
  for (const t of model.tensors) for (const l of t.legs) s *= l.dim;
  return s;
}

/**
 * Rank mod P of an explicit network with random tensors: every tensor gets one index per open leg
 * and one per bond it belongs to; a bond of three or more tensors is a single shared index (a
 * copy tensor).
 */
export function explicitRank(model: ExplicitModel, side: Uint8Array, rng: Rng): number {
  const dims: number[] = [];
  const rows: number[] = [];
  const cols: number[] = [];
  const fresh = (d: number): number => {
    dims.push(d);
    return dims.length - 1;
  };
  const bondVar = model.bonds.map((b) => fresh(b.dim));
  const factors: Factor[] = [];
  for (const t of model.tensors) {
    const vars: number[] = [];
    for (const leg of t.legs) {
      const v = fresh(leg.dim);
      vars.push(v);
      ((side[leg.position] ?? 0) === 1 ? rows : cols).push(v);
    }
    model.bonds.forEach((b, i) => {
      const times = b.tensors.filter((n) => n === t.name).length;
      if (times > 1) throw new Error(`bond lists tensor ${t.name} twice`);
      if (times === 1) vars.push(bondVar[i] as number);
    });
    const size = vars.reduce((a, v) => a * (dims[v] as number), 1);
    factors.push({ vars, data: randomVector(rng, size) });
  }
  return matricisedRank({ dims, factors }, rows, cols);
}

/**
 * The tensor network of a layered model under the `tree` surrogate, over the weights in `weights`
 * (the same keys as the evaluator uses, so both can share one draw). Returns the network and the
 * open index of every input position. Depth ≥ 2 recurrences reuse states and are not tensor
 * networks: they throw.
 */
export function treeNetwork(model: LayeredModel, weights: WeightStore): { net: FactorNetwork; inputs: number[] } {
  const dims: number[] = [];
  const factors: Factor[] = [];
  const parent: number[] = [];
  const fresh = (d: number): number => {
    dims.push(d);
    parent.push(dims.length - 1);
    return dims.length - 1;
  };
  const find = (v: number): number => {
    while (parent[v] !== v) v = parent[v] as number;
    return v;
  };
  const shape = model.input.shape;
  const n = shape.reduce((a, b) => a * b, 1);
  const inputs: number[] = [];
  for (let p = 0; p < n; p++) inputs.push(fresh(model.input.features));
  const isInput = new Set(inputs);
  let cur = inputs.slice();
  let gdims = [...shape];
  let d = model.input.features;
  const identity = (k: number): Float64Array => {
    const m = new Float64Array(k * k);
    for (let i = 0; i < k; i++) m[i * k + i] = 1;
    return m;
  };
  // Copy tensor over each window: the children's indices and a new parent index become one index.
  const windows = (window: readonly number[]): void => {
    if (window.length !== gdims.length) throw new Error('window rank mismatch');
    const nd = gdims.map((x, a) => {
      const w = window[a] as number;
      if (x % w !== 0) throw new Error('window does not tile');
      return x / w;
    });
    const next: number[] = [];
    const width = gdims.length === 2 ? (gdims[1] as number) : 1;
    const wh = gdims.length === 2 ? (window[0] as number) : 1;
    const ww = gdims.length === 2 ? (window[1] as number) : (window[0] as number);
    const rowsOut = gdims.length === 2 ? (nd[0] as number) : 1;
    const colsOut = gdims.length === 2 ? (nd[1] as number) : (nd[0] as number);
    for (let i = 0; i < rowsOut; i++) {
      for (let j = 0; j < colsOut; j++) {
        const top = fresh(d);
        for (let a = 0; a < wh; a++) {
          for (let b = 0; b < ww; b++) {
            const pos = gdims.length === 2 ? (i * wh + a) * width + (j * ww + b) : j * ww + b;
            let child = cur[pos] as number;
            if (isInput.has(child)) {
              // An open leg cannot be merged away: route it through an identity matrix first.
              const inner = fresh(d);
              factors.push({ vars: [inner, child], data: identity(d) });
              child = inner;
            }
            parent[find(child)] = find(top);
          }
        }
        next.push(top);
      }
    }
    cur = next;
    gdims = nd;
  };
  const linear = (key: (q: number) => string, r: number): void => {
    cur = cur.map((v, q) => {
      const out = fresh(r);
      factors.push({ vars: [out, v], data: weights.get(key(q), r * d) });
      return out;
    });
    d = r;
  };
  for (const layer of model.layers) {
    switch (layer.kind) {
      case 'conv':
        linear((q) => linearKey(layer.index, q, model.weightSharing), layer.channels);
        if (layer.stride.some((s) => s > 1)) windows(layer.stride);
        break;
      case 'pool':
        windows(layer.global ? gdims : layer.window);
        break;
      case 'dense':
        if (cur.length !== 1) throw new Error('dense on several positions');
        linear(() => linearKey(layer.index, 0, true), layer.units);
        break;
      case 'recurrent': {
        if (layer.depth !== 1) throw new Error('a deep recurrence reuses states: not a tensor network');
        if (gdims.length !== 1) throw new Error('recurrent needs a 1D grid');
        const R = layer.hidden;
        const keys = recurrentKeys(layer.index, 1);
        const wh = weights.get(keys.h, R * R);
        const wi = weights.get(keys.i, R * d);
        let state = fresh(R);
        factors.push({ vars: [state], data: weights.get(keys.h0, R) });
        for (const x of cur) {
          const a = fresh(R);
          const b = fresh(R);
          factors.push({ vars: [a, state], data: wh });
          factors.push({ vars: [b, x], data: wi });
          parent[find(b)] = find(a);
          state = a;
        }
        cur = [state];
        gdims = [1];
        d = R;
        break;
      }
    }
  }
  if (cur.length > 1) windows(gdims);
  factors.push({ vars: [cur[0] as number], data: weights.get('head', d) });
  const renamed = factors.map((f) => ({ vars: f.vars.map(find), data: f.data }));
  return { net: { dims, factors: renamed }, inputs };
}

/** Coefficient-tensor rank of a tree-surrogate layered model for a partition. */
export function treeTensorRank(model: LayeredModel, side: Uint8Array, weights: WeightStore): number {
  const { net, inputs } = treeNetwork(model, weights);
  const rows = inputs.filter((_, p) => (side[p] ?? 0) === 1);
  const cols = inputs.filter((_, p) => (side[p] ?? 0) !== 1);
  return matricisedRank(net, rows, cols);
}

