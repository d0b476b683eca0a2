/**
 * Direct evaluation of a layered model's surrogate function h(x_0 … x_{N−1}) modulo P, exactly as
 * the contributor guide's "surrogate functions" section defines it for every layer kind under the
 * `tree` and `overlap` surrogates, and the probe rank built on it. This is the oracle's main
 * method: it knows nothing about tensor networks, cuts or bounds — it runs the arithmetic circuit
 * on numbers and measures the rank of what comes out. The grid arithmetic is the oracle's own
 * (geometry.ts), and so is the reading of the model (plan.ts).
 *
 * Probe rank: draw weights once, K random assignments of the side-A inputs and K of the side-B
 * inputs, fill F[i][j] = h(xA_i, xB_j) and take rank(F) mod P. Any non-zero minor mod P is a
 * non-zero integer polynomial in the weights and inputs, so the result is a certified lower bound
 * of the generic separation rank; with K above the rank it equals it with high probability.
 *
 * Readings of the text where it is terse or silent (each also in the oracle's report):
 * - (the text now says: a pool window with no tap inside the grid is refused; a conv output with
 *   no position inside the grid is the zero vector);
 * - `groups` of a conv-transpose make its maps block diagonal, as for a conv;
 * - an unshared `overlap` conv-transpose has one set of tap maps per output position;
 * - the `tree` conv-transpose reads input min(⌊j/s⌋, n−1) whatever its padding p (literal text);
 * - upsampling and merges are the same under both surrogates (the text gives them once).
 */
import type { ConvLayer, ConvTransposeLayer, LayeredModel, PoolLayer, RecurrentLayer, UpsampleLayer } from '../../src/config/model.js';
import { INPUT } from '../../src/config/model.js';
import { P, add, inv, mul as fieldMul, mulAdd as fieldMulAdd, randomVector, rankInPlace, type Rng } from './field.js';
import {
  axisTaps,
  cartesian,
  count,
  flatIndex,
  linearAxis,
  multiIndices,
  poolGroups,
  transposePairs,
  treeConvGroups,
  treeTransposeAxis,
  windowAxis,
} from './geometry.js';
import { planModel, type ModelPlan, type SurrogateKind } from './plan.js';

export type { SurrogateKind } from './plan.js';

/** The text refuses this model (not an evaluation failure): the product must refuse it too. */
export class RefusedModel extends Error {
  override readonly name = 'RefusedModel';
}

// Local bindings of the hot arithmetic: under the test runner's module transform every call
// through an imported binding is a property load on a module object, which V8 does not inline
// (measured: about a third slower).
const mul = fieldMul;
const mulAdd = fieldMulAdd;

/**
 * Weights drawn on first request and cached by key, so that two independent constructions of the
 * same network (this evaluator and the tensor contraction) can share one draw. Keys:
 * `L{i}` / `L{i}@{pos}` (linear map of layer i, shared / per position: the tree conv's map at an
 * input position, a per-position dense map, a vector or input dense map), `L{i}t{tap}` /
 * `L{i}@{pos}t{tap}` (overlap taps of a conv or conv-transpose), `L{i}o{offset}` / `L{i}@{pos}`
 * (tree conv-transpose, per offset / per output position), `L{i}:H{l}`, `L{i}:I{l}`,
 * `L{i}:h0_{l}` (recurrent level l), `head` (output vector). A grouped map stores its r×(D/g)
 * blocks under its key (see `mapMatrix`).
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

  /** Fixes a weight before anything draws it (hand-computed examples in the oracle's self-tests). */
  set(key: string, values: readonly number[]): this {
    if (this.cache.has(key)) throw new Error(`weight ${key} is already drawn`);
    this.cache.set(key, Float64Array.from(values));
    return this;
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

export function offsetKey(layer: number, pos: number, offset: number, shared: boolean): string {
  return shared ? `L${layer}o${offset}` : `L${layer}@${pos}`;
}

export function recurrentKeys(layer: number, level: number): { h: string; i: string; h0: string } {
  return { h: `L${layer}:H${level}`, i: `L${layer}:I${level}`, h0: `L${layer}:h0_${level}` };
}

/**
 * A map W ∈ R^{r×D} in `g` groups, row-major: output channels [b·r/g, (b+1)·r/g) read only input
 * channels [b·D/g, (b+1)·D/g). The store holds the r×(D/g) non-zero entries (row by row), so a
 * map of one group is the plain r×D draw.
 */
export function mapMatrix(weights: WeightStore, key: string, r: number, d: number, g: number): Float64Array {
  if (r % g !== 0 || d % g !== 0) throw new Error(`groups ${g} do not divide ${r}×${d}`);
  const dg = d / g;
  const blocks = weights.get(key, r * dg);
  if (g === 1) return blocks;
  const w = new Float64Array(r * d);
  const rg = r / g;
  for (let row = 0; row < r; row++) {
    const b = Math.floor(row / rg);
    for (let c = 0; c < dg; c++) w[row * d + b * dg + c] = blocks[row * dg + c] as number;
  }
  return w;
}

/** A residue for the rational num/den (den invertible mod P). */
function fraction(num: number, den: number): number {
  return mul(num % P, inv(den));
}

/**
 * The compiled circuit: units in topological order, each a vector (a grid position of a layer, a
 * recurrent state, the output) computed from earlier units into one shared buffer. Knowing which
 * inputs every unit depends on lets the probe compute each side-only unit once per row or column
 * instead of once per matrix entry; `evaluate` runs every unit and is the plain reference the
 * fast path is tested against.
 */
interface Unit {
  readonly offset: number;
  readonly length: number;
  /** Units this one reads. */
  readonly deps: readonly number[];
  /** Writes buf[offset .. offset+length); null for an input position. */
  readonly compute: ((buf: Float64Array) => void) | null;
}

class Circuit {
  readonly units: Unit[] = [];
  size = 0;
  add(length: number, deps: readonly number[], make: ((offset: number) => (buf: Float64Array) => void) | null): number {
    const offset = this.size;
    this.units.push({ offset, length, deps, compute: make ? make(offset) : null });
    this.size += length;
    return this.units.length - 1;
  }
  off(u: number): number {
    return (this.units[u] as Unit).offset;
  }
}

/** A grid at run time: the unit holding each position's vector (units may repeat: reuse). */
interface Grid {
  readonly dims: readonly number[];
  readonly width: number;
  readonly units: readonly number[];
}

/** buf[oo..oo+rows) = W·buf[vo..vo+cols), W row-major. */
function matVec(w: Float64Array, rows: number, cols: number, buf: Float64Array, vo: number, out: Float64Array, oo: number): void {
  for (let r = 0; r < rows; r++) {
    let acc = 0;
    const wo = r * cols;
    for (let c = 0; c < cols; c++) acc = mulAdd(w[wo + c] as number, buf[vo + c] as number, acc);
    out[oo + r] = acc;
  }
}

/** out += W·v. */
function matVecAdd(w: Float64Array, rows: number, cols: number, buf: Float64Array, vo: number, out: Float64Array, oo: number): void {
  for (let r = 0; r < rows; r++) {
    let acc = out[oo + r] as number;
    const wo = r * cols;
    for (let c = 0; c < cols; c++) acc = mulAdd(w[wo + c] as number, buf[vo + c] as number, acc);
    out[oo + r] = acc;
  }
}

/** W·v_src. */
function linearUnit(c: Circuit, w: Float64Array, rows: number, cols: number, src: number): number {
  const vo = c.off(src);
  return c.add(rows, [src], (oo) => (buf) => matVec(w, rows, cols, buf, vo, buf, oo));
}

/** Σ_i W_i v_{src_i}; no terms: the zero vector. */
function mapSumUnit(c: Circuit, ws: readonly Float64Array[], srcs: readonly number[], rows: number, cols: number): number {
  const offs = srcs.map((s) => c.off(s));
  return c.add(rows, [...new Set(srcs)], (oo) => (buf) => {
    buf.fill(0, oo, oo + rows);
    for (let i = 0; i < offs.length; i++) matVecAdd(ws[i] as Float64Array, rows, cols, buf, offs[i] as number, buf, oo);
  });
}

/** The elementwise product of the vectors; one vector: itself; none: the all-ones vector. */
function productUnit(c: Circuit, srcs: readonly number[], dim: number): number {
  if (srcs.length === 1) return srcs[0] as number;
  const offs = Int32Array.from(srcs, (s) => c.off(s));
  return c.add(dim, [...new Set(srcs)], (oo) => (buf) => {
    for (let k = 0; k < dim; k++) {
      let acc = 1;
      for (let i = 0; i < offs.length; i++) acc = mul(acc, buf[(offs[i] as number) + k] as number);
      buf[oo + k] = acc;
    }
  });
}

/** Σ coef_i · v_{src_i} (constant coefficients). */
function combinationUnit(c: Circuit, srcs: readonly number[], coefs: readonly number[], dim: number): number {
  if (srcs.length === 1 && coefs[0] === 1) return srcs[0] as number;
  const offs = srcs.map((s) => c.off(s));
  return c.add(dim, [...new Set(srcs)], (oo) => (buf) => {
    for (let k = 0; k < dim; k++) {
      let acc = 0;
      for (let i = 0; i < offs.length; i++) acc = mulAdd(coefs[i] as number, buf[(offs[i] as number) + k] as number, acc);
      buf[oo + k] = acc;
    }
  });
}

/** The concatenation of the vectors, in order. */
function concatUnit(c: Circuit, srcs: readonly number[]): number {
  const parts = srcs.map((s) => ({ off: c.off(s), len: (c.units[s] as Unit).length }));
  const total = parts.reduce((a, p) => a + p.len, 0);
  return c.add(total, [...new Set(srcs)], (oo) => (buf) => {
    let o = oo;
    for (const p of parts) {
      for (let k = 0; k < p.len; k++) buf[o + k] = buf[p.off + k] as number;
      o += p.len;
    }
  });
}

function squareUnit(c: Circuit, src: number, dim: number): number {
  const vo = c.off(src);
  return c.add(dim, [src], (oo) => (buf) => {
    for (let k = 0; k < dim; k++) {
      const v = buf[vo + k] as number;
      buf[oo + k] = mul(v, v);
    }
  });
}

interface Context {
  readonly c: Circuit;
  readonly weights: WeightStore;
  readonly shared: boolean;
  readonly surrogate: SurrogateKind;
  readonly plan: ModelPlan;
}

function treeConv(ctx: Context, layer: ConvLayer, src: Grid, r: number, g: number): Grid {
  const { c, weights, shared } = ctx;
  const tree = treeConvGroups(src.dims, layer.kernel, layer.stride, layer.dilation, layer.padding);
  const mapped = new Map<number, number>();
  const mapAt = (p: number): number => {
    let u = mapped.get(p);
    if (u === undefined) {
      const w = mapMatrix(weights, linearKey(layer.index, p, shared), r, src.width, g);
      u = linearUnit(c, w, r, src.width, src.units[p] as number);
      mapped.set(p, u);
    }
    return u;
  };
  // "An output whose P(j) is empty holds the zero vector": an empty sum.
  const units = tree.groups.map((ps) => (ps.length === 0 ? mapSumUnit(c, [], [], r, src.width) : productUnit(c, ps.map(mapAt), r)));
  return { dims: tree.dims, width: r, units };
}

function overlapConv(ctx: Context, layer: ConvLayer, src: Grid, r: number, g: number): Grid {
  const { c, weights, shared } = ctx;
  const dims = src.dims;
  const geo = dims.map((n, a) => windowAxis(n, layer.kernel[a] as number, layer.stride[a] as number, layer.dilation[a] as number, layer.padding, a));
  const outDims = geo.map((w) => w.out);
  const units = multiIndices(outDims).map((j, o) => {
    const taps = cartesian(j.map((jj, a) => axisTaps(jj, geo[a]!, layer.kernel[a] as number, layer.stride[a] as number, layer.dilation[a] as number)));
    const ws: Float64Array[] = [];
    const srcs: number[] = [];
    taps.forEach((pos, t) => {
      // Every tap's map is drawn, inside the grid or not, so that the draw does not depend on padding.
      const w = mapMatrix(weights, tapKey(layer.index, o, t, shared), r, src.width, g);
      if (pos.every((x, a) => x >= 0 && x < (dims[a] as number))) {
        ws.push(w);
        srcs.push(src.units[flatIndex(pos, dims)] as number);
      }
    });
    return mapSumUnit(c, ws, srcs, r, src.width);
  });
  return { dims: outDims, width: r, units };
}

function convTranspose(ctx: Context, layer: ConvTransposeLayer, src: Grid, g: number): Grid {
  const { c, weights, shared, surrogate } = ctx;
  const dims = src.dims;
  const r = layer.channels;
  const outDims = ctx.plan.grids[layer.index]!.dims;
  const units = multiIndices(outDims).map((j, o) => {
    if (surrogate === 'tree') {
      const per = j.map((jj, a) => treeTransposeAxis(jj, dims[a] as number, layer.stride[a] as number));
      const offset = flatIndex(per.map((x) => x.offset), layer.stride);
      const w = mapMatrix(weights, offsetKey(layer.index, o, offset, shared), r, src.width, g);
      return linearUnit(c, w, r, src.width, src.units[flatIndex(per.map((x) => x.source), dims)] as number);
    }
    const pairs = cartesian(
      j.map((jj, a) => transposePairs(jj, dims[a] as number, layer.kernel[a] as number, layer.stride[a] as number, layer.dilation[a] as number, layer.padding[a] as number)),
    );
    const ws = pairs.map((pair) => mapMatrix(weights, tapKey(layer.index, o, flatIndex(pair.map((p) => p[1]), layer.kernel), shared), r, src.width, g));
    const srcs = pairs.map((pair) => src.units[flatIndex(pair.map((p) => p[0]), dims)] as number);
    return mapSumUnit(c, ws, srcs, r, src.width);
  });
  return { dims: outDims, width: r, units };
}

function poolGrid(ctx: Context, layer: PoolLayer, src: Grid): Grid {
  const { c } = ctx;
  if (layer.global) return { dims: src.dims.map(() => 1), width: src.width, units: [productUnit(c, src.units, src.width)] };
  const pooled = poolGroups(src.dims, layer.window, layer.stride, layer.padding);
  const units = pooled.groups.map((ps) => {
    // "A window with no tap inside the grid is refused."
    if (ps.length === 0) throw new RefusedModel(`pool ${layer.index}: a window reads only padding`);
    return productUnit(c, ps.map((p) => src.units[p] as number), src.width);
  });
  return { dims: pooled.dims, width: src.width, units };
}

function upsampleGrid(ctx: Context, layer: UpsampleLayer, src: Grid): Grid {
  const dims = src.dims;
  const outDims = dims.map((n, a) => n * (layer.factor[a] as number));
  const units = multiIndices(outDims).map((j) => {
    if (layer.mode === 'nearest') {
      return src.units[flatIndex(j.map((jj, a) => Math.floor(jj / (layer.factor[a] as number))), dims)] as number;
    }
    // Per axis the two neighbours with weights (1−λ, λ); across axes the weights multiply.
    const perAxis = j.map((jj, a) => {
      const l = linearAxis(jj, dims[a] as number, layer.factor[a] as number);
      return [
        { i: l.i0, w: fraction(l.den - l.num, l.den) },
        { i: l.i1, w: fraction(l.num, l.den) },
      ].filter((t) => t.w !== 0);
    });
    const byUnit = new Map<number, number>();
    for (const combo of cartesian(perAxis)) {
      const u = src.units[flatIndex(combo.map((t) => t.i), dims)] as number;
      const w = combo.reduce((acc, t) => mul(acc, t.w), 1);
      byUnit.set(u, add(byUnit.get(u) ?? 0, w));
    }
    return combinationUnit(ctx.c, [...byUnit.keys()], [...byUnit.values()], src.width);
  });
  return { dims: outDims, width: src.width, units };
}

/**
 * h^l_t = (W_H^l h^l_{t−1}) ⊙ (W_I^l h^{l−1}_t): one unit per level and step; h^l_0 a constant
 * unit. The grid becomes one position holding h^L_T.
 */
function recurrentGrid(ctx: Context, layer: RecurrentLayer, src: Grid): Grid {
  const { c, weights } = ctx;
  const R = layer.hidden;
  let below: readonly number[] = src.units;
  let dimBelow = src.width;
  for (let l = 1; l <= layer.depth; l++) {
    const keys = recurrentKeys(layer.index, l);
    const wh = weights.get(keys.h, R * R);
    const wi = weights.get(keys.i, R * dimBelow);
    const h0 = weights.get(keys.h0, R);
    let state = c.add(R, [], (oo) => (buf) => buf.set(h0, oo));
    const states: number[] = [];
    const d = dimBelow;
    for (const x of below) {
      const so = c.off(state);
      const xo = c.off(x);
      const a = new Float64Array(R);
      const b = new Float64Array(R);
      state = c.add(R, [state, x], (oo) => (buf) => {
        matVec(wh, R, R, buf, so, a, 0);
        matVec(wi, R, d, buf, xo, b, 0);
        for (let k = 0; k < R; k++) buf[oo + k] = mul(a[k] as number, b[k] as number);
      });
      states.push(state);
    }
    below = states;
    dimBelow = R;
  }
  return { dims: [1], width: R, units: [below[below.length - 1] as number] };
}

export interface Evaluator {
  readonly positions: number;
  readonly features: number;
  readonly plan: ModelPlan;
  /** h(x) mod P by running every unit; x holds the M features of every position, position-major. */
  evaluate(x: Float64Array): number;
  /** The k×k probe matrix F[i][j] = h(xA_i, xB_j), computing side-only units once per row/column. */
  probeMatrix(side: Uint8Array, xa: readonly Float64Array[], xb: readonly Float64Array[]): Float64Array;
  /** Input positions the output structurally depends on (1) — a superset of its receptive field. */
  dependsOn(): Uint8Array;
}

/** Compiles a layered model under a surrogate into a numeric evaluator over the given weights. */
export function compile(model: LayeredModel, surrogate: SurrogateKind, weights: WeightStore): Evaluator {
  const plan = planModel(model, surrogate);
  const m = plan.m;
  const c = new Circuit();
  const n = count(plan.input.dims);
  const inputGrid: Grid = { dims: plan.input.dims, width: m, units: Array.from({ length: n }, () => c.add(m, [], null)) };
  const ctx: Context = { c, weights, shared: model.weightSharing, surrogate, plan };
  const grids: Grid[] = [];
  const gridOf = (i: number): Grid => (i === INPUT ? inputGrid : (grids[i] as Grid));
  for (const layer of model.layers) {
    const src = gridOf(layer.inputs[0] as number);
    const li = layer.index;
    let out: Grid;
    switch (layer.kind) {
      case 'conv': {
        const r = plan.grids[li]!.width;
        const g = plan.groups[li]!;
        out = surrogate === 'tree' ? treeConv(ctx, layer, src, r, g) : overlapConv(ctx, layer, src, r, g);
        break;
      }
      case 'conv-transpose':
        out = convTranspose(ctx, layer, src, plan.groups[li]!);
        break;
      case 'pool':
        out = poolGrid(ctx, layer, src);
        break;
      case 'upsample':
        out = upsampleGrid(ctx, layer, src);
        break;
      case 'flatten':
        out = { dims: [1], width: src.width * src.units.length, units: [concatUnit(c, src.units)] };
        break;
      case 'dense': {
        const u = layer.units;
        const reading = plan.reading[li]!;
        if (reading === 'per-position') {
          const units = src.units.map((v, p) => linearUnit(c, weights.get(linearKey(li, p, ctx.shared), u * src.width), u, src.width, v));
          out = { dims: src.dims, width: u, units };
        } else {
          const v = reading === 'input' ? concatUnit(c, src.units) : (src.units[0] as number);
          const d = reading === 'input' ? src.width * src.units.length : src.width;
          out = { dims: reading === 'input' ? [1] : src.dims, width: u, units: [linearUnit(c, weights.get(`L${li}`, u * d), u, d, v)] };
        }
        break;
      }
      case 'recurrent':
        out = recurrentGrid(ctx, layer, src);
        break;
      case 'pointwise':
        out = plan.square[li] ? { ...src, units: src.units.map((v) => squareUnit(c, v, src.width)) } : src;
        break;
      case 'merge': {
        const srcs = layer.inputs.map(gridOf);
        const units = src.units.map((_, p) => {
          const vs = srcs.map((s) => s.units[p] as number);
          return layer.mode === 'sum' ? combinationUnit(c, vs, vs.map(() => 1), src.width) : concatUnit(c, vs);
        });
        out = { dims: src.dims, width: plan.grids[li]!.width, units };
        break;
      }
    }
    const expected = plan.grids[li]!;
    if (out.width !== expected.width || out.units.length !== count(expected.dims)) {
      throw new Error(`layer ${li}: built ${out.units.length}×${out.width}, planned [${expected.dims.join(',')}]×${expected.width}`);
    }
    grids.push(out);
  }
  const last = grids[grids.length - 1] as Grid;
  const o = last.units[plan.output.index] as number;
  const dim = last.width;
  const head = weights.get('head', dim);
  const oo = c.off(o);
  const outUnit = c.add(1, [o], (off) => (buf) => {
    let acc = 0;
    for (let k = 0; k < dim; k++) acc = mulAdd(head[k] as number, buf[oo + k] as number, acc);
    buf[off] = acc;
  });
  return probeOver(c, n, m, plan, outUnit);
}

function probeOver(c: Circuit, n: number, m: number, plan: ModelPlan, outUnit: number): Evaluator {
  const units = c.units;
  const buf = new Float64Array(c.size);
  const outOffset = (units[outUnit] as Unit).offset;
  const computing = units.filter((u) => u.compute !== null);

  const evaluate = (x: Float64Array): number => {
    buf.set(x.subarray(0, n * m), 0);
    for (const u of computing) u.compute!(buf);
    return buf[outOffset] as number;
  };

  const probeMatrix = (side: Uint8Array, xa: readonly Float64Array[], xb: readonly Float64Array[]): Float64Array => {
    // Class of every unit: bit 1 = depends on side A, bit 2 = on side B (3: both; 0: constant).
    const cls = new Uint8Array(units.length);
    units.forEach((u, q) => {
      if (q < n) cls[q] = (side[q] ?? 0) === 1 ? 1 : 2;
      else {
        let k = 0;
        for (const d of u.deps) k |= cls[d] as number;
        cls[q] = k;
      }
    });
    const lists = [0, 1, 2, 3].map((k) => units.filter((u, q) => u.compute !== null && cls[q] === k));
    // The B-only units that a mixed unit (or the output) reads.
    const needed = new Set<number>();
    units.forEach((u, q) => {
      if (cls[q] === 3) for (const d of u.deps) if (cls[d] === 2) needed.add(d);
    });
    if (cls[outUnit] === 2) needed.add(outUnit);
    const frontier = [...needed].map((q) => units[q] as Unit);
    const frontierSize = frontier.reduce((a, f) => a + f.length, 0);
    const posA: number[] = [];
    const posB: number[] = [];
    for (let p = 0; p < n; p++) ((side[p] ?? 0) === 1 ? posA : posB).push(p);
    const scatter = (src: Float64Array, where: readonly number[]): void => {
      for (let i = 0; i < where.length; i++) {
        const xo = (where[i] as number) * m;
        for (let k = 0; k < m; k++) buf[xo + k] = src[i * m + k] as number;
      }
    };
    const run = (list: readonly Unit[]): void => {
      for (const u of list) u.compute!(buf);
    };
    run(lists[0]!);
    const cache = xb.map((vb) => {
      scatter(vb, posB);
      run(lists[2]!);
      const saved = new Float64Array(frontierSize);
      let o = 0;
      for (const f of frontier) {
        saved.set(buf.subarray(f.offset, f.offset + f.length), o);
        o += f.length;
      }
      return saved;
    });
    const mixed = lists[3]!;
    const f = new Float64Array(xa.length * xb.length);
    for (let i = 0; i < xa.length; i++) {
      scatter(xa[i] as Float64Array, posA);
      run(lists[1]!);
      for (let j = 0; j < xb.length; j++) {
        const saved = cache[j] as Float64Array;
        let o = 0;
        for (const fr of frontier) {
          for (let t = 0; t < fr.length; t++) buf[fr.offset + t] = saved[o + t] as number;
          o += fr.length;
        }
        run(mixed);
        f[i * xb.length + j] = buf[outOffset] as number;
      }
    }
    return f;
  };

  const dependsOn = (): Uint8Array => {
    const seen = new Uint8Array(units.length);
    const stack = [outUnit];
    seen[outUnit] = 1;
    while (stack.length > 0) {
      const q = stack.pop() as number;
      for (const d of (units[q] as Unit).deps) {
        if (!seen[d]) {
          seen[d] = 1;
          stack.push(d);
        }
      }
    }
    return seen.slice(0, n);
  };

  return { positions: n, features: m, plan, evaluate, probeMatrix, dependsOn };
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
