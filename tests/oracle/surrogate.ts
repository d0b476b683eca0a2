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
 * - upsampling and merges are the same under both surrogates (the text gives them once);
 * - sequences: every new kind (embedding, position, class token, recurrent, attention) is the same
 *   under both surrogates;
 * - an `embedding` is one matrix for every position even when `weight_sharing` is false (the text
 *   says "shared across positions", without the "(always)" it gives attention and recurrences);
 * - a token input ignores `input.representation` (M = V "whatever else the config says"), and its
 *   probe draws tokens (indicator vectors): the rank measured is that of the function on the
 *   discrete domain, which for a position entering with degree > 1 (attention, deep recurrences)
 *   can be below the rank of the same polynomial on continuous inputs;
 * - an attention layer whose head width is not given and does not divide the width, or a window
 *   on a 2D grid, is refused (the text is silent); a window of 0 attends to the position itself;
 *   a causal mask on a 2D grid compares row-major indices;
 * - the forward chain of a bidirectional level reads z^{l−1} (the joined directions) like the
 *   backward one ("as above" read with z for h);
 * - the default output rule for a class token applies even when every attention layer is causal:
 *   position 0 then reads only the class token, and h is constant (not zero, so not refused).
 */
import type {
  AttentionLayer,
  ClassTokenLayer,
  ConvLayer,
  ConvTransposeLayer,
  EmbeddingLayer,
  LayeredModel,
  PoolLayer,
  PositionLayer,
  RecurrentLayer,
  UpsampleLayer,
} from '../../src/config/model.js';
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
 * `L{i}:h0_{l}` (recurrent level l; the backward chain `L{i}:UH{l}`, `L{i}:UI{l}`, `L{i}:b0_{l}`),
 * `L{i}` (embedding E, class token c), `L{i}@{pos}` (position vector p_pos), `L{i}:Q{h}`,
 * `L{i}:K{h}`, `L{i}:V{h}`, `L{i}:O{h}` (attention head h), `head` (output vector). A grouped map
 * stores its r×(D/g) blocks under its key (see `mapMatrix`).
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

/** The backward chain of a bidirectional level: U_H, U_I and the learned b_{T+1}. */
export function backwardKeys(layer: number, level: number): { h: string; i: string; h0: string } {
  return { h: `L${layer}:UH${level}`, i: `L${layer}:UI${level}`, h0: `L${layer}:b0_${level}` };
}

/** Head h of an attention layer: Q, K, V (a×D, row-major) and O (D×a). */
export function attentionKeys(layer: number, head: number): { q: string; k: string; v: string; o: string } {
  return { q: `L${layer}:Q${head}`, k: `L${layer}:K${head}`, v: `L${layer}:V${head}`, o: `L${layer}:O${head}` };
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
  readonly attention: AttentionForm;
}

/**
 * How attention layers are evaluated: `literal` is the text's double sum, term by term;
 * `aggregate` (the default, a few times faster) regroups it as y_i = Σ_h O_h S_{h,i}ᵀ Q_h v_i with
 * S_{h,i} = Σ_{j∈N(i)} (K_h v_j)(V_h v_j)ᵀ (every N(i) is an interval of positions). Exact
 * arithmetic gives the same numbers either way; the self-tests compare the two on every
 * attention family.
 */
export type AttentionForm = 'literal' | 'aggregate';

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
 * One chain of a recurrent level over the steps in `order` (forward: 1..T, backward: T..1):
 * s_t = (W_H s_prev) ⊙ (W_I x_t) from a learned start vector. Returns the state unit of every
 * step, indexed by step (not by visiting order).
 */
function chain(c: Circuit, keys: { h: string; i: string; h0: string }, weights: WeightStore, R: number, xs: readonly number[], d: number, order: readonly number[]): number[] {
  const wh = weights.get(keys.h, R * R);
  const wi = weights.get(keys.i, R * d);
  const h0 = weights.get(keys.h0, R);
  let state = c.add(R, [], (oo) => (buf) => buf.set(h0, oo));
  const states: number[] = new Array<number>(xs.length);
  for (const t of order) {
    const so = c.off(state);
    const xo = c.off(xs[t] as number);
    const a = new Float64Array(R);
    const b = new Float64Array(R);
    state = c.add(R, [state, xs[t] as number], (oo) => (buf) => {
      matVec(wh, R, R, buf, so, a, 0);
      matVec(wi, R, d, buf, xo, b, 0);
      for (let k = 0; k < R; k++) buf[oo + k] = mul(a[k] as number, b[k] as number);
    });
    states[t] = state;
  }
  return states;
}

/**
 * The guide's recurrent layer. Unidirectional: h^l_t = (W_H^l h^l_{t−1}) ⊙ (W_I^l h^{l−1}_t) from
 * a learned h^l_0, h^0_t = v_t, z_t = h^L_t. Bidirectional: level l runs a forward chain f^l (as
 * above) and a backward chain b^l_t = (U_H^l b^l_{t+1}) ⊙ (U_I^l z^{l−1}_t) from a learned
 * b^l_{T+1}, both reading z^{l−1}_t = [f^{l−1}_t ; b^{l−1}_t] (or f + b), z^0_t = v_t.
 * `sequence`: the grid keeps T positions holding z_t = z^L_t; otherwise one position holding
 * h^L_T, or [f^L_T ; b^L_1] (or their sum).
 */
function recurrentGrid(ctx: Context, layer: RecurrentLayer, src: Grid): Grid {
  const { c, weights } = ctx;
  const R = layer.hidden;
  const T = src.units.length;
  const forward = Array.from({ length: T }, (_, t) => t);
  const backward = forward.slice().reverse();
  const join = (f: number, b: number): number =>
    layer.merge === 'concat' ? concatUnit(c, [f, b]) : combinationUnit(c, [f, b], [1, 1], R);
  let below: readonly number[] = src.units;
  let dimBelow = src.width;
  let last: number[] = [];
  for (let l = 1; l <= layer.depth; l++) {
    const f = chain(c, recurrentKeys(layer.index, l), weights, R, below, dimBelow, forward);
    if (!layer.bidirectional) {
      below = f;
      dimBelow = R;
      last = [f[T - 1] as number];
      continue;
    }
    const b = chain(c, backwardKeys(layer.index, l), weights, R, below, dimBelow, backward);
    below = f.map((ft, t) => join(ft, b[t] as number));
    dimBelow = layer.merge === 'concat' ? 2 * R : R;
    last = [f[T - 1] as number, b[0] as number];
  }
  if (layer.sequence) return { dims: src.dims, width: dimBelow, units: below };
  const final = last.length === 1 ? (last[0] as number) : join(last[0] as number, last[1] as number);
  return { dims: [1], width: dimBelow, units: [final] };
}

/** v ← E v at every position, E ∈ R^{d×D} shared across positions (whatever `weight_sharing` says). */
function embeddingGrid(ctx: Context, layer: EmbeddingLayer, src: Grid): Grid {
  const e = ctx.weights.get(`L${layer.index}`, layer.dim * src.width);
  return { dims: src.dims, width: layer.dim, units: src.units.map((v) => linearUnit(ctx.c, e, layer.dim, src.width, v)) };
}

/** v_t ← v_t + p_t, one learned vector per position (`fixed` read as learned). */
function positionGrid(ctx: Context, layer: PositionLayer, src: Grid): Grid {
  const { c, weights } = ctx;
  const D = src.width;
  const units = src.units.map((v, p) => {
    const pv = weights.get(`L${layer.index}@${p}`, D);
    const vo = c.off(v);
    return c.add(D, [v], (oo) => (buf) => {
      for (let k = 0; k < D; k++) buf[oo + k] = add(buf[vo + k] as number, pv[k] as number);
    });
  });
  return { dims: src.dims, width: D, units };
}

/** Position 0 a learned vector c, positions 1..N the inputs in row-major order. */
function classTokenGrid(ctx: Context, layer: ClassTokenLayer, src: Grid): Grid {
  const cv = ctx.weights.get(`L${layer.index}`, src.width);
  const token = ctx.c.add(src.width, [], (oo) => (buf) => buf.set(cv, oo));
  return { dims: [src.units.length + 1], width: src.width, units: [token, ...src.units] };
}

/**
 * Linearised self-attention: y_i = Σ_{h<H} Σ_{j∈N(i)} ⟨Q_h v_i, K_h v_j⟩ · O_h V_h v_j, with
 * Q_h, K_h, V_h ∈ R^{a×D}, O_h ∈ R^{D×a} shared across positions. N(i): every position; with
 * `causal`, j ≤ i; with a window w (1D), |i − j| ≤ w (and j ≤ i when causal). Evaluated literally
 * (the double sum, no aggregate), one projection unit per position holding every head's
 * [Q v ; K v ; V v].
 */
/** N(i) as the interval [lo, hi] of positions: all, j ≤ i (causal), |i − j| ≤ w (window). */
function attentionField(layer: AttentionLayer, n: number, i: number): { lo: number; hi: number } {
  let lo = 0;
  let hi = n - 1;
  if (layer.causal) hi = i;
  if (layer.window !== undefined) {
    lo = Math.max(lo, i - layer.window);
    hi = Math.min(hi, i + layer.window);
  }
  return { lo, hi };
}

function attentionGrid(ctx: Context, layer: AttentionLayer, src: Grid, a: number): Grid {
  return ctx.attention === 'literal' ? attentionLiteral(ctx, layer, src, a) : attentionAggregate(ctx, layer, src, a);
}

function attentionWeights(ctx: Context, layer: AttentionLayer, D: number, a: number): { q: Float64Array; k: Float64Array; v: Float64Array; o: Float64Array }[] {
  return Array.from({ length: layer.heads }, (_, h) => {
    const keys = attentionKeys(layer.index, h);
    return { q: ctx.weights.get(keys.q, a * D), k: ctx.weights.get(keys.k, a * D), v: ctx.weights.get(keys.v, a * D), o: ctx.weights.get(keys.o, D * a) };
  });
}

/**
 * The aggregate form: per position j a unit holding every head's q_j and k_j ⊗ val_j (a×a); per
 * output i a unit of S_i = Σ_{j∈N(i)} k_j ⊗ val_j (every head), shared where the intervals agree:
 * a field starting at 0 (full attention, a causal mask) is a prefix sum, built as a chain
 * P_{t+1} = P_t + k_t ⊗ val_t; a window that starts later sums its own positions. Each unit reads
 * exactly the positions of its field, so `dependsOn` stays the receptive field.
 */
function attentionAggregate(ctx: Context, layer: AttentionLayer, src: Grid, a: number): Grid {
  const { c } = ctx;
  const D = src.width;
  const H = layer.heads;
  const n = src.units.length;
  const heads = attentionWeights(ctx, layer, D, a);
  const aa = a * a;
  const per = a + aa; // q, then k ⊗ val (row t of k times val)
  const kv = new Float64Array(2 * a);
  const proj = src.units.map((u) => {
    const vo = c.off(u);
    return c.add(H * per, [u], (oo) => (buf) => {
      for (let h = 0; h < H; h++) {
        const w = heads[h] as { q: Float64Array; k: Float64Array; v: Float64Array };
        const base = oo + h * per;
        matVec(w.q, a, D, buf, vo, buf, base);
        matVec(w.k, a, D, buf, vo, kv, 0);
        matVec(w.v, a, D, buf, vo, kv, a);
        for (let t = 0; t < a; t++) for (let r = 0; r < a; r++) buf[base + a + t * a + r] = mul(kv[t] as number, kv[a + r] as number);
      }
    });
  });
  const projOffs = proj.map((u) => c.off(u));
  const block = H * aa;
  /** out = Σ over positions js of their k ⊗ val blocks (plus `base` when given). */
  const sumUnit = (js: readonly number[], base: number | undefined): number => {
    const bo = base === undefined ? -1 : c.off(base);
    return c.add(block, [...(base === undefined ? [] : [base]), ...js.map((j) => proj[j] as number)], (oo) => (buf) => {
      if (bo < 0) buf.fill(0, oo, oo + block);
      else for (let e = 0; e < block; e++) buf[oo + e] = buf[bo + e] as number;
      for (const j of js) {
        const po = projOffs[j] as number;
        for (let h = 0; h < H; h++) for (let e = 0; e < aa; e++) buf[oo + h * aa + e] = add(buf[oo + h * aa + e] as number, buf[po + h * per + a + e] as number);
      }
    });
  };
  const prefix: number[] = []; // prefix[t] = P_{t+1}
  const prefixTo = (hi: number): number => {
    while (prefix.length <= hi) prefix.push(sumUnit([prefix.length], prefix.length === 0 ? undefined : prefix[prefix.length - 1]));
    return prefix[hi] as number;
  };
  const acc = new Float64Array(a);
  const units = src.units.map((_, i) => {
    const { lo, hi } = attentionField(layer, n, i);
    const field = lo === 0 ? prefixTo(hi) : sumUnit(Array.from({ length: hi - lo + 1 }, (_, t) => lo + t), undefined);
    const qi = projOffs[i] as number;
    const so = c.off(field);
    return c.add(D, [proj[i] as number, field], (oo) => (buf) => {
      buf.fill(0, oo, oo + D);
      for (let h = 0; h < H; h++) {
        const q = qi + h * per;
        // acc_r = Σ_t q_t · S[t][r].
        for (let r = 0; r < a; r++) {
          let x = 0;
          for (let t = 0; t < a; t++) x = mulAdd(buf[q + t] as number, buf[so + h * aa + t * a + r] as number, x);
          acc[r] = x;
        }
        matVecAdd((heads[h] as { o: Float64Array }).o, D, a, acc, 0, buf, oo);
      }
    });
  });
  return { dims: src.dims, width: D, units };
}

function attentionLiteral(ctx: Context, layer: AttentionLayer, src: Grid, a: number): Grid {
  const { c } = ctx;
  const D = src.width;
  const H = layer.heads;
  const n = src.units.length;
  const heads = attentionWeights(ctx, layer, D, a);
  const per = 3 * a; // q, k, v of one head
  const proj = src.units.map((u) => {
    const vo = c.off(u);
    return c.add(H * per, [u], (oo) => (buf) => {
      heads.forEach((w, h) => {
        const base = oo + h * per;
        matVec(w.q, a, D, buf, vo, buf, base);
        matVec(w.k, a, D, buf, vo, buf, base + a);
        matVec(w.v, a, D, buf, vo, buf, base + 2 * a);
      });
    });
  });
  const acc = new Float64Array(a);
  const units = src.units.map((_, i) => {
    // N(i) literally: every j, dropping j > i when causal and |i − j| > w with a window.
    const field: number[] = [];
    for (let j = 0; j < n; j++) {
      if (layer.causal && j > i) continue;
      if (layer.window !== undefined && Math.abs(i - j) > layer.window) continue;
      field.push(j);
    }
    const qi = c.off(proj[i] as number);
    const offs = field.map((j) => c.off(proj[j] as number));
    return c.add(D, [...new Set([proj[i] as number, ...field.map((j) => proj[j] as number)])], (oo) => (buf) => {
      buf.fill(0, oo, oo + D);
      for (let h = 0; h < H; h++) {
        acc.fill(0);
        const qo = qi + h * per;
        for (const jo of offs) {
          const ko = jo + h * per + a;
          let score = 0;
          for (let t = 0; t < a; t++) score = mulAdd(buf[qo + t] as number, buf[ko + t] as number, score);
          const vo = ko + a;
          for (let t = 0; t < a; t++) acc[t] = mulAdd(score, buf[vo + t] as number, acc[t] as number);
        }
        matVecAdd((heads[h] as { o: Float64Array }).o, D, a, acc, 0, buf, oo);
      }
    });
  });
  return { dims: src.dims, width: D, units };
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
export function compile(model: LayeredModel, surrogate: SurrogateKind, weights: WeightStore, attention: AttentionForm = 'aggregate'): Evaluator {
  const plan = planModel(model, surrogate);
  const m = plan.m;
  const c = new Circuit();
  const n = count(plan.input.dims);
  const inputGrid: Grid = { dims: plan.input.dims, width: m, units: Array.from({ length: n }, () => c.add(m, [], null)) };
  const ctx: Context = { c, weights, shared: model.weightSharing, surrogate, plan, attention };
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
      case 'embedding':
        out = embeddingGrid(ctx, layer, src);
        break;
      case 'position':
        out = positionGrid(ctx, layer, src);
        break;
      case 'class-token':
        out = classTokenGrid(ctx, layer, src);
        break;
      case 'attention':
        out = attentionGrid(ctx, layer, src, plan.headDim[li]!);
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

  // Units the output reads, directly or not: the probe runs only these (an attention layer's
  // other outputs, a recurrent layer's unread steps, ... are left out).
  const live = new Uint8Array(units.length);
  live[outUnit] = 1;
  for (let q = outUnit; q >= 0; q--) if (live[q]) for (const d of (units[q] as Unit).deps) live[d] = 1;

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
    const lists = [0, 1, 2, 3].map((k) => units.filter((u, q) => u.compute !== null && live[q] === 1 && cls[q] === k));
    // The B-only units that a mixed unit (or the output) reads.
    const needed = new Set<number>();
    units.forEach((u, q) => {
      if (cls[q] === 3 && live[q] === 1) for (const d of u.deps) if (cls[d] === 2) needed.add(d);
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

/**
 * A side of a token input is enumerated (every one of its V^n token assignments) when there are
 * at most this many times k of them; otherwise 2k random assignments are drawn. The domain is
 * discrete, so a random sample of rows need not reach the rank of the whole matrix the way
 * continuous random inputs do (a direction carried by one token at one position is only seen by
 * rows that hold it): enumeration makes small sides exact, and the larger sample lowers the odds
 * of reading too low elsewhere. Reading too low never hides an upper bound that is too small.
 */
const ENUMERATE_TOKENS = 4;

/**
 * Token assignments of n positions as indicator vectors (V numbers per position, position-major):
 * all V^n of them when few, else 2k random ones (distinct where the draw allows).
 */
function tokenAssignments(rng: Rng, n: number, v: number, k: number): Float64Array[] {
  const total = v ** n;
  const indicator = (tokens: readonly number[]): Float64Array => {
    const x = new Float64Array(n * v);
    tokens.forEach((u, p) => (x[p * v + u] = 1));
    return x;
  };
  if (total <= ENUMERATE_TOKENS * k) {
    return Array.from({ length: total }, (_, code) => {
      const tokens: number[] = [];
      for (let p = 0, c = code; p < n; p++, c = Math.floor(c / v)) tokens.push(c % v);
      return indicator(tokens);
    });
  }
  const seen = new Set<string>();
  const out: Float64Array[] = [];
  for (let tries = 0; out.length < 2 * k && tries < 40 * k; tries++) {
    const tokens = Array.from({ length: n }, () => rng.int(0, v - 1));
    const key = tokens.join(',');
    if (seen.has(key)) continue;
    seen.add(key);
    out.push(indicator(tokens));
  }
  return out;
}

/**
 * Probe inputs: k random assignments of each side's inputs. On a token input a position's vector
 * is the indicator of a token (its domain is discrete: the rank measured is that of the function
 * on the token sequences, the one the surrogate analyses); a side with few assignments is
 * enumerated, so the probe matrix may be rectangular and smaller than k.
 */
export function probeInputs(ev: Evaluator, side: Uint8Array, k: number, rng: Rng): { xa: Float64Array[]; xb: Float64Array[] } {
  let a = 0;
  for (let p = 0; p < ev.positions; p++) if ((side[p] ?? 0) === 1) a++;
  const b = ev.positions - a;
  const v = ev.plan.vocabulary;
  if (v !== undefined) return { xa: tokenAssignments(rng, a, v, k), xb: tokenAssignments(rng, b, v, k) };
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
  return rankInPlace(ev.probeMatrix(side, xa, xb), xa.length, xb.length);
}

/**
 * The probe rank with K grown (from `start`, roughly doubling) until the reading falls below K or
 * K reaches `maxK`. For continuous inputs a K×K probe of generic draws has rank min(r, K) (the K
 * rows of the r functions on either side are independent for generic points), so a reading below
 * K is the rank r and the probe costs about (2r)² evaluations instead of (maxK)². On a token input
 * the same stop applies to sides that are sampled (2K rows, see `tokenAssignments`); enumerated
 * sides are exact. Every reading is a certified lower bound whatever K.
 */
export function probeRankAdaptive(ev: Evaluator, side: Uint8Array, maxK: number, rng: Rng, start = 16): number {
  let k = Math.min(start, maxK);
  for (;;) {
    const r = probeRankWith(ev, side, k, rng);
    if (k >= maxK) return r;
    const exact = tokenProbeExact(ev, side, k);
    if (exact === true || (exact === undefined && r < k) || (exact === false && 2 * r < k)) return r;
    k = Math.min(maxK, 2 * k + 8);
  }
}

/**
 * For a token input: whether a probe at K enumerates both sides (its matrix is then the whole
 * function on the token sequences, and its rank exact); undefined for a continuous input.
 */
export function tokenProbeExact(ev: Evaluator, side: Uint8Array, k: number): boolean | undefined {
  const v = ev.plan.vocabulary;
  if (v === undefined) return undefined;
  let a = 0;
  for (let p = 0; p < ev.positions; p++) if ((side[p] ?? 0) === 1) a++;
  return v ** a <= ENUMERATE_TOKENS * k && v ** (ev.positions - a) <= ENUMERATE_TOKENS * k;
}

/** Probe rank of a model under a surrogate with fresh weights drawn from `rng`. */
export function probeRank(model: LayeredModel, surrogate: SurrogateKind, side: Uint8Array, k: number, rng: Rng): number {
  const ev = compile(model, surrogate, new WeightStore(rng));
  return probeRankWith(ev, side, k, rng);
}
