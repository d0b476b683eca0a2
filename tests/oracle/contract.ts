/**
 * The oracle's second, independent method: build the explicit coefficient tensor of a network by
 * contracting its tensors, matricise it by the partition and take its rank mod P. It serves
 * explicit (`network:`) models directly, and small `tree`-surrogate layered models as a
 * cross-check of the probe evaluator: those functions are multilinear in the inputs, so the
 * separation rank is exactly the rank of the matricised coefficient tensor.
 *
 * The tensor network of a tree-surrogate chain is rebuilt here from the contributor guide's
 * definition (a matrix per mapped position, a copy tensor per product window, a chain for a
 * depth-1 recurrence, a vector for the head) — not from the product's network code. A copy tensor is
 * realised by identifying the indices it joins; a hyperedge of an explicit network is one index
 * shared by all its tensors. Contraction is variable elimination with a greedy smallest-result
 * order, exact mod P.
 */
import type { ExplicitModel, LayeredModel } from '../../src/config/model.js';
import { add, mul, randomVector, rankInPlace, type Rng } from './field.js';
import { count, flatIndex, multiIndices, poolGroups, treeConvGroups, treeTransposeAxis } from './geometry.js';
import { planModel } from './plan.js';
import { WeightStore, linearKey, mapMatrix, offsetKey, recurrentKeys } from './surrogate.js';

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
 * The factor network of an explicit model: every tensor gets one index per open leg and one per
 * bond it belongs to (legs first, then bonds in the model's order); a bond of three or more
 * tensors is a single shared index (a copy tensor). `entries` gives each tensor's numbers.
 */
export function explicitNetwork(model: ExplicitModel, side: Uint8Array, entries: (tensor: string, size: number) => Float64Array): { net: FactorNetwork; rows: number[]; cols: number[] } {
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
    factors.push({ vars, data: entries(t.name, size) });
  }
  return { net: { dims, factors }, rows, cols };
}

/** Rank mod P of an explicit network with random tensors. */
export function explicitRank(model: ExplicitModel, side: Uint8Array, rng: Rng): number {
  const { net, rows, cols } = explicitNetwork(model, side, (_, size) => randomVector(rng, size));
  return matricisedRank(net, rows, cols);
}

/** Thrown by `treeNetwork` for a model whose function is not a tensor network of this kind. */
export class NotATreeNetwork extends Error {
  override readonly name = 'NotATreeNetwork';
}

/**
 * The tensor network of a layered chain under the `tree` surrogate, over the weights in `weights`
 * (the same keys and the same grouped maps as the evaluator, so both can share one draw): a matrix
 * per mapped position, a copy tensor per product window, a chain for a depth-1 recurrence, a
 * vector for the head. Returns the network and the open index of every input position.
 *
 * The coefficient tensor represents h only when h is multilinear in the inputs with every input
 * used exactly once; anything else throws `NotATreeNetwork`: merges, flatten, upsampling, reuse
 * (overlapping pools, a conv-transpose reading one input twice, depth ≥ 2 recurrences), the square
 * rule, inputs that no output reads (subsampling, `valid` edges, an output position), and dense
 * layers that read the raw input (a sum over positions).
 */
export function treeNetwork(model: LayeredModel, weights: WeightStore): { net: FactorNetwork; inputs: number[] } {
  const plan = planModel(model, 'tree');
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
  const m = plan.m;
  const n = count(plan.input.dims);
  const inputs: number[] = [];
  for (let p = 0; p < n; p++) inputs.push(fresh(m));
  const isInput = new Set(inputs);
  let cur = inputs.slice();
  let gdims: readonly number[] = plan.input.dims;
  let d = m;
  const identity = (k: number): Float64Array => {
    const a = new Float64Array(k * k);
    for (let i = 0; i < k; i++) a[i * k + i] = 1;
    return a;
  };
  const usedOnce = (groups: readonly (readonly number[])[], what: string): void => {
    const uses = new Array<number>(cur.length).fill(0);
    for (const g of groups) for (const p of g) uses[p]!++;
    if (uses.some((u) => u !== 1)) throw new NotATreeNetwork(`${what}: a position is read ${uses.some((u) => u > 1) ? 'twice' : 'by no output'}`);
  };
  // Copy tensor over each group: the children's indices and a new parent index become one index.
  const windows = (groups: readonly (readonly number[])[], what: string): void => {
    usedOnce(groups, what);
    cur = groups.map((g) => {
      if (g.length === 0) throw new NotATreeNetwork(`${what}: an empty window`);
      if (g.length === 1) return cur[g[0] as number] as number;
      const top = fresh(d);
      for (const pos of g) {
        let child = cur[pos] as number;
        if (isInput.has(child)) {
          // An open leg cannot be merged away: route it through an identity matrix first.
          const inner = fresh(d);
          factors.push({ vars: [inner, child], data: identity(d) });
          child = inner;
        }
        parent[find(child)] = find(top);
      }
      return top;
    });
  };
  const linearAt = (v: number, key: string, r: number, g: number): number => {
    const out = fresh(r);
    factors.push({ vars: [out, v], data: mapMatrix(weights, key, r, d, g) });
    return out;
  };
  model.layers.forEach((layer, li) => {
    if (layer.inputs.length !== 1 || layer.inputs[0] !== li - 1) throw new NotATreeNetwork(`layer ${li} is not a chain link`);
    const outGrid = plan.grids[li]!;
    switch (layer.kind) {
      case 'conv': {
        const r = outGrid.width;
        const g = plan.groups[li]!;
        const { groups } = treeConvGroups(gdims, layer.kernel, layer.stride, layer.dilation, layer.padding);
        usedOnce(groups, `conv ${li}`);
        cur = cur.map((v, p) => linearAt(v, linearKey(li, p, model.weightSharing), r, g));
        d = r;
        windows(groups, `conv ${li}`);
        break;
      }
      case 'conv-transpose': {
        const sources = multiIndices(outGrid.dims).map((j) => j.map((jj, a) => treeTransposeAxis(jj, gdims[a] as number, layer.stride[a] as number)));
        usedOnce(sources.map((s) => [flatIndex(s.map((x) => x.source), gdims)]), `conv-transpose ${li}`);
        const r = outGrid.width;
        cur = sources.map((s, o) => {
          const key = offsetKey(li, o, flatIndex(s.map((x) => x.offset), layer.stride), model.weightSharing);
          return linearAt(cur[flatIndex(s.map((x) => x.source), gdims)] as number, key, r, plan.groups[li]!);
        });
        d = r;
        break;
      }
      case 'pool': {
        if (layer.global) {
          windows([cur.map((_, p) => p)], `pool ${li}`);
          break;
        }
        const { groups } = poolGroups(gdims, layer.window, layer.stride, layer.padding);
        windows(groups, `pool ${li}`);
        break;
      }
      case 'dense': {
        const reading = plan.reading[li];
        if (reading === 'input') throw new NotATreeNetwork(`dense ${li} reads the raw input (a sum over positions)`);
        const key = (p: number): string => (reading === 'vector' ? `L${li}` : linearKey(li, p, model.weightSharing));
        cur = cur.map((v, p) => linearAt(v, key(p), layer.units, 1));
        d = layer.units;
        break;
      }
      case 'pointwise':
        if (plan.square[li]) throw new NotATreeNetwork(`activation ${li} squares`);
        break;
      case 'embedding':
        // A per-position linear map, one matrix for every position.
        cur = cur.map((v) => linearAt(v, `L${li}`, layer.dim, 1));
        d = layer.dim;
        break;
      case 'recurrent': {
        if (layer.depth !== 1) throw new NotATreeNetwork('a deep recurrence reuses states');
        if (layer.bidirectional) throw new NotATreeNetwork('both directions read every input');
        // Per-step outputs reuse every state but the last (next step and output).
        if (layer.sequence && cur.length > 1) throw new NotATreeNetwork('per-step outputs reuse states');
        const R = layer.hidden;
        const keys = recurrentKeys(li, 1);
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
        d = R;
        break;
      }
      default:
        throw new NotATreeNetwork(`${layer.kind} ${li}`);
    }
    gdims = outGrid.dims;
    if (cur.length !== count(gdims)) throw new Error(`layer ${li}: ${cur.length} positions, planned ${count(gdims)}`);
  });
  if (cur.length > 1) throw new NotATreeNetwork('the output reads one of several positions');
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
