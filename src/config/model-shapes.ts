/**
 * Follows the grids through a layered model: for every layer its output shape and width, with
 * depthwise widths and the model's M resolved. This is where a model whose paths disagree (a
 * residual sum of different widths, a skip concatenated at another resolution), whose window
 * does not fit, or whose grouped conv does not divide its channels is rejected, with the span of
 * the field at fault. Only arithmetic happens here: nothing is allocated per position, so a huge
 * input is measured before anything is built.
 */
import type { Diagnostic, Span } from '../diagnostic.js';
import {
  INPUT,
  layerLabel,
  positionCount,
  representationOf,
  type ConvLayer,
  type Layer,
  type LayeredModel,
} from './model.js';
import { transposeLength, windowAxis } from './grid-geometry.js';

export interface LayerShape {
  readonly shape: readonly number[];
  /** Vector dimension at each position after the layer. */
  readonly width: number;
}

/** How a dense layer meets its grid (see DEVELOPERS.md, "dense"). */
export type DenseReading = 'vector' | 'input' | 'per-position';

export interface ModelShapes {
  /** M, the dimension of each input leg. */
  readonly representation: number;
  /** Indexed like `model.layers`. */
  readonly layers: readonly LayerShape[];
  /** Groups of each conv / conv-transpose after resolving `depthwise`; 1 elsewhere. */
  readonly groups: readonly number[];
  /** For each dense layer, how it reads its grid; undefined for other kinds. */
  readonly denseReading: readonly (DenseReading | undefined)[];
  /** For each attention layer, the width of its heads (given, or the input width / heads); 0 elsewhere. */
  readonly headDims: readonly number[];
  /** The analysed output position in the last layer's grid, and whether it was defaulted. */
  readonly output: { readonly position: readonly number[]; readonly defaulted: boolean };
}

export type ShapesResult = { ok: true; shapes: ModelShapes } | { ok: false; diagnostics: Diagnostic[] };

/** Widths above this are refused (flatten and concatenation multiply and add widths): dimensions are 32-bit. */
export const MAX_WIDTH = 2 ** 31 - 1;

/** A problem `LayerAdjust` finds with a layer's stated sizes. */
export interface AdjustProblem {
  readonly code: string;
  readonly message: string;
  readonly span: Span;
}

/**
 * Called with each layer and its (first) input's shape before the layer is inferred: the loader
 * fills sizes that follow from the input (a transformer block's MLP width) and checks sizes the
 * config states (`embed_dim`), returning the layer to infer, or a problem.
 */
export type LayerAdjust = (layer: Layer, input: LayerShape) => Layer | AdjustProblem;

export function inferShapes(model: LayeredModel, adjust?: LayerAdjust): ShapesResult {
  const diagnostics: Diagnostic[] = [];
  const fail = (span: Span, code: string, message: string): ShapesResult => {
    diagnostics.push({ code, message, file: model.file, span, severity: 'error' });
    return { ok: false, diagnostics };
  };
  const m = representationOf(model);
  if (m === undefined) {
    return fail(
      model.input.span,
      'config/no-representation',
      'no layer maps the input to a width, so the number of representation functions per position cannot be defaulted; set input.representation',
    );
  }
  const out: LayerShape[] = [];
  const groups: number[] = [];
  const denseReading: (DenseReading | undefined)[] = [];
  const headDims: number[] = [];
  /** Layers that reach the input through pointwise layers only (for a dense layer reading it whole). */
  const rawInput = new Set<number>([INPUT]);
  const inShape = (i: number): LayerShape => (i === INPUT ? { shape: model.input.shape, width: m } : out[i]!);

  for (const written of model.layers) {
    const ins = written.inputs.map(inShape);
    const first = ins[0]!;
    const adjusted = adjust ? adjust(written, first) : written;
    if ('code' in adjusted) return fail(adjusted.span, adjusted.code, adjusted.message);
    const layer = adjusted;
    const where = `layer ${layerLabel(layer)} (line ${layer.span.line})`;
    const dims = first.shape.length;
    let result: LayerShape;
    groups.push(1);
    denseReading.push(undefined);
    headDims.push(0);
    switch (layer.kind) {
      case 'conv': {
        const axes = perAxis(layer, first.shape);
        if (typeof axes === 'string') return fail(layer.fieldSpans['kernel'] ?? layer.span, 'config/window-does-not-fit', `${where}: ${axes}`);
        if (layer.padding.mode === 'causal' && dims !== 1) {
          return fail(layer.fieldSpans['padding'] ?? layer.span, 'config/causal-needs-1d', `${where}: causal padding needs a 1D grid, but the grid is [${first.shape.join(', ')}]`);
        }
        const g = convGroups(layer, first.width);
        if (typeof g === 'string') return fail(layer.fieldSpans['groups'] ?? layer.span, 'config/groups', `${where}: ${g}`);
        groups[layer.index] = g.groups;
        result = { shape: axes, width: g.channels };
        break;
      }
      case 'conv-transpose': {
        const shape = first.shape.map((n, a) =>
          transposeLength(n, layer.kernel[a]!, layer.stride[a]!, layer.dilation[a]!, layer.padding[a]!, layer.outputPadding[a]!),
        );
        if (shape.some((n) => n < 1)) {
          return fail(layer.fieldSpans['padding'] ?? layer.span, 'config/window-does-not-fit', `${where}: the output would have no positions ([${shape.join(', ')}]); reduce the padding`);
        }
        if (first.width % layer.groups !== 0 || layer.channels % layer.groups !== 0) {
          return fail(layer.fieldSpans['groups'] ?? layer.span, 'config/groups', `${where}: groups ${layer.groups} must divide both the input width ${first.width} and the channels ${layer.channels}`);
        }
        groups[layer.index] = layer.groups;
        result = { shape, width: layer.channels };
        break;
      }
      case 'pool': {
        if (layer.global) {
          result = { shape: first.shape.map(() => 1), width: first.width };
          break;
        }
        const shape: number[] = [];
        for (let a = 0; a < dims; a++) {
          const plan = windowAxis(first.shape[a]!, layer.window[a]!, layer.stride[a]!, 1, layer.padding, a);
          if (typeof plan === 'string') return fail(layer.fieldSpans['window'] ?? layer.span, 'config/window-does-not-fit', `${where}: ${plan}`);
          shape.push(plan.out);
        }
        result = { shape, width: first.width };
        break;
      }
      case 'dense': {
        const single = positionCount(first.shape) === 1;
        const reading: DenseReading = single ? 'vector' : layer.inputs.every((i) => rawInput.has(i)) ? 'input' : 'per-position';
        denseReading[layer.index] = reading;
        result = { shape: reading === 'input' ? first.shape.map(() => 1) : first.shape, width: layer.units };
        break;
      }
      case 'flatten':
        result = { shape: first.shape.map(() => 1), width: first.width * positionCount(first.shape) };
        break;
      case 'upsample':
        result = { shape: first.shape.map((n, a) => n * layer.factor[a]!), width: first.width };
        break;
      case 'recurrent': {
        if (dims !== 1) {
          return fail(layer.span, 'config/recurrent-needs-1d', `${where}: a recurrent layer needs a 1D sequence, but the grid is [${first.shape.join(', ')}] here`);
        }
        const width = layer.bidirectional && layer.merge === 'concat' ? 2 * layer.hidden : layer.hidden;
        result = { shape: layer.sequence ? first.shape : [1], width };
        break;
      }
      case 'embedding':
        result = { shape: first.shape, width: layer.dim };
        break;
      case 'position':
        result = first;
        break;
      case 'class-token':
        result = { shape: [positionCount(first.shape) + 1], width: first.width };
        break;
      case 'attention': {
        const a = layer.headDim ?? first.width / layer.heads;
        if (!Number.isInteger(a) || a < 1) {
          return fail(layer.fieldSpans['heads'] ?? layer.span, 'config/attention-heads', `${where}: ${layer.heads} heads do not divide the width ${first.width}; give head_dim`);
        }
        if (layer.window !== undefined && dims !== 1) {
          return fail(layer.fieldSpans['window'] ?? layer.span, 'config/attention-window', `${where}: a local window needs a 1D sequence, but the grid is [${first.shape.join(', ')}] here`);
        }
        headDims[layer.index] = a;
        result = first;
        break;
      }
      case 'pointwise':
        result = first;
        if (layer.inputs.every((i) => rawInput.has(i))) rawInput.add(layer.index);
        break;
      case 'merge': {
        const mismatch = ins.findIndex((s) => s.shape.length !== dims || s.shape.some((n, a) => n !== first.shape[a]));
        if (mismatch >= 0) {
          return fail(layer.span, 'config/merge-shape', `${where}: the paths it ${layer.mode === 'sum' ? 'adds' : 'joins'} end on different grids: ${ins.map((s) => `[${s.shape.join(', ')}]`).join(' and ')}${describeInputs(model, layer)}`);
        }
        if (layer.mode === 'sum') {
          if (ins.some((s) => s.width !== first.width)) {
            return fail(layer.span, 'config/merge-width', `${where}: the paths it adds have different widths ${ins.map((s) => s.width).join(' and ')}${describeInputs(model, layer)}; a sum needs equal widths (give the shortcut a 1×1 conv to the main path's width)`);
          }
          result = { shape: first.shape, width: first.width };
        } else {
          result = { shape: first.shape, width: ins.reduce((a, s) => a + s.width, 0) };
        }
        break;
      }
    }
    if (result.width > MAX_WIDTH) {
      return fail(layer.span, 'config/too-wide', `${where}: its width ${result.width} is above the limit of ${MAX_WIDTH}`);
    }
    out.push(result);
  }
  const last = out[out.length - 1]!;
  const output = outputPosition(model, last.shape, out, denseReading);
  if (typeof output === 'string') return fail(model.output.span ?? model.span, 'config/output-position', output);
  return { ok: true, shapes: { representation: m, layers: out, groups, denseReading, headDims, output } };
}

function perAxis(layer: ConvLayer, shape: readonly number[]): number[] | string {
  const res: number[] = [];
  for (let a = 0; a < shape.length; a++) {
    const plan = windowAxis(shape[a]!, layer.kernel[a]!, layer.stride[a]!, layer.dilation[a]!, layer.padding, a);
    if (typeof plan === 'string') return plan;
    res.push(plan.out);
  }
  return res;
}

function convGroups(layer: ConvLayer, inWidth: number): { groups: number; channels: number } | string {
  if (layer.groups === 'depthwise') {
    const channels = layer.channels ?? inWidth * layer.depthMultiplier;
    if (channels % inWidth !== 0) return `a depthwise conv needs channels that are a multiple of its input width ${inWidth}, but has ${channels}`;
    return { groups: inWidth, channels };
  }
  const channels = layer.channels!;
  if (inWidth % layer.groups !== 0 || channels % layer.groups !== 0) {
    return `groups ${layer.groups} must divide both the input width ${inWidth} and the channels ${channels}`;
  }
  return { groups: layer.groups, channels };
}

function describeInputs(model: LayeredModel, layer: Layer): string {
  const names = layer.inputs.map((i) => (i === INPUT ? 'the input' : `layer ${layerLabel(model.layers[i]!)} (line ${model.layers[i]!.span.line})`));
  return ` (from ${names.join(' and ')})`;
}

/**
 * The analysed output: the single position when one is left; else the configured position, or
 * by default the last position of a causal model, position 0 of a model with a class token, and
 * the centre (⌊n/2⌋ per axis) otherwise (DEVELOPERS.md, "the analysed output's default").
 */
function outputPosition(model: LayeredModel, shape: readonly number[], shapes: readonly LayerShape[], reading: readonly (DenseReading | undefined)[]): ModelShapes['output'] | string {
  const given = model.output.position;
  if (given) {
    if (given.length !== shape.length) {
      return `output.position has ${given.length} entries, but the last layer's grid [${shape.join(', ')}] has ${shape.length} axes`;
    }
    const outside = given.findIndex((p, a) => p < 0 || p >= shape[a]!);
    if (outside >= 0) return `output.position [${given.join(', ')}] is outside the last layer's grid [${shape.join(', ')}]`;
    return { position: given, defaulted: false };
  }
  const single = positionCount(shape) === 1;
  if (single) return { position: shape.map(() => 0), defaulted: false };
  if (shape.length === 1 && isCausal(model, shapes, reading)) return { position: [shape[0]! - 1], defaulted: true };
  if (shape.length === 1 && model.layers.some((l) => l.kind === 'class-token')) return { position: [0], defaulted: true };
  return { position: shape.map((n) => Math.floor(n / 2)), defaulted: true };
}

/**
 * Every layer that can read another position than its own is causal, and there is one: a conv
 * with causal padding, a unidirectional recurrent layer, an attention layer with a causal mask.
 */
function isCausal(model: LayeredModel, shapes: readonly LayerShape[], reading: readonly (DenseReading | undefined)[]): boolean {
  let mixing = 0;
  for (const l of model.layers) {
    let causal: boolean;
    switch (l.kind) {
      case 'conv':
        if (l.kernel.every((k) => k === 1) && l.stride.every((s) => s === 1)) continue;
        causal = l.padding.mode === 'causal';
        break;
      case 'pool':
        if (!l.global && l.window.every((w) => w === 1) && l.stride.every((s) => s === 1)) continue;
        causal = false;
        break;
      case 'recurrent':
        causal = !l.bidirectional;
        break;
      case 'attention':
        causal = l.causal;
        break;
      case 'dense':
        if (reading[l.index] !== 'input') continue;
        causal = false;
        break;
      case 'conv-transpose':
      case 'upsample':
      case 'class-token':
        causal = false;
        break;
      case 'flatten':
        if (positionCount(l.inputs[0] === INPUT ? model.input.shape : shapes[l.inputs[0]!]!.shape) === 1) continue;
        causal = false;
        break;
      default:
        continue;
    }
    if (!causal) return false;
    mixing++;
  }
  return mixing > 0;
}
