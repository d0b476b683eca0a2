/**
 * The surrogate function of a layered model as a straight-line program over residues mod p,
 * written from DEVELOPERS.md ("The surrogate functions"), layer kind by layer kind, with the
 * weights the model really has: one matrix per layer (per tap, per offset) when weights are
 * shared and one per position when not, recurrent weights shared over time, grouped maps block
 * diagonal, the fixed weights of linear upsampling as exact fractions. It does not read the
 * tensor network (whose linear nodes do not say which of them share a matrix), so every value it
 * computes is a value of the model's own function family.
 *
 * A program is a list of steps in topological order, each writing one vector into a shared
 * buffer. Knowing which inputs each step depends on lets the probe compute the steps that read
 * only one side once per probe row or column, and only the mixed steps once per matrix entry.
 * Weight names (see draw.ts) are `L{i}` / `L{i}@{p}` (a layer's map, shared / at position p),
 * `L{i}t{t}` / `L{i}@{o}t{t}` (tap t of a window over the kernel, row-major), `L{i}o{u}` (a tree
 * transposed conv's map for output offset u), `L{i}:H{l}`, `L{i}:I{l}`, `L{i}:h0_{l}` (recurrent
 * level l ≥ 1; the backward chain `L{i}:UH{l}`, `L{i}:UI{l}`, `L{i}:b0_{l}`), `L{i}@{p}` (a
 * position vector), `L{i}` (a class token), `L{i}:Q{h}`, `L{i}:K{h}`, `L{i}:V{h}`, `L{i}:O{h}`
 * (attention head h) and `head`; a grouped r×D map stores its r×(D/g) block entries row by row.
 */
import {
  INPUT,
  positionCount,
  type AttentionLayer,
  type ConvLayer,
  type ConvTransposeLayer,
  type LayeredModel,
  type PoolLayer,
  type RecurrentLayer,
  type UpsampleLayer,
} from '../../config/model.js';
import type { ModelShapes } from '../../config/model-shapes.js';
import {
  linearSources,
  transposeSources,
  treeConvPositions,
  treeTransposeSource,
  windowAxis,
  windowTapIndices,
  windowTaps,
  type AxisPlan,
} from '../../config/grid-geometry.js';
import type { PointwiseReading } from '../../network/square-rule.js';
import type { Surrogate } from '../types.js';
import { drawValues } from './draw.js';
import { PROBE_PRIME, inverseMod, mulAddMod as importedMulAdd } from './modular.js';

// A local binding: a call through an imported binding can be a property load that V8 does not
// inline when a module transform rewrites imports (as the test runner does).
const mulAddMod = importedMulAdd;

export interface Step {
  readonly offset: number;
  readonly length: number;
  /** Steps this one reads. */
  readonly reads: readonly number[];
  /** Multiply-adds per run, for the time budget. */
  readonly cost: number;
  /** Writes buf[offset .. offset + length); null for an input position (written by the probe). */
  readonly run: ((buf: Float64Array) => void) | null;
}

export interface SurrogateProgram {
  /** Steps 0 .. positions−1 are the input positions, in position order. */
  readonly steps: readonly Step[];
  readonly bufferSize: number;
  readonly positions: number;
  /** M: the length of each input vector. */
  readonly m: number;
  /**
   * A token input: its positions take only the M = V indicator vectors (a probe input is the
   * indicator of a drawn token); false for a continuous input (a probe input is M drawn numbers).
   */
  readonly tokens: boolean;
  /** The step holding h (length 1). */
  readonly output: number;
}

/** A grid while the program is built: the step holding each position's vector (steps may repeat). */
interface Grid {
  readonly shape: readonly number[];
  readonly width: number;
  readonly steps: readonly number[];
}

/**
 * An r×D map in g groups: output row k reads the D/g input channels of its block b = ⌊k/(r/g)⌋.
 * `w` holds the r×(D/g) block entries row by row.
 */
interface GroupedMap {
  readonly w: Float64Array;
  readonly r: number;
  readonly d: number;
  readonly g: number;
}

/** out[oo + k] (+)= (W·buf[vo ..])[k]. */
function applyMap(map: GroupedMap, buf: Float64Array, vo: number, oo: number, accumulate: boolean): void {
  const { w, r, d, g } = map;
  const dg = d / g;
  const rg = r / g;
  for (let k = 0; k < r; k++) {
    let acc = accumulate ? buf[oo + k]! : 0;
    const from = vo + Math.floor(k / rg) * dg;
    const row = k * dg;
    for (let c = 0; c < dg; c++) acc = mulAddMod(w[row + c]!, buf[from + c]!, acc);
    buf[oo + k] = acc;
  }
}

class ProgramBuilder {
  readonly steps: Step[] = [];
  size = 0;
  private readonly weights = new Map<string, Float64Array>();
  private readonly zeros = new Map<number, number>();

  constructor(private readonly seed: number) {}

  add(length: number, reads: readonly number[], cost: number, make: ((offset: number) => (buf: Float64Array) => void) | null): number {
    const offset = this.size;
    this.steps.push({ offset, length, reads, cost, run: make ? make(offset) : null });
    this.size += length;
    return this.steps.length - 1;
  }

  off(s: number): number {
    return this.steps[s]!.offset;
  }

  len(s: number): number {
    return this.steps[s]!.length;
  }

  weight(name: string, length: number): Float64Array {
    let w = this.weights.get(name);
    if (!w) {
      w = drawValues(this.seed, name, length);
      this.weights.set(name, w);
    }
    return w;
  }

  map(name: string, r: number, d: number, g: number): GroupedMap {
    return { w: this.weight(name, r * (d / g)), r, d, g };
  }

  /** A vector that is zero for every weight (a window of padding only). */
  zeroVector(width: number): number {
    let z = this.zeros.get(width);
    if (z === undefined) {
      z = this.add(width, [], 0, (oo) => (buf) => buf.fill(0, oo, oo + width));
      this.zeros.set(width, z);
    }
    return z;
  }

  /** Σ_i W_i v_i over (map, step) terms; the zero vector without terms. */
  mapSum(terms: readonly { map: GroupedMap; src: number }[], r: number): number {
    if (terms.length === 0) return this.zeroVector(r);
    const parts = terms.map((t) => ({ map: t.map, vo: this.off(t.src) }));
    const cost = terms.reduce((a, t) => a + t.map.r * (t.map.d / t.map.g), 0);
    return this.add(r, [...new Set(terms.map((t) => t.src))], cost, (oo) => (buf) => {
      parts.forEach((p, i) => applyMap(p.map, buf, p.vo, oo, i > 0));
    });
  }

  /** The elementwise product of the vectors (one vector: itself). */
  product(srcs: readonly number[], width: number): number {
    if (srcs.length === 1) return srcs[0]!;
    const offs = srcs.map((s) => this.off(s));
    return this.add(width, [...new Set(srcs)], width * (srcs.length - 1), (oo) => (buf) => {
      for (let k = 0; k < width; k++) {
        let acc = buf[offs[0]! + k]!;
        for (let i = 1; i < offs.length; i++) acc = mulAddMod(acc, buf[offs[i]! + k]!, 0);
        buf[oo + k] = acc;
      }
    });
  }

  /** Σ_i c_i v_i with fixed coefficients (residues). */
  combination(srcs: readonly number[], coefficients: readonly number[], width: number): number {
    if (srcs.length === 1 && coefficients[0] === 1) return srcs[0]!;
    const offs = srcs.map((s) => this.off(s));
    return this.add(width, [...new Set(srcs)], width * srcs.length, (oo) => (buf) => {
      for (let k = 0; k < width; k++) {
        let acc = 0;
        for (let i = 0; i < offs.length; i++) acc = mulAddMod(coefficients[i]!, buf[offs[i]! + k]!, acc);
        buf[oo + k] = acc;
      }
    });
  }

  concat(srcs: readonly number[]): number {
    if (srcs.length === 1) return srcs[0]!;
    const parts = srcs.map((s) => ({ off: this.off(s), len: this.len(s) }));
    const total = parts.reduce((a, p) => a + p.len, 0);
    return this.add(total, [...new Set(srcs)], total, (oo) => (buf) => {
      let o = oo;
      for (const p of parts) {
        buf.copyWithin(o, p.off, p.off + p.len);
        o += p.len;
      }
    });
  }
}

/** Row-major flat index of a multi-index. */
function flat(at: readonly number[], shape: readonly number[]): number {
  return shape.length === 1 ? at[0]! : at[0]! * shape[1]! + at[1]!;
}

/** Every multi-index of a shape, row-major. */
function eachIndex(shape: readonly number[]): number[][] {
  if (shape.length === 1) return Array.from({ length: shape[0]! }, (_, j) => [j]);
  const out: number[][] = [];
  for (let i = 0; i < shape[0]!; i++) for (let j = 0; j < shape[1]!; j++) out.push([i, j]);
  return out;
}

/** The product set of per-axis lists, row-major (first axis slowest). */
function product2<T>(lists: readonly (readonly T[])[]): T[][] {
  if (lists.length === 1) return lists[0]!.map((x) => [x]);
  const out: T[][] = [];
  for (const a of lists[0]!) for (const b of lists[1]!) out.push([a, b]);
  return out;
}

/**
 * The program of a model, or undefined when it has a layer kind this evaluator does not know (a
 * kind added later gets no probe until its function is written here).
 */
export function surrogateProgram(model: LayeredModel, shapes: ModelShapes, reading: PointwiseReading, surrogate: Surrogate, seed: number): SurrogateProgram | undefined {
  const b = new ProgramBuilder(seed);
  const m = shapes.representation;
  const n = positionCount(model.input.shape);
  const input: Grid = { shape: model.input.shape, width: m, steps: Array.from({ length: n }, () => b.add(m, [], 0, null)) };
  const grids: Grid[] = [];
  const gridOf = (i: number): Grid => (i === INPUT ? input : grids[i]!);
  for (const layer of model.layers) {
    const src = gridOf(layer.inputs[0]!);
    const out = shapes.layers[layer.index]!;
    const groups = shapes.groups[layer.index]!;
    const i = layer.index;
    let grid: Grid | undefined;
    switch (layer.kind) {
      case 'pointwise':
        grid = reading.squared.has(i) ? { ...src, steps: src.steps.map((s) => b.product([s, s], src.width)) } : src;
        break;
      case 'flatten':
        grid = { shape: out.shape, width: src.width * src.steps.length, steps: [b.concat(src.steps)] };
        break;
      case 'dense': {
        const u = layer.units;
        if (shapes.denseReading[i] === 'per-position') {
          const steps = src.steps.map((s, p) => b.mapSum([{ map: b.map(model.weightSharing ? `L${i}` : `L${i}@${p}`, u, src.width, 1), src: s }], u));
          grid = { shape: out.shape, width: u, steps };
        } else {
          const whole = b.concat(src.steps);
          grid = { shape: out.shape, width: u, steps: [b.mapSum([{ map: b.map(`L${i}`, u, b.len(whole), 1), src: whole }], u)] };
        }
        break;
      }
      case 'embedding': {
        // v ← E v at every position, E ∈ R^{d×D} shared (on a token input, column u is token u's row).
        const steps = src.steps.map((s) => b.mapSum([{ map: b.map(`L${i}`, layer.dim, src.width, 1), src: s }], layer.dim));
        grid = { shape: out.shape, width: layer.dim, steps };
        break;
      }
      case 'merge': {
        const ins = layer.inputs.map(gridOf);
        const steps = src.steps.map((_, p) => {
          const at = ins.map((g) => g.steps[p]!);
          return layer.mode === 'sum' ? b.combination(at, at.map(() => 1), out.width) : b.concat(at);
        });
        grid = { shape: out.shape, width: out.width, steps };
        break;
      }
      case 'recurrent':
        grid = recurrent(b, src, layer);
        break;
      case 'position': {
        // A fixed encoding is read as learned vectors, which can only raise an upper bound: no
        // lower bound is claimed through it.
        if (layer.mode !== 'learned') return undefined;
        const w = src.width;
        const steps = src.steps.map((s, p) => {
          const pv = b.weight(`L${i}@${p}`, w);
          const so = b.off(s);
          return b.add(w, [s], w, (oo) => (buf) => {
            for (let k = 0; k < w; k++) buf[oo + k] = (buf[so + k]! + pv[k]!) % PROBE_PRIME;
          });
        });
        grid = { shape: out.shape, width: w, steps };
        break;
      }
      case 'class-token': {
        const cv = b.weight(`L${i}`, src.width);
        const token = b.add(src.width, [], 0, (oo) => (buf) => buf.set(cv, oo));
        grid = { shape: out.shape, width: src.width, steps: [token, ...src.steps] };
        break;
      }
      case 'attention':
        grid = attention(b, src, layer, shapes.headDims[i]!);
        break;
      case 'pool':
        grid = pool(b, src, layer, out.shape);
        break;
      case 'upsample':
        // Interpolation weights are fractions with denominator 2f: p must not divide it.
        if (layer.mode === 'linear' && layer.factor.some((f) => (2 * f) % PROBE_PRIME === 0)) return undefined;
        grid = upsample(b, src, layer, out.shape);
        break;
      case 'conv':
        grid = surrogate === 'tree' ? treeConv(b, src, layer, out.shape, out.width, groups, model.weightSharing) : overlapConv(b, src, layer, out.shape, out.width, groups, model.weightSharing);
        break;
      case 'conv-transpose':
        grid = convTranspose(b, src, layer, out.shape, groups, model.weightSharing, surrogate);
        break;
      default:
        return undefined;
    }
    if (!grid || grid.steps.length !== positionCount(out.shape) || grid.width !== out.width) return undefined;
    grids.push(grid);
  }
  const last = grids[grids.length - 1]!;
  const top = last.steps[flat(shapes.output.position, last.shape)]!;
  const head = b.weight('head', last.width);
  const to = b.off(top);
  const width = last.width;
  const output = b.add(1, [top], width, (oo) => (buf) => {
    let acc = 0;
    for (let k = 0; k < width; k++) acc = mulAddMod(head[k]!, buf[to + k]!, acc);
    buf[oo] = acc;
  });
  return { steps: b.steps, bufferSize: b.size, positions: n, m, tokens: model.input.vocabulary !== undefined, output };
}

/**
 * One chain of a recurrent level over the steps in `order` (forward 0..T−1, backward T−1..0):
 * s_t = (W_H s_prev) ⊙ (W_I x_t) from a learned start vector; the state of every step, by step.
 */
function chain(b: ProgramBuilder, names: { h: string; i: string; h0: string }, hidden: number, xs: readonly number[], width: number, order: readonly number[]): number[] {
  const wh = b.map(names.h, hidden, hidden, 1);
  const wi = b.map(names.i, hidden, width, 1);
  const h0 = b.weight(names.h0, hidden);
  let state = b.add(hidden, [], 0, (oo) => (buf) => buf.set(h0, oo));
  const states = new Array<number>(xs.length);
  for (const t of order) {
    state = b.product([b.mapSum([{ map: wh, src: state }], hidden), b.mapSum([{ map: wi, src: xs[t]! }], hidden)], hidden);
    states[t] = state;
  }
  return states;
}

/**
 * h^l_t = (W_H^l h^l_{t−1}) ⊙ (W_I^l z^{l−1}_t), h^l_0 learned, z^0_t = v_t. Bidirectional: a
 * backward chain b^l_t = (U_H^l b^l_{t+1}) ⊙ (U_I^l z^{l−1}_t) from a learned b^l_{T+1}, and
 * z^l_t = [f^l_t ; b^l_t] (or f^l_t + b^l_t). The grid keeps z^L_t at every step (`sequence`) or
 * becomes h^L_T (bidirectional: [f^L_T ; b^L_1], or their sum).
 */
function recurrent(b: ProgramBuilder, src: Grid, layer: RecurrentLayer): Grid {
  const { index: i, hidden, depth } = layer;
  const T = src.steps.length;
  const forward = Array.from({ length: T }, (_, t) => t);
  const backward = forward.slice().reverse();
  const join = (f: number, g: number): number => (layer.merge === 'concat' ? b.concat([f, g]) : b.combination([f, g], [1, 1], hidden));
  let below = src.steps;
  let width = src.width;
  let last: number[] = [];
  for (let l = 1; l <= depth; l++) {
    const f = chain(b, { h: `L${i}:H${l}`, i: `L${i}:I${l}`, h0: `L${i}:h0_${l}` }, hidden, below, width, forward);
    if (!layer.bidirectional) {
      below = f;
      width = hidden;
      last = [f[T - 1]!];
      continue;
    }
    const g = chain(b, { h: `L${i}:UH${l}`, i: `L${i}:UI${l}`, h0: `L${i}:b0_${l}` }, hidden, below, width, backward);
    below = f.map((ft, t) => join(ft, g[t]!));
    width = layer.merge === 'concat' ? 2 * hidden : hidden;
    last = [f[T - 1]!, g[0]!];
  }
  if (layer.sequence) return { shape: src.shape, width, steps: below };
  return { shape: [1], width, steps: [last.length === 1 ? last[0]! : join(last[0]!, last[1]!)] };
}

/**
 * Linearised self-attention, y_i = Σ_h Σ_{j∈N(i)} ⟨Q_h v_i, K_h v_j⟩ · O_h V_h v_j, evaluated as
 * y_i = Σ_h O_h S_h(N(i)) Q_h v_i with S_h(J) = Σ_{j∈J} (V_h v_j)(K_h v_j)ᵀ (the same polynomial,
 * reordered). Every field N(i) is an interval of positions (row-major); its S is the sum of the
 * canonical blocks of a segment tree over the positions, each block built once from its halves,
 * so that a block that reads one side only is computed once per probe row or column.
 */
function attention(b: ProgramBuilder, src: Grid, layer: AttentionLayer, a: number): Grid | undefined {
  const n = src.steps.length;
  const D = src.width;
  const H = layer.heads;
  if (a <= 0 || (layer.window !== undefined && src.shape.length !== 1)) return undefined;
  const i = layer.index;
  const heads = Array.from({ length: H }, (_, h) => ({
    q: b.weight(`L${i}:Q${h}`, a * D),
    k: b.weight(`L${i}:K${h}`, a * D),
    v: b.weight(`L${i}:V${h}`, a * D),
    o: b.weight(`L${i}:O${h}`, D * a),
  }));
  const block = a * a;
  const kvWidth = H * block;
  /** Row r of an a×D matrix applied to the vector at vo. */
  const rowDot = (w: Float64Array, r: number, buf: Float64Array, vo: number): number => {
    let acc = 0;
    for (let c = 0; c < D; c++) acc = mulAddMod(w[r * D + c]!, buf[vo + c]!, acc);
    return acc;
  };
  // Per position: every head's query (H·a), and its (V v)(K v)ᵀ blocks (H·a·a, row-major).
  const queries = src.steps.map((s) => {
    const vo = b.off(s);
    return b.add(H * a, [s], H * a * D, (oo) => (buf) => {
      heads.forEach((hd, h) => {
        for (let r = 0; r < a; r++) buf[oo + h * a + r] = rowDot(hd.q, r, buf, vo);
      });
    });
  });
  const blocks = src.steps.map((s) => {
    const vo = b.off(s);
    const kk = new Float64Array(a);
    const vv = new Float64Array(a);
    return b.add(kvWidth, [s], H * (2 * a * D + block), (oo) => (buf) => {
      heads.forEach((hd, h) => {
        for (let r = 0; r < a; r++) {
          kk[r] = rowDot(hd.k, r, buf, vo);
          vv[r] = rowDot(hd.v, r, buf, vo);
        }
        for (let r = 0; r < a; r++) for (let c = 0; c < a; c++) buf[oo + h * block + r * a + c] = mulAddMod(vv[r]!, kk[c]!, 0);
      });
    });
  });
  // Segment tree over [0, n): node (lo, hi) is the sum of its halves' blocks.
  const nodes = new Map<string, number>();
  const node = (lo: number, hi: number): number => {
    if (hi - lo === 1) return blocks[lo]!;
    const key = `${lo}:${hi}`;
    let s = nodes.get(key);
    if (s === undefined) {
      const mid = (lo + hi) >> 1;
      s = b.combination([node(lo, mid), node(mid, hi)], [1, 1], kvWidth);
      nodes.set(key, s);
    }
    return s;
  };
  /** The canonical blocks covering [from, to) within node (lo, hi). */
  const cover = (from: number, to: number, lo: number, hi: number, into: number[]): void => {
    if (to <= lo || hi <= from) return;
    if (from <= lo && hi <= to) {
      into.push(node(lo, hi));
      return;
    }
    const mid = (lo + hi) >> 1;
    cover(from, to, lo, mid, into);
    cover(from, to, mid, hi, into);
  };
  const fields = new Map<string, number>();
  const steps = src.steps.map((_, t) => {
    let lo = 0;
    let hi = n - 1;
    if (layer.causal) hi = t;
    if (layer.window !== undefined) {
      lo = Math.max(lo, t - layer.window);
      hi = Math.min(hi, t + layer.window);
    }
    const key = `${lo}:${hi}`;
    let field = fields.get(key);
    if (field === undefined) {
      const parts: number[] = [];
      cover(lo, hi + 1, 0, n, parts);
      field = b.combination(parts, parts.map(() => 1), kvWidth);
      fields.set(key, field);
    }
    const so = b.off(field);
    const qo = b.off(queries[t]!);
    const sq = new Float64Array(a);
    return b.add(D, [field, queries[t]!], H * (block + D * a), (oo) => (buf) => {
      buf.fill(0, oo, oo + D);
      heads.forEach((hd, h) => {
        for (let r = 0; r < a; r++) {
          let acc = 0;
          for (let c = 0; c < a; c++) acc = mulAddMod(buf[so + h * block + r * a + c]!, buf[qo + h * a + c]!, acc);
          sq[r] = acc;
        }
        for (let k = 0; k < D; k++) {
          let acc = buf[oo + k]!;
          for (let r = 0; r < a; r++) acc = mulAddMod(hd.o[k * a + r]!, sq[r]!, acc);
          buf[oo + k] = acc;
        }
      });
    });
  });
  return { shape: src.shape, width: D, steps };
}

function axisPlans(src: Grid, k: readonly number[], s: readonly number[], d: readonly number[], layer: ConvLayer | PoolLayer): AxisPlan[] | undefined {
  const plans = src.shape.map((n, a) => windowAxis(n, k[a]!, s[a]!, d[a]!, layer.padding, a));
  return plans.every((p) => typeof p !== 'string') ? (plans as AxisPlan[]) : undefined;
}

function pool(b: ProgramBuilder, src: Grid, layer: PoolLayer, shape: readonly number[]): Grid | undefined {
  if (layer.global) return { shape, width: src.width, steps: [b.product(src.steps, src.width)] };
  const plans = axisPlans(src, layer.window, layer.stride, layer.window.map(() => 1), layer);
  if (!plans) return undefined;
  const steps: number[] = [];
  for (const j of eachIndex(shape)) {
    const lists = j.map((jj, a) => windowTaps(jj, src.shape[a]!, layer.window[a]!, layer.stride[a]!, 1, plans[a]!.left));
    const at = product2(lists).map((p) => src.steps[flat(p, src.shape)]!);
    // A window of padding only is refused by the builder before any bound is computed.
    if (at.length === 0) return undefined;
    steps.push(b.product(at, src.width));
  }
  return { shape, width: src.width, steps };
}

function upsample(b: ProgramBuilder, src: Grid, layer: UpsampleLayer, shape: readonly number[]): Grid {
  const steps = eachIndex(shape).map((j) => {
    if (layer.mode === 'nearest') return src.steps[flat(j.map((jj, a) => Math.floor(jj / layer.factor[a]!)), src.shape)]!;
    // Per axis (1 − λ)·v_{i0} + λ·v_{i1}; across axes the weights multiply. Equal sources add up.
    const perAxis = j.map((jj, a) => {
      const s = linearSources(jj, src.shape[a]!, layer.factor[a]!);
      const lambda = mulAddMod(s.num, inverseMod(s.den), 0);
      return [
        { i: s.i0, w: (1 - lambda + PROBE_PRIME) % PROBE_PRIME },
        { i: s.i1, w: lambda },
      ];
    });
    const bySource = new Map<number, number>();
    for (const combo of product2(perAxis)) {
      const step = src.steps[flat(combo.map((t) => t.i), src.shape)]!;
      const w = combo.reduce((acc, t) => mulAddMod(acc, t.w, 0), 1);
      bySource.set(step, ((bySource.get(step) ?? 0) + w) % PROBE_PRIME);
    }
    const terms = [...bySource].filter(([, w]) => w !== 0);
    return b.combination(terms.map(([s]) => s), terms.map(([, w]) => w), src.width);
  });
  return { shape, width: src.width, steps };
}

/** Tree conv: output j is the product over P(j) of W v_p, each input position mapped once. */
function treeConv(b: ProgramBuilder, src: Grid, layer: ConvLayer, shape: readonly number[], r: number, g: number, shared: boolean): Grid | undefined {
  const plans = axisPlans(src, layer.kernel, layer.stride, layer.dilation, layer);
  if (!plans) return undefined;
  const causal = layer.padding.mode === 'causal';
  const mapped = new Map<number, number>();
  const mapAt = (p: number): number => {
    let s = mapped.get(p);
    if (s === undefined) {
      s = b.mapSum([{ map: b.map(shared ? `L${layer.index}` : `L${layer.index}@${p}`, r, src.width, g), src: src.steps[p]! }], r);
      mapped.set(p, s);
    }
    return s;
  };
  const steps = eachIndex(shape).map((j) => {
    const lists = j.map((jj, a) => treeConvPositions(jj, src.shape[a]!, layer.kernel[a]!, layer.stride[a]!, layer.dilation[a]!, plans[a]!, causal));
    const at = product2(lists).map((p) => flat(p, src.shape));
    return at.length === 0 ? b.zeroVector(r) : b.product(at.map(mapAt), r);
  });
  return { shape, width: r, steps };
}

/** Overlap conv: output j is Σ_t W_t v_{tap_t(j)} over the taps inside the grid. */
function overlapConv(b: ProgramBuilder, src: Grid, layer: ConvLayer, shape: readonly number[], r: number, g: number, shared: boolean): Grid | undefined {
  const plans = axisPlans(src, layer.kernel, layer.stride, layer.dilation, layer);
  if (!plans) return undefined;
  const steps = eachIndex(shape).map((j, o) => {
    const perAxis = j.map((jj, a) => {
      const args = [jj, src.shape[a]!, layer.kernel[a]!, layer.stride[a]!, layer.dilation[a]!, plans[a]!.left] as const;
      const at = windowTaps(...args);
      const taps = windowTapIndices(...args);
      return at.map((p, x) => ({ p, t: taps[x]! }));
    });
    const terms = product2(perAxis).map((pair) => {
      const t = flat(pair.map((x) => x.t), layer.kernel);
      const name = shared ? `L${layer.index}t${t}` : `L${layer.index}@${o}t${t}`;
      return { map: b.map(name, r, src.width, g), src: src.steps[flat(pair.map((x) => x.p), src.shape)]! };
    });
    return b.mapSum(terms, r);
  });
  return { shape, width: r, steps };
}

function convTranspose(b: ProgramBuilder, src: Grid, layer: ConvTransposeLayer, shape: readonly number[], g: number, shared: boolean, surrogate: Surrogate): Grid {
  const r = layer.channels;
  const steps = eachIndex(shape).map((j, o) => {
    if (surrogate === 'tree') {
      const per = j.map((jj, a) => treeTransposeSource(jj, src.shape[a]!, layer.stride[a]!));
      const u = flat(per.map((x) => x[1]), layer.stride);
      const name = shared ? `L${layer.index}o${u}` : `L${layer.index}@${o}`;
      return b.mapSum([{ map: b.map(name, r, src.width, g), src: src.steps[flat(per.map((x) => x[0]), src.shape)]! }], r);
    }
    const perAxis = j.map((jj, a) => transposeSources(jj, src.shape[a]!, layer.kernel[a]!, layer.stride[a]!, layer.dilation[a]!, layer.padding[a]!));
    const terms = product2(perAxis).map((pairs) => {
      const t = flat(pairs.map((x) => x[1]), layer.kernel);
      const name = shared ? `L${layer.index}t${t}` : `L${layer.index}@${o}t${t}`;
      return { map: b.map(name, r, src.width, g), src: src.steps[flat(pairs.map((x) => x[0]), src.shape)]! };
    });
    return b.mapSum(terms, r);
  });
  return { shape, width: r, steps };
}
