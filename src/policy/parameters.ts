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
 */
import { INPUT, layerWidth, positionCount, type Layer, type LayeredModel } from '../config/model.js';
import { inferShapes, type ModelShapes } from '../config/model-shapes.js';

const AFFINE_NORMS = new Set(['batch_norm', 'layer_norm', 'group_norm', 'instance_norm']);

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
      let total = 0n;
      const h = BigInt(layer.hidden);
      for (let l = 0; l < layer.depth; l++) total += h * h + h * BigInt(l === 0 ? d : layer.hidden) + h;
      return total;
    }
    case 'pointwise':
      if (AFFINE_NORMS.has(layer.op)) return 2n * BigInt(d);
      if (layer.op === 'rms_norm' || layer.op === 'prelu') return BigInt(d);
      return 0n;
    default:
      return 0n;
  }
}
