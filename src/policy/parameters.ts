/**
 * Parameter counts of the real network a config describes (kernels and biases, one weight set per
 * position when weights are not shared). Fixes are ranked by how many parameters they add, the
 * cost a reviewer weighs against the capacity they buy.
 *
 * Grids and groups come from shape inference (`inferShapes`); widths are followed here from the
 * data's raw channels (`input.channels`, else M), because the real network's first layer reads the
 * data, not M. Conventions (common practice): every conv, transposed conv and dense layer has a
 * bias unless the config says `bias: false`; batch, group, instance and layer normalisation have
 * a scale and a shift per channel (2 · width; RMS normalisation: a scale only), PReLU a slope per
 * channel; other pointwise layers, pools, upsampling, flatten and merges have none.
 *
 * Sequence kinds (common practice): a recurrent level with g gate blocks (LSTM 4, GRU 3, a plain or
 * arithmetic cell 1) over input width d and hidden h has g·(h·d + h·h) weights and g·h biases, per
 * direction; level l > 1 reads 2h (both directions concatenated) or h. An embedding of width e
 * over input width d (the vocabulary V on a token input) has d·e; learned position vectors n·d for
 * n positions of width d (fixed encodings: none); a class token d. Multi-head attention over width
 * d with H heads of width a has query, key and value maps of d·H·a weights and H·a biases each and
 * an output map of H·a·d weights and d biases: 4·d² + 4·d when H·a = d.
 */
import { INPUT, layerWidth, positionCount, type Layer, type LayeredModel, type RecurrentLayer } from '../config/model.js';
import { inferShapes, type ModelShapes } from '../config/model-shapes.js';

const AFFINE_NORMS = new Set(['batch_norm', 'layer_norm', 'group_norm', 'instance_norm']);

/** Gate blocks per recurrent cell: each has an input map, a recurrent map and a bias. */
const GATES: Record<RecurrentLayer['cell'], number> = { arithmetic: 1, rnn: 1, lstm: 4, gru: 3 };

/** Throws for a model whose shapes do not infer (every loaded model's do). */
export function parameterCount(model: LayeredModel): bigint {
  const inferred = inferShapes(model);
  if (!inferred.ok) throw new Error(`parameter count: the shapes of ${model.file} do not infer: ${inferred.diagnostics[0]?.message ?? ''}`);
  const shapes = inferred.shapes;
  const inputWidth = model.input.channels ?? shapes.representation;
  const widths: number[] = [];
  const width = (i: number): number => (i === INPUT ? inputWidth : widths[i]!);
  const grid = (i: number): readonly number[] => (i === INPUT ? model.input.shape : shapes.layers[i]!.shape);
  let total = 0n;
  for (const layer of model.layers) {
    const d = width(layer.inputs[0]!);
    const w = outWidth(layer, d, layer.inputs.map(width), grid(layer.inputs[0]!));
    widths.push(w);
    total += countOf(layer, d, w, model, shapes, grid(layer.inputs[0]!));
  }
  return total;
}

/** Width of the real layer's output given its inputs' widths (the inferred widths start from M). */
function outWidth(layer: Layer, d: number, ins: readonly number[], inGrid: readonly number[]): number {
  if (layer.kind === 'recurrent') return layer.bidirectional && layer.merge === 'concat' ? 2 * layer.hidden : layer.hidden;
  const own = layerWidth(layer);
  if (own !== undefined) return own;
  switch (layer.kind) {
    case 'conv':
      return layer.groups === 'depthwise' ? d * layer.depthMultiplier : d;
    case 'flatten':
      return d * positionCount(inGrid);
    case 'merge':
      return layer.mode === 'sum' ? d : ins.reduce((a, b) => a + b, 0);
    default:
      return d;
  }
}

function countOf(layer: Layer, d: number, w: number, model: LayeredModel, shapes: ModelShapes, inGrid: readonly number[]): bigint {
  const outPositions = BigInt(positionCount(shapes.layers[layer.index]!.shape));
  const copies = (perPosition: bigint, positions: bigint): bigint => (model.weightSharing ? perPosition : perPosition * positions);
  const bias = (b: { bias?: false }): bigint => (b.bias === false ? 0n : BigInt(w));
  switch (layer.kind) {
    case 'conv': {
      const groups = layer.groups === 'depthwise' ? d : layer.groups;
      const taps = BigInt(layer.kernel.reduce((a, b) => a * b, 1));
      return copies(taps * BigInt(Math.ceil(d / groups)) * BigInt(w) + bias(layer), outPositions);
    }
    case 'conv-transpose': {
      const taps = BigInt(layer.kernel.reduce((a, b) => a * b, 1));
      return copies(taps * BigInt(Math.ceil(d / layer.groups)) * BigInt(w) + bias(layer), outPositions);
    }
    case 'dense': {
      const reading = shapes.denseReading[layer.index];
      const inWidth = reading === 'input' ? d * positionCount(inGrid) : d;
      const one = BigInt(inWidth) * BigInt(w) + bias(layer);
      return reading === 'per-position' ? copies(one, outPositions) : one;
    }
    case 'recurrent': {
      const g = BigInt(GATES[layer.cell]);
      const h = BigInt(layer.hidden);
      const directions = layer.bidirectional ? 2n : 1n;
      const below = BigInt(layer.bidirectional && layer.merge === 'concat' ? 2 * layer.hidden : layer.hidden);
      let total = 0n;
      for (let l = 0; l < layer.depth; l++) total += directions * (g * (h * (l === 0 ? BigInt(d) : below) + h * h) + (layer.bias === false ? 0n : g * h));
      return total;
    }
    case 'embedding':
      return BigInt(d) * BigInt(layer.dim);
    case 'position':
      return layer.mode === 'learned' ? BigInt(positionCount(inGrid)) * BigInt(d) : 0n;
    case 'class-token':
      return BigInt(d);
    case 'attention': {
      const inner = BigInt(layer.heads) * BigInt(shapes.headDims[layer.index]!);
      const weights = 4n * BigInt(d) * inner;
      return layer.bias === false ? weights : weights + 3n * inner + BigInt(d);
    }
    case 'pointwise':
      if (AFFINE_NORMS.has(layer.op)) return 2n * BigInt(d);
      if (layer.op === 'rms_norm' || layer.op === 'prelu') return BigInt(d);
      return 0n;
    default:
      return 0n;
  }
}
