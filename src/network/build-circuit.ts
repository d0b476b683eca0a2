/**
 * Model → circuit of the chosen surrogate (DEVELOPERS.md states the exact functions). Shapes come
 * from `inferShapes`, which has already checked that every window fits and every merge agrees, so
 * this module only follows the grids layer by layer and emits nodes: per-position maps, product
 * windows (copy tensors), sums (overlapping windows, merges, flatten + dense) and reused nodes
 * (upsampling, overlapping pools, skips). It also writes the notes that tell a reader how the
 * config was read (pointwise layers, the analysed output, M).
 */
import type { Diagnostic, Span } from '../diagnostic.js';
import {
  INPUT,
  firstMaps,
  layerLabel,
  layerWidth,
  positionCount,
  type ConvLayer,
  type AttentionLayer,
  type ConvTransposeLayer,
  type RecurrentLayer,
  type Layer,
  type LayeredModel,
  type PoolLayer,
  type UpsampleLayer,
} from '../config/model.js';
import { inferShapes, type ModelShapes } from '../config/model-shapes.js';
import {
  linearSources,
  transposeSources,
  treeConvPositions,
  treeTransposeSource,
  windowAxis,
  windowTaps,
  type AxisPlan,
} from '../config/grid-geometry.js';
import type { Surrogate } from '../cut/types.js';
import { CircuitBuilder, NetworkTooLarge, OP_CONST, OP_INPUT, OP_LINEAR, OP_PRODUCT, OP_SUM, type Circuit } from './circuit.js';
import { readPointwise, type PointwiseReading } from './square-rule.js';

/** Largest network (in nodes) that rankfloor builds; child links may be four times as many. */
export const NODE_LIMIT = 4_000_000;

export interface BuildOptions {
  readonly surrogate: Surrogate;
  readonly nodeLimit?: number;
  /**
   * For lower bounds: build the special case in which every grouped map is the identity (its
   * blocks identity matrices), which needs equal input and output widths; a grouped map between
   * different widths makes the build fail with `network/grouped-not-identity`.
   */
  readonly groupedAsIdentity?: boolean;
}

export type BuildResult =
  | { ok: true; circuit: Circuit; notes: string[]; shapes: ModelShapes; pointwise: PointwiseReading }
  | { ok: false; diagnostics: Diagnostic[] };

/**
 * The output of a layer: one node per position. A flattened grid stays a list of its positions'
 * nodes (`flat`), so that the dense layer after it can read them as one sum instead of through a
 * concatenation of every position's width.
 */
interface Grid {
  readonly shape: readonly number[];
  readonly nodes: readonly number[];
  /** Dimension of each position's vector (of each listed node when flat). */
  readonly dim: number;
  readonly flat: boolean;
}

interface Problem {
  span: Span;
  code: string;
  message: string;
}

export function buildCircuit(model: LayeredModel, options: BuildOptions): BuildResult {
  const limit = options.nodeLimit ?? NODE_LIMIT;
  const shaped = inferShapes(model);
  if (!shaped.ok) return shaped;
  const shapes = shaped.shapes;
  const fail = (span: Span, code: string, message: string): BuildResult => ({
    ok: false,
    diagnostics: [{ code, message, file: model.file, span, severity: 'error' }],
  });
  const tooLarge = (): BuildResult =>
    fail(
      model.input.fieldSpans['shape'] ?? model.input.span,
      'network/too-large',
      `this model's tensor network would exceed ${limit} nodes or ${limit * 4} links; analyse a smaller input shape`,
    );
  // Arithmetic first: every layer makes at least one node per output position.
  let estimate = positionCount(model.input.shape);
  for (const s of shapes.layers) estimate += positionCount(s.shape);
  if (estimate > limit) return tooLarge();

  const pointwise = readPointwise(model, shapes);
  const notes = new Notes(model, shapes, pointwise, options.surrogate);
  // Room for about one node per position of every layer that makes nodes, so the arrays seldom grow.
  let capacity = positionCount(model.input.shape);
  for (const l of model.layers) if (l.kind !== 'pointwise' && l.kind !== 'flatten') capacity += positionCount(shapes.layers[l.index]!.shape);
  const b = new CircuitBuilder(positionCount(model.input.shape), limit, Math.min(capacity, limit));
  try {
    const inputTag = b.addTag({ label: 'input', line: model.input.span.line, span: model.input.span, layerIndex: -1 });
    const m = shapes.representation;
    const input: Grid = { shape: model.input.shape, nodes: Array.from({ length: positionCount(model.input.shape) }, (_, p) => b.add(OP_INPUT, m, inputTag, [], p)), dim: m, flat: false };
    const grids: Grid[] = [];
    const gridOf = (i: number): Grid => (i === INPUT ? input : grids[i]!);
    const shared = new SharedMaps(b);
    for (const layer of model.layers) {
      const tag = b.addTag({ label: layerLabel(layer), line: layer.span.line, span: layer.span, layerIndex: layer.index });
      const built = buildLayer(b, layer, layer.inputs.map(gridOf), tag, options, shapes, pointwise, model.weightSharing ? shared : undefined);
      if ('code' in built) return fail(built.span, built.code, built.message);
      grids.push(built);
    }
    const last = grids[grids.length - 1]!;
    const lastLayer = model.layers[model.layers.length - 1]!;
    let top: number;
    if (last.flat) {
      const headTag = b.addTag({ label: layerLabel(lastLayer), line: lastLayer.span.line, span: lastLayer.span, layerIndex: lastLayer.index });
      top = sumOf(b, 1, headTag, last.nodes);
    } else {
      top = last.nodes[flatIndex(last.shape, shapes.output.position)]!;
    }
    if (top === ZERO) {
      return fail(
        lastLayer.span,
        'network/zero-output',
        `the analysed output is zero for every choice of weights: it reads only padding; reduce the padding or analyse another output position`,
      );
    }
    return { ok: true, circuit: b.finish(top), notes: notes.list(), shapes, pointwise };
  } catch (e) {
    if (e instanceof NetworkTooLarge) return tooLarge();
    throw e;
  }
}

function flatIndex(shape: readonly number[], at: readonly number[]): number {
  return shape.length === 1 ? at[0]! : at[0]! * shape[1]! + at[1]!;
}

/**
 * Stands in a grid for a vector that is zero for every choice of weights (a conv output that
 * reads only padding); it is not a node. The three constructors below keep zeros out of the
 * circuit: a map or a product of zero is zero, and a sum leaves zero terms out.
 */
const ZERO = -2;

function linearOf(b: CircuitBuilder, dim: number, tag: number, v: number): number {
  return v === ZERO ? ZERO : b.add(OP_LINEAR, dim, tag, [v]);
}

/**
 * The per-position maps of one layer whose matrix is shared across positions: a node that the
 * layer meets at several positions (after nearest upsampling) is mapped once, so that its copies
 * are one node, one function (identical weights applied to the identical vector), and a product
 * of them is a power of one factor. Only for maps that are one matrix per layer: not the offsets
 * of a transposed conv, nor the taps of a window, nor two maps of one node in attention.
 */
class SharedMaps {
  private stamp = new Int32Array(0);
  private value = new Int32Array(0);
  private layer = 0;

  constructor(private readonly b: CircuitBuilder) {}

  /** The mapping for a new layer's matrix. */
  of(dim: number, tag: number): (v: number) => number {
    const layer = ++this.layer;
    return (v) => {
      if (v === ZERO) return ZERO;
      if (v >= this.stamp.length) {
        const size = Math.max(1024, 2 * this.stamp.length, v + 1);
        const stamp = new Int32Array(size);
        stamp.set(this.stamp);
        const value = new Int32Array(size);
        value.set(this.value);
        this.stamp = stamp;
        this.value = value;
      }
      if (this.stamp[v] !== layer) {
        this.stamp[v] = layer;
        this.value[v] = this.b.add(OP_LINEAR, dim, tag, [v]);
      }
      return this.value[v]!;
    };
  }
}

/** Per-position maps of one layer: shared (one node per distinct child) or one matrix per position. */
function perPositionMaps(b: CircuitBuilder, dim: number, tag: number, shared: SharedMaps | undefined): (v: number) => number {
  return shared ? shared.of(dim, tag) : (v) => linearOf(b, dim, tag, v);
}

function productOf(b: CircuitBuilder, dim: number, tag: number, children: readonly number[]): number {
  if (children.includes(ZERO)) return ZERO;
  return children.length === 1 ? children[0]! : b.add(OP_PRODUCT, dim, tag, children);
}

/** A node of dimension `dim` reading `children` through maps: a linear node for one child. */
function sumOf(b: CircuitBuilder, dim: number, tag: number, children: readonly number[]): number {
  const live = children.includes(ZERO) ? children.filter((v) => v !== ZERO) : children;
  if (live.length === 0) return ZERO;
  return b.add(live.length === 1 ? OP_LINEAR : OP_SUM, dim, tag, live);
}

/** One node per position of a grid (a flattened grid becomes its concatenation). */
function materialise(b: CircuitBuilder, g: Grid, tag: number): Grid {
  if (!g.flat) return g;
  return { shape: g.shape, nodes: [sumOf(b, g.dim * g.nodes.length, tag, g.nodes)], dim: g.dim * g.nodes.length, flat: false };
}

function buildLayer(
  b: CircuitBuilder,
  layer: Layer,
  inputs: Grid[],
  tag: number,
  options: BuildOptions,
  shapes: ModelShapes,
  pointwise: PointwiseReading,
  /** Present when the model shares its weights across positions. */
  shared: SharedMaps | undefined,
): Grid | Problem {
  const out = shapes.layers[layer.index]!;
  const first = inputs[0]!;
  const surrogate = options.surrogate;
  // In the identity special case a grouped map reads its input unchanged (no node).
  const grouped = shapes.groups[layer.index]! > 1 && options.groupedAsIdentity === true;
  if (grouped && out.width !== first.dim) {
    return { span: layer.span, code: 'network/grouped-not-identity', message: `layer ${layerLabel(layer)}: a grouped map between widths ${first.dim} and ${out.width} is not the identity` };
  }
  switch (layer.kind) {
    case 'pointwise': {
      if (!pointwise.squared.has(layer.index)) return first;
      const g = materialise(b, first, tag);
      return { ...g, nodes: g.nodes.map((v) => productOf(b, g.dim, tag, [v, v])) };
    }
    case 'flatten':
      // A flattened grid flattened again is the same list of positions.
      return { shape: out.shape, nodes: first.nodes, dim: first.dim, flat: true };
    case 'dense': {
      const reading = shapes.denseReading[layer.index];
      if (first.flat || reading === 'input') return { shape: out.shape, nodes: [sumOf(b, layer.units, tag, first.nodes)], dim: layer.units, flat: false };
      return { shape: out.shape, nodes: first.nodes.map(perPositionMaps(b, layer.units, tag, shared)), dim: layer.units, flat: false };
    }
    case 'merge': {
      const grids = inputs.map((g) => materialise(b, g, tag));
      const nodes = grids[0]!.nodes.map((_, p) => sumOf(b, out.width, tag, grids.map((g) => g.nodes[p]!)));
      return { shape: out.shape, nodes, dim: out.width, flat: false };
    }
    case 'recurrent':
      return recurrent(b, materialise(b, first, tag), layer, tag);
    case 'embedding': {
      const g = materialise(b, first, tag);
      // An embedding is one matrix at every position, whatever `weight_sharing` says.
      return { shape: out.shape, nodes: g.nodes.map(perPositionMaps(b, layer.dim, tag, shared ?? new SharedMaps(b))), dim: layer.dim, flat: false };
    }
    case 'position': {
      // v_t + p_t: a sum with a learned vector of its own per position.
      const g = materialise(b, first, tag);
      return { ...g, nodes: g.nodes.map((v) => sumOf(b, g.dim, tag, [v, b.add(OP_CONST, g.dim, tag, [])])) };
    }
    case 'class-token': {
      const g = materialise(b, first, tag);
      return { shape: out.shape, nodes: [b.add(OP_CONST, g.dim, tag, []), ...g.nodes], dim: g.dim, flat: false };
    }
    case 'attention':
      return attention(b, materialise(b, first, tag), layer, shapes.headDims[layer.index]!, tag);
    case 'pool':
      return pool(b, materialise(b, first, tag), layer, out.shape, tag);
    case 'upsample':
      return upsample(b, materialise(b, first, tag), layer, out.shape, tag);
    case 'conv':
      return conv(b, materialise(b, first, tag), layer, out.shape, out.width, tag, surrogate, grouped, shared);
    case 'conv-transpose':
      return convTranspose(b, materialise(b, first, tag), layer, out.shape, tag, surrogate, grouped);
  }
}

/**
 * The recurrent arithmetic circuit: per level a forward chain (and a backward one when
 * bidirectional) of states h_t = (W_H h_{t∓1}) ⊙ (W_I z_t) from a learned initial state.
 */
function recurrent(b: CircuitBuilder, g: Grid, layer: RecurrentLayer, tag: number): Grid {
  const R = layer.hidden;
  const chain = (inputs: readonly number[], backward: boolean): number[] => {
    const states = new Array<number>(inputs.length);
    let prev = b.add(OP_CONST, R, tag, []);
    for (let k = 0; k < inputs.length; k++) {
      const t = backward ? inputs.length - 1 - k : k;
      prev = productOf(b, R, tag, [linearOf(b, R, tag, prev), linearOf(b, R, tag, inputs[t]!)]);
      states[t] = prev;
    }
    return states;
  };
  const width = layer.bidirectional && layer.merge === 'concat' ? 2 * R : R;
  const join = (f: number, bw: number): number => sumOf(b, width, tag, [f, bw]);
  let below = g.nodes;
  let forward: number[] = [];
  let backward: number[] = [];
  for (let l = 0; l < layer.depth; l++) {
    forward = chain(below, false);
    if (layer.bidirectional) {
      backward = chain(below, true);
      below = forward.map((f, t) => join(f, backward[t]!));
    } else below = forward;
  }
  if (layer.sequence) return { shape: g.shape, nodes: below, dim: width, flat: false };
  const last = layer.bidirectional ? join(forward[forward.length - 1]!, backward[0]!) : forward[forward.length - 1]!;
  return { shape: [1], nodes: [last], dim: width, flat: false };
}

/**
 * Linearised attention, per head h: k_j = K_h v_j, u_j = V_h v_j and their outer product as a
 * product of two maps into a·a coordinates; the sum S(i) of those over the positions i attends to
 * (one sum shared by every position for full attention, prefix sums when causal, windows when
 * local); then the output O_h·(q_i ⊗-contracted with S(i)) as a map of the product of q_i's a·a
 * expansion with S(i), summed over heads. Structured maps (the outer product, the contraction)
 * are built as generic ones: the function family only grows, so upper bounds stay sound. The H
 * heads are built as one block of H·a query/key/value coordinates and H·a·a product coordinates:
 * with block-diagonal maps that block is exactly the H heads side by side (a Hadamard product of
 * concatenations is the concatenation of the products, and sums over positions and the output
 * map Σ_h O_h(·) = [O_1 … O_H](·) commute with concatenating), so it contains the per-head family
 * and its bounds are sound; it costs one set of nodes per position instead of H.
 */
function attention(b: CircuitBuilder, g: Grid, layer: AttentionLayer, a: number, tag: number): Grid {
  const D = g.dim;
  const n = g.nodes.length;
  const window = layer.window;
  const attends = (i: number, j: number): boolean =>
    (!layer.causal || j <= i) && (window === undefined || Math.abs(i - j) <= window);
  const ha = layer.heads * a;
  const lifted = layer.heads * a * a;
  const kv = g.nodes.map((v) =>
    productOf(b, lifted, tag, [linearOf(b, lifted, tag, linearOf(b, ha, tag, v)), linearOf(b, lifted, tag, linearOf(b, ha, tag, v))]),
  );
  const sums = new Array<number>(n);
  if (window === undefined && !layer.causal) {
    const all = sumOf(b, lifted, tag, kv);
    sums.fill(all);
  } else if (window === undefined) {
    let prefix = ZERO;
    for (let i = 0; i < n; i++) sums[i] = prefix = sumOf(b, lifted, tag, [prefix, kv[i]!]);
  } else {
    for (let i = 0; i < n; i++) {
      const from = Math.max(0, i - window);
      const to = layer.causal ? i : Math.min(n - 1, i + window);
      const terms: number[] = [];
      for (let j = from; j <= to; j++) if (attends(i, j)) terms.push(kv[j]!);
      sums[i] = sumOf(b, lifted, tag, terms);
    }
  }
  const nodes = g.nodes.map((v, i) => linearOf(b, D, tag, productOf(b, lifted, tag, [linearOf(b, lifted, tag, linearOf(b, ha, tag, v)), sums[i]!])));
  return { shape: g.shape, nodes, dim: D, flat: false };
}

/**
 * Visits every output position of a window layer in row-major order (`out` is its index there)
 * with the input positions it reads: the product set of per-axis lists, each list computed once
 * per axis index. The list is only valid during the call: one array per window size is reused,
 * so a layer allocates nothing per output. `visit` returns a problem to stop.
 */
function eachOutput(
  inShape: readonly number[],
  outShape: readonly number[],
  axisList: (axis: number, j: number) => readonly number[],
  visit: (positions: readonly number[], out: number) => Problem | undefined,
): Problem | undefined {
  const lists = outShape.map((n, a) => Array.from({ length: n }, (_, j) => axisList(a, j)));
  if (outShape.length === 1) {
    for (let j = 0; j < outShape[0]!; j++) {
      const problem = visit(lists[0]![j]!, j);
      if (problem) return problem;
    }
    return undefined;
  }
  const width = inShape[1]!;
  const buffers: number[][] = [];
  for (let i = 0; i < outShape[0]!; i++) {
    const rows = lists[0]![i]!;
    for (let j = 0; j < outShape[1]!; j++) {
      const cols = lists[1]![j]!;
      const size = rows.length * cols.length;
      const positions = (buffers[size] ??= new Array<number>(size));
      let k = 0;
      for (const r of rows) for (const c of cols) positions[k++] = r * width + c;
      const problem = visit(positions, i * outShape[1]! + j);
      if (problem) return problem;
    }
  }
  return undefined;
}

/**
 * Maps a list of positions to nodes in an array reused per length: the list is only valid until
 * the next call, which is enough for the node constructors (the builder copies children).
 */
function picker(nodeAt: (p: number) => number): (positions: readonly number[]) => readonly number[] {
  const buffers: number[][] = [];
  return (positions) => {
    const out = (buffers[positions.length] ??= new Array<number>(positions.length));
    for (let i = 0; i < positions.length; i++) out[i] = nodeAt(positions[i]!);
    return out;
  };
}

function plans(g: Grid, k: readonly number[], s: readonly number[], d: readonly number[], layer: ConvLayer | PoolLayer): AxisPlan[] {
  return g.shape.map((n, a) => windowAxis(n, k[a]!, s[a]!, d[a]!, layer.padding, a) as AxisPlan);
}

function emptyWindow(layer: Layer, shape: readonly number[], out: number): Problem {
  const at = shape.length === 1 ? [out] : [Math.floor(out / shape[1]!), out % shape[1]!];
  return {
    span: layer.fieldSpans['padding'] ?? layer.span,
    code: 'network/empty-window',
    message: `layer ${layerLabel(layer)} (line ${layer.span.line}): output position [${at.join(', ')}] reads only padding; reduce the padding or the stride`,
  };
}

const productsByWindow = new WeakMap<CircuitBuilder, Map<string, number>>();

/** The products of overlapping pool windows made so far, by their children. */
function windowProducts(b: CircuitBuilder): Map<string, number> {
  let m = productsByWindow.get(b);
  if (!m) productsByWindow.set(b, (m = new Map()));
  return m;
}

function pool(b: CircuitBuilder, g: Grid, layer: PoolLayer, shape: readonly number[], tag: number): Grid | Problem {
  if (layer.global) {
    return { shape, nodes: [productOf(b, g.dim, tag, g.nodes)], dim: g.dim, flat: false };
  }
  const axisPlans = plans(g, layer.window, layer.stride, layer.window.map(() => 1), layer);
  const nodes: number[] = [];
  const pick = picker((p) => g.nodes[p]!);
  // Overlapping windows clipped by the grid's edges can hold the same positions (a 3×3 window
  // with stride 1 on a 2×2 grid holds all four everywhere): a product has no weights, so such
  // windows are one node, one function.
  // Across layers too: two pools of one grid with such windows are one function.
  const same = layer.window.some((w, a) => layer.stride[a]! < w) ? windowProducts(b) : undefined;
  const problem = eachOutput(
    g.shape,
    shape,
    (a, j) => windowTaps(j, g.shape[a]!, layer.window[a]!, layer.stride[a]!, 1, axisPlans[a]!.left),
    (positions, out) => {
      if (positions.length === 0) return emptyWindow(layer, shape, out);
      const key = same && pick(positions).join(',');
      const known = key === undefined ? undefined : same!.get(key);
      const node = known ?? productOf(b, g.dim, tag, pick(positions));
      if (key !== undefined && known === undefined) same!.set(key, node);
      nodes.push(node);
      return undefined;
    },
  );
  return problem ?? { shape, nodes, dim: g.dim, flat: false };
}

function upsample(b: CircuitBuilder, g: Grid, layer: UpsampleLayer, shape: readonly number[], tag: number): Grid {
  const nodes: number[] = [];
  const pick = picker((p) => g.nodes[p]!);
  eachOutput(
    g.shape,
    shape,
    (a, j) => {
      const f = layer.factor[a]!;
      if (layer.mode === 'nearest') return [Math.floor(j / f)];
      const src = linearSources(j, g.shape[a]!, f);
      return src.num === 0 ? [src.i0] : [src.i0, src.i1];
    },
    (positions) => {
      nodes.push(positions.length === 1 ? g.nodes[positions[0]!]! : sumOf(b, g.dim, tag, pick(positions)));
      return undefined;
    },
  );
  return { shape, nodes, dim: g.dim, flat: false };
}

function conv(b: CircuitBuilder, g: Grid, layer: ConvLayer, shape: readonly number[], width: number, tag: number, surrogate: Surrogate, identity: boolean, shared: SharedMaps | undefined): Grid | Problem {
  const axisPlans = plans(g, layer.kernel, layer.stride, layer.dilation, layer);
  const causal = layer.padding.mode === 'causal';
  const nodes: number[] = [];
  if (surrogate === 'overlap') {
    const pick = picker((p) => g.nodes[p]!);
    // A kernel of one tap is one shared matrix per layer (not so for wider kernels: a window cut
    // by the padding keeps one tap, and which one differs between positions).
    const pointMap = shared && !identity && layer.kernel.every((k) => k === 1) ? shared.of(width, tag) : undefined;
    const problem = eachOutput(
      g.shape,
      shape,
      (a, j) => windowTaps(j, g.shape[a]!, layer.kernel[a]!, layer.stride[a]!, layer.dilation[a]!, axisPlans[a]!.left),
      (positions) => {
        nodes.push(pointMap && positions.length === 1 ? pointMap(g.nodes[positions[0]!]!) : sumOf(b, width, tag, pick(positions)));
        return undefined;
      },
    );
    return problem ?? { shape, nodes, dim: width, flat: false };
  }
  // Each input position is mapped once (it lies in at most one window, since min(k, s) ≤ s).
  const mapped = new Int32Array(g.nodes.length).fill(-1);
  const map = identity ? (v: number) => v : perPositionMaps(b, width, tag, shared);
  const mapOf = (p: number): number => {
    if (mapped[p] === -1) mapped[p] = map(g.nodes[p]!);
    return mapped[p]!;
  };
  const pick = picker(mapOf);
  const problem = eachOutput(
    g.shape,
    shape,
    (a, j) => treeConvPositions(j, g.shape[a]!, layer.kernel[a]!, layer.stride[a]!, layer.dilation[a]!, axisPlans[a]!, causal),
    (positions) => {
      // A window of padding only reads nothing: the zero vector, as in the real network.
      nodes.push(positions.length === 0 ? ZERO : productOf(b, width, tag, pick(positions)));
      return undefined;
    },
  );
  return problem ?? { shape, nodes, dim: width, flat: false };
}

function convTranspose(b: CircuitBuilder, g: Grid, layer: ConvTransposeLayer, shape: readonly number[], tag: number, surrogate: Surrogate, identity: boolean): Grid | Problem {
  const nodes: number[] = [];
  const pick = picker((p) => g.nodes[p]!);
  const problem = eachOutput(
    g.shape,
    shape,
    (a, j) =>
      surrogate === 'overlap'
        ? transposeSources(j, g.shape[a]!, layer.kernel[a]!, layer.stride[a]!, layer.dilation[a]!, layer.padding[a]!).map(([i]) => i)
        : [treeTransposeSource(j, g.shape[a]!, layer.stride[a]!)[0]],
    (positions) => {
      nodes.push(identity && positions.length === 1 ? g.nodes[positions[0]!]! : sumOf(b, layer.channels, tag, pick(positions)));
      return undefined;
    },
  );
  return problem ?? { shape, nodes, dim: layer.channels, flat: false };
}

/** The statements every report carries about how this model was read; each said once. */
class Notes {
  private readonly out: string[] = [];
  constructor(model: LayeredModel, shapes: ModelShapes, pointwise: PointwiseReading, surrogate: Surrogate) {
    const where = (l: Layer): string => `${l.kind === 'pointwise' ? l.op : `layer ${layerLabel(l)}`} (line ${l.span.line})`;
    const input = model.input;
    if (input.representation === undefined && input.vocabulary === undefined) {
      const from = firstMaps(model).find((l) => layerWidth(l) === shapes.representation);
      const which = from ? `layer ${layerLabel(from)} (line ${from.span.line})` : 'the first layer';
      this.out.push(
        `M = ${shapes.representation} representation functions per input position: the width of ${which}, the first layer that maps the input; set input.representation to choose M`,
      );
    }
    if (input.vocabulary !== undefined) {
      this.out.push(`token input: each position holds one of ${input.vocabulary} tokens, read as its indicator vector, so M = ${input.vocabulary}`);
    }
    const gated = [...new Set(model.layers.flatMap((l) => (l.kind === 'recurrent' && l.cell !== 'arithmetic' ? [l.cell] : [])))].sort();
    if (gated.length > 0) {
      this.out.push(`${gated.join(' and ')} layers are read as recurrent arithmetic circuits of the same width and depth (multiplicative integration): their gates are not modelled`);
    }
    if (model.layers.some((l) => l.kind === 'attention')) {
      this.out.push('attention is read as linearised self-attention (softmax and normalisation removed): each layer is a polynomial of degree 3 in its input');
    }
    if (model.layers.some((l) => l.kind === 'position' && l.mode === 'fixed')) {
      this.out.push('fixed position encodings are read as learned position vectors: no lower bound is claimed through them');
    }
    if (input.featuresAsChannels) {
      const line = input.fieldSpans['channels']?.line ?? input.span.line;
      this.out.push(
        `input.features (line ${line}) is read as the data's raw channel count, which does not limit the bound; earlier versions of rankfloor read it as M, which is now input.representation`,
      );
    }
    if (surrogate === 'tree' && model.layers.some((l) => (l.kind === 'conv' || l.kind === 'conv-transpose') && l.kernel.some((k, a) => k > l.stride[a]!))) {
      this.out.push('the tree surrogate uses each convolution as a per-position map: kernels wider than their stride are not used by the bound');
    }
    const modes = [...new Set(model.layers.flatMap((l) => (l.kind === 'pool' && l.mode !== 'product' ? [l.mode] : [])))].sort();
    if (modes.length > 0) this.out.push(`${modes.join(' and ')} pooling is a product over each window in the arithmetic surrogate`);
    const identity = model.layers.filter((l) => l.kind === 'pointwise' && !pointwise.squared.has(l.index) && !pointwise.ignored.has(l.index));
    if (identity.length > 0) {
      this.out.push(
        `pointwise layers read as the identity (in the arithmetic surrogate the only non-linearity is the product of pooling and recurrence): ${list(identity.map(where))}`,
      );
    }
    const squared = model.layers.filter((l) => pointwise.squared.has(l.index));
    if (squared.length > 0) {
      this.out.push(`activations after dense layers that mix positions are read as the elementwise square v ⊙ v, so that the fully connected part keeps a non-linearity: ${list(squared.map(where))}`);
    }
    const ignored = model.layers.filter((l) => pointwise.ignored.has(l.index));
    if (ignored.length > 0) this.out.push(`pointwise layers after the last weighted layer are not part of the analysed score: ${list(ignored.map(where))}`);
    for (const l of model.layers) {
      if (l.kind !== 'dense') continue;
      const reading = shapes.denseReading[l.index];
      const before = l.inputs[0] === INPUT ? model.input.shape : shapes.layers[l.inputs[0]!]!.shape;
      if (reading === 'per-position') {
        // On an image grid a per-position dense layer is often a forgotten flatten; on a sequence it is the usual per-step head.
        const advice = before.length === 2 ? '; put flatten before it to read them all at once' : '';
        this.out.push(`dense layer ${layerLabel(l)} (line ${l.span.line}) acts on each of the ${positionCount(before)} positions of its grid separately, like a 1×1 convolution${advice}`);
      } else if (reading === 'input') {
        this.out.push(`dense layer ${layerLabel(l)} (line ${l.span.line}) reads all ${positionCount(before)} input positions at once (a fully connected layer on the raw input)`);
      }
    }
    if (model.layers.some((l) => l.kind === 'upsample' && l.mode === 'linear')) {
      this.out.push('linear upsampling is a fixed sum of neighbouring positions: no lower bound is claimed through it');
    }
    if (shapes.output.defaulted) {
      const last = shapes.layers[shapes.layers.length - 1]!.shape;
      this.out.push(
        `the analysed output is position [${shapes.output.position.join(', ')}] of the last layer's grid [${last.join(', ')}] (the default); set output.position to analyse another, or add a global pool`,
      );
    } else if (model.output.position) {
      this.out.push(`the analysed output is position [${shapes.output.position.join(', ')}] (output.position)`);
    }
  }

  list(): string[] {
    return this.out;
  }
}

function list(items: readonly string[]): string {
  const max = 8;
  return items.length <= max ? items.join(', ') : `${items.slice(0, max).join(', ')} and ${items.length - max} more`;
}
