/**
 * The oracle's reading of a layered model before any number is drawn: the grid (shape and width)
 * after every layer, resolved groups, how each dense layer reads its grid, which activations the
 * square rule turns into v ⊙ v, and the analysed output position. All of it follows the text of
 * the contributor guide ("The surrogate functions"); only M comes from `representationOf`, whose
 * definition is part of the model. A model that breaks a rule of the text throws: families draw
 * valid models, so a throw is a test bug (families use it to reject a draw).
 */
import {
  INPUT,
  representationOf,
  type ConvLayer,
  type ConvTransposeLayer,
  type Layer,
  type LayeredModel,
  type PointwiseLayer,
} from '../../src/config/model.js';
import { count, transposeLength, treeConvGroups, windowAxis } from './geometry.js';

export type SurrogateKind = 'tree' | 'overlap';

export type DenseReading = 'vector' | 'input' | 'per-position';

export interface GridShape {
  readonly dims: readonly number[];
  readonly width: number;
}

export interface ModelPlan {
  /** M, the dimension of each input vector. */
  readonly m: number;
  /** A token input's vocabulary V (then M = V and every input vector is an indicator). */
  readonly vocabulary: number | undefined;
  readonly input: GridShape;
  /** Output grid of every layer, indexed like `model.layers`. */
  readonly grids: readonly GridShape[];
  /** Groups of a conv or conv-transpose (`depthwise` resolved); 1 elsewhere. */
  readonly groups: readonly number[];
  /** Per attention layer: the head width a (given, or the input width divided by the heads). */
  readonly headDim: readonly (number | undefined)[];
  /** Per dense layer; undefined for other kinds. */
  readonly reading: readonly (DenseReading | undefined)[];
  /** Dense layers that mix positions (the square rule's condition). */
  readonly mixes: readonly boolean[];
  /** Activations evaluated as the elementwise square. */
  readonly square: readonly boolean[];
  /** Pointwise layers from which no weighted layer can be reached (ignored). */
  readonly ignored: readonly boolean[];
  /** The analysed output: a position of the last layer's grid (row-major index and per axis). */
  readonly output: { readonly position: readonly number[]; readonly index: number; readonly defaulted: boolean };
}

/** "Pointwise layers from which no weighted layer (conv, conv-transpose, dense, recurrent, embedding, attention) can be reached are ignored." */
const WEIGHTED = new Set<Layer['kind']>(['conv', 'conv-transpose', 'dense', 'recurrent', 'embedding', 'attention']);

function singlePosition(g: GridShape): boolean {
  return count(g.dims) === 1;
}

/**
 * "Same grid" for a merge. Reading of the text: grids of one position agree whatever their number
 * of axes (a global pool of a 2D grid and a flatten both leave one position).
 */
export function sameGrid(a: GridShape, b: GridShape): boolean {
  if (singlePosition(a) && singlePosition(b)) return true;
  return a.dims.length === b.dims.length && a.dims.every((n, i) => n === b.dims[i]);
}

function perAxis<T>(values: readonly T[], dims: readonly number[], what: string, layer: Layer): void {
  if (values.length !== dims.length) {
    throw new Error(`layer ${layer.index}: ${what} [${values.join(',')}] does not match grid [${dims.join(',')}]`);
  }
}

/** Kernel, stride and dilation have one entry per grid axis. */
function windowFields(layer: ConvLayer | ConvTransposeLayer, dims: readonly number[]): void {
  perAxis(layer.kernel, dims, 'kernel', layer);
  perAxis(layer.stride, dims, 'stride', layer);
  perAxis(layer.dilation, dims, 'dilation', layer);
}

export function planModel(model: LayeredModel, surrogate: SurrogateKind = 'overlap'): ModelPlan {
  const vocabulary = model.input.vocabulary;
  // "A token input [...] carries at each position the indicator vector of its token: M = V
  // exactly, whatever else the config says."
  const m = vocabulary ?? representationOf(model);
  if (m === undefined || m < 1) throw new Error('model has no representation width M');
  const input: GridShape = { dims: [...model.input.shape], width: m };
  const layers = model.layers;
  const grids: GridShape[] = [];
  const groups: number[] = [];
  const reading: (DenseReading | undefined)[] = [];
  const headDim: (number | undefined)[] = [];
  const gridOf = (i: number): GridShape => {
    if (i === INPUT) return input;
    const g = grids[i];
    if (!g) throw new Error(`layer reads ${i}, which is not an earlier layer`);
    return g;
  };
  const one = (layer: Layer): GridShape => {
    if (layer.inputs.length !== 1) throw new Error(`layer ${layer.index} (${layer.kind}) reads ${layer.inputs.length} inputs`);
    return gridOf(layer.inputs[0] as number);
  };
  /** Follows the single input of pointwise layers up to the first other layer (or INPUT). */
  const throughPointwise = (from: number): number => {
    let x = from;
    while (x !== INPUT && (layers[x] as Layer).kind === 'pointwise') x = (layers[x] as Layer).inputs[0] as number;
    return x;
  };

  layers.forEach((layer, li) => {
    if (layer.index !== li) throw new Error(`layer ${li} has index ${layer.index}`);
    for (const i of layer.inputs) if (i !== INPUT && (i < 0 || i >= li)) throw new Error(`layer ${li} reads ${i}: not topological`);
    let g = 1;
    let out: GridShape;
    switch (layer.kind) {
      case 'conv': {
        const src = one(layer);
        const dims = src.dims;
        windowFields(layer, dims);
        if (layer.padding.mode === 'causal' && dims.length !== 1) throw new Error(`conv ${li}: causal padding on a 2D grid`);
        g = layer.groups === 'depthwise' ? src.width : layer.groups;
        const r = layer.channels ?? (layer.groups === 'depthwise' ? src.width * layer.depthMultiplier : undefined);
        if (r === undefined) throw new Error(`conv ${li} has no channels`);
        if (src.width % g !== 0 || r % g !== 0) throw new Error(`conv ${li}: groups ${g} do not divide widths ${src.width} → ${r}`);
        const axes = dims.map((n, a) => windowAxis(n, layer.kernel[a] as number, layer.stride[a] as number, layer.dilation[a] as number, layer.padding, a));
        // "A conv whose P(j) is empty for some j is refused."
        if (surrogate === 'tree' && treeConvGroups(dims, layer.kernel, layer.stride, layer.dilation, layer.padding).groups.some((ps) => ps.length === 0)) {
          throw new Error(`tree conv ${li}: an output reads no position`);
        }
        out = { dims: axes.map((w) => w.out), width: r };
        break;
      }
      case 'conv-transpose': {
        const src = one(layer);
        const dims = src.dims;
        windowFields(layer, dims);
        perAxis(layer.padding, dims, 'padding', layer);
        perAxis(layer.outputPadding, dims, 'output padding', layer);
        g = layer.groups;
        if (src.width % g !== 0 || layer.channels % g !== 0) throw new Error(`conv-transpose ${li}: groups ${g} do not divide widths`);
        const outDims = dims.map((n, a) =>
          transposeLength(n, layer.kernel[a] as number, layer.stride[a] as number, layer.dilation[a] as number, layer.padding[a] as number, layer.outputPadding[a] as number),
        );
        if (outDims.some((n) => n < 1)) throw new Error(`conv-transpose ${li}: empty output`);
        out = { dims: outDims, width: layer.channels };
        break;
      }
      case 'pool': {
        const src = one(layer);
        if (layer.global) {
          out = { dims: src.dims.map(() => 1), width: src.width };
          break;
        }
        if (layer.padding.mode === 'causal') throw new Error(`pool ${li}: causal padding`);
        perAxis(layer.window, src.dims, 'window', layer);
        perAxis(layer.stride, src.dims, 'stride', layer);
        const axes = src.dims.map((n, a) => windowAxis(n, layer.window[a] as number, layer.stride[a] as number, 1, layer.padding, a));
        out = { dims: axes.map((w) => w.out), width: src.width };
        break;
      }
      case 'upsample': {
        const src = one(layer);
        perAxis(layer.factor, src.dims, 'factor', layer);
        out = { dims: src.dims.map((n, a) => n * (layer.factor[a] as number)), width: src.width };
        break;
      }
      case 'flatten': {
        const src = one(layer);
        out = { dims: [1], width: src.width * count(src.dims) };
        break;
      }
      case 'dense': {
        const src = one(layer);
        let how: DenseReading;
        if (singlePosition(src)) how = 'vector';
        else if (throughPointwise(layer.inputs[0] as number) === INPUT) how = 'input';
        else how = 'per-position';
        reading[li] = how;
        out = { dims: how === 'input' ? [1] : src.dims, width: layer.units };
        break;
      }
      case 'recurrent': {
        const src = one(layer);
        if (src.dims.length !== 1) throw new Error(`recurrent ${li} needs a 1D grid, got [${src.dims.join(',')}]`);
        if (layer.hidden < 1 || layer.depth < 1) throw new Error(`recurrent ${li}: hidden ${layer.hidden}, depth ${layer.depth}`);
        // D_l = 2R for a bidirectional concat, R otherwise; `sequence` keeps the T positions.
        const width = layer.bidirectional && layer.merge === 'concat' ? 2 * layer.hidden : layer.hidden;
        out = { dims: layer.sequence ? src.dims : [1], width };
        break;
      }
      case 'embedding': {
        const src = one(layer);
        out = { dims: src.dims, width: layer.dim };
        break;
      }
      case 'position':
        out = one(layer);
        break;
      case 'class-token': {
        // "the grid (any shape, N positions) becomes a 1D grid of N + 1 positions"
        const src = one(layer);
        out = { dims: [count(src.dims) + 1], width: src.width };
        break;
      }
      case 'attention': {
        const src = one(layer);
        if (layer.heads < 1) throw new Error(`attention ${li}: ${layer.heads} heads`);
        // "head width a [...] absent: the input width divided by heads" — refused when it does not divide.
        const a = layer.headDim ?? src.width / layer.heads;
        if (!Number.isInteger(a) || a < 1) throw new Error(`attention ${li}: head width ${a} (width ${src.width}, ${layer.heads} heads)`);
        // "with a window w (1D grids)"
        if (layer.window !== undefined && (src.dims.length !== 1 || !Number.isInteger(layer.window) || layer.window < 0)) {
          throw new Error(`attention ${li}: window ${layer.window} on grid [${src.dims.join(',')}]`);
        }
        headDim[li] = a;
        out = src;
        break;
      }
      case 'pointwise':
        out = one(layer);
        break;
      case 'merge': {
        if (layer.inputs.length < 2) throw new Error(`merge ${li} reads ${layer.inputs.length} input`);
        const srcs = layer.inputs.map(gridOf);
        const first = srcs[0] as GridShape;
        for (const s of srcs) {
          if (!sameGrid(first, s)) throw new Error(`merge ${li}: grids [${first.dims.join(',')}] and [${s.dims.join(',')}] differ`);
          if (layer.mode === 'sum' && s.width !== first.width) throw new Error(`merge ${li}: sum of widths ${first.width} and ${s.width}`);
        }
        out = { dims: first.dims, width: layer.mode === 'sum' ? first.width : srcs.reduce((a, s) => a + s.width, 0) };
        break;
      }
    }
    groups.push(g);
    grids.push(out);
  });

  // The square rule: a dense layer mixes positions when it reads `input`, or when the nearest
  // non-pointwise layer it reads is a flatten of more than one position or itself mixes; a merge
  // mixes when the nearest non-pointwise layer of every input mixes.
  const mixes: boolean[] = layers.map(() => false);
  const nearMixes = (i: number): boolean => {
    const near = throughPointwise(i);
    return near !== INPUT && (mixes[near] as boolean);
  };
  layers.forEach((layer, li) => {
    if (layer.kind === 'merge') {
      mixes[li] = layer.inputs.every(nearMixes);
      return;
    }
    if (layer.kind !== 'dense') return;
    if (reading[li] === 'input') {
      mixes[li] = true;
      return;
    }
    const near = throughPointwise(layer.inputs[0] as number);
    if (near === INPUT) return;
    const nl = layers[near] as Layer;
    if (nl.kind === 'flatten') mixes[li] = count(gridOf(nl.inputs[0] as number).dims) > 1;
    else mixes[li] = mixes[near] as boolean;
  });
  // Reachability of a weighted layer, from the consumers backwards.
  const reachesWeighted: boolean[] = layers.map(() => false);
  for (let li = layers.length - 1; li >= 0; li--) {
    for (const i of (layers[li] as Layer).inputs) {
      if (i === INPUT) continue;
      if (WEIGHTED.has((layers[li] as Layer).kind) || reachesWeighted[li]) reachesWeighted[i] = true;
    }
  }
  const ignored = layers.map((l, li) => l.kind === 'pointwise' && !reachesWeighted[li]);
  const square = layers.map((l, li) => {
    if (l.kind !== 'pointwise' || l.family !== 'activation' || ignored[li]) return false;
    let x = l.inputs[0] as number;
    while (x !== INPUT && (layers[x] as Layer).kind === 'pointwise') {
      if ((layers[x] as PointwiseLayer).family === 'activation') return false; // another activation between
      x = (layers[x] as Layer).inputs[0] as number;
    }
    return x !== INPUT && (mixes[x] as boolean);
  });

  // The analysed output.
  if (layers.length === 0) throw new Error('model has no layers');
  const last = grids[grids.length - 1] as GridShape;
  let position: number[];
  let defaulted = false;
  if (singlePosition(last)) {
    position = last.dims.map(() => 0);
  } else if (model.output.position !== undefined) {
    position = [...model.output.position];
    if (position.length !== last.dims.length || position.some((x, a) => x < 0 || x >= (last.dims[a] as number))) {
      throw new Error(`output position [${position.join(',')}] outside grid [${last.dims.join(',')}]`);
    }
  } else {
    defaulted = true;
    // "a model is causal when its grid is 1D and every layer that can read another position than
    // its own [...] is causal [...], and at least one such layer exists"; a class token: position 0.
    let readers = 0;
    let causal = true;
    layers.forEach((l, li) => {
      let reads = false;
      let ok = false;
      if (l.kind === 'conv') {
        reads = l.kernel.some((k) => k !== 1) || l.stride.some((x) => x !== 1);
        ok = l.padding.mode === 'causal';
      } else if (l.kind === 'pool') {
        reads = l.global || l.window.some((w) => w !== 1) || l.stride.some((x) => x !== 1);
      } else if (l.kind === 'dense') {
        reads = reading[li] === 'input';
      } else if (l.kind === 'flatten') {
        reads = count(gridOf(l.inputs[0] as number).dims) > 1;
      } else if (l.kind === 'conv-transpose' || l.kind === 'upsample' || l.kind === 'class-token') {
        reads = true;
      } else if (l.kind === 'recurrent') {
        reads = true;
        ok = !l.bidirectional;
      } else if (l.kind === 'attention') {
        reads = true;
        ok = l.causal;
      }
      if (!reads) return;
      readers++;
      if (!ok) causal = false;
    });
    const isCausal = last.dims.length === 1 && readers > 0 && causal;
    const classToken = last.dims.length === 1 && layers.some((l) => l.kind === 'class-token');
    position = isCausal ? [(last.dims[0] as number) - 1] : classToken ? [0] : last.dims.map((n) => Math.floor(n / 2));
  }
  let index = 0;
  for (let a = 0; a < last.dims.length; a++) index = index * (last.dims[a] as number) + (position[a] as number);
  return { m, vocabulary, input, grids, groups, headDim, reading, mixes, square, ignored, output: { position, index, defaulted } };
}
