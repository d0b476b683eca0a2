/**
 * Builds the normalised `LayeredModel` from a (schema-checked) located tree: fills defaults,
 * broadcasts scalar kernels, strides and windows to one entry per input dimension, and runs the
 * checks that need more than one field at a time (per-dimension sizes against the input shape,
 * recurrent layers on 1D inputs). Each YAML layer is checked once, however often a `repeat`
 * expands it.
 */
import type { ConvLayer, DenseLayer, InputSpec, LayeredModel, PoolLayer, RecurrentLayer } from './model.js';
import type { DiagnosticSink } from './diagnostic-sink.js';
import { displayPath, fieldOf, pointerOf, type Located, type LocatedMap, type LocatedSeq } from './located-value.js';
import {
  asMap,
  booleanOf,
  fieldSpansOf,
  optionalName,
  positiveIntegerListOf,
  positiveIntegerOf,
  stringOf,
} from './located-read.js';
import { LAYER_FIELDS, isLayerKind, type LayerKindName } from './layer-vocabulary.js';
import { expandTemplates, type LayerTemplate } from './repeat-expansion.js';

interface Context {
  readonly sink: DiagnosticSink;
  /** Input dimensions (1 or 2), when the input shape is valid. */
  readonly dims: number | undefined;
  readonly shapeText: string;
  readonly shapePath: string;
}

export function buildLayeredModel(root: LocatedMap, file: string, sink: DiagnosticSink): LayeredModel | undefined {
  const input = readInput(asMap(fieldOf(root, 'input')));
  const ws = fieldOf(root, 'weight_sharing');
  const weightSharing = ws === undefined ? true : booleanOf(ws);
  const inputNode = fieldOf(root, 'input');
  const shapeNode = inputNode?.kind === 'map' ? fieldOf(inputNode, 'shape') : undefined;
  const ctx: Context = {
    sink,
    dims: input?.shape.length,
    shapeText: input ? `[${input.shape.join(', ')}]` : '',
    shapePath: shapeNode ? displayPath(shapeNode) : 'the input shape',
  };
  const layersNode = fieldOf(root, 'layers');
  const templates = layersNode?.kind === 'seq' ? readLayerList(layersNode, ctx) : undefined;
  if (!input || weightSharing === undefined || !templates || !layersNode) return undefined;
  const layers = expandTemplates(templates, displayPath(layersNode), layersNode.span, sink);
  if (!layers) return undefined;
  return { kind: 'layered', file, input, weightSharing, layers, span: root.span };
}

function readInput(node: LocatedMap | undefined): InputSpec | undefined {
  if (!node) return undefined;
  const shape = positiveIntegerListOf(fieldOf(node, 'shape'));
  const features = positiveIntegerOf(fieldOf(node, 'features'));
  if (!shape || shape.length < 1 || shape.length > 2 || features === undefined) return undefined;
  return { shape, features, span: node.span, fieldSpans: fieldSpansOf(node, ['shape', 'features']) };
}

function readLayerList(list: LocatedSeq, ctx: Context): LayerTemplate[] | undefined {
  let ok = list.items.length > 0;
  const out: LayerTemplate[] = [];
  for (const item of list.items) {
    const t = readLayer(item, ctx);
    if (t) out.push(t);
    else ok = false;
  }
  return ok ? out : undefined;
}

function readLayer(item: Located, ctx: Context): LayerTemplate | undefined {
  if (item.kind !== 'map' || item.entries.length !== 1) return undefined;
  const entry = item.entries[0]!;
  const body = asMap(entry.value);
  if (!isLayerKind(entry.key) || !body) return undefined;
  const kind: LayerKindName = entry.key;
  const name = optionalName(body);
  if (name === false) return undefined;
  if (kind === 'repeat') return readRepeat(body, ctx);
  const base = {
    path: pointerOf(item),
    span: item.span,
    fieldSpans: fieldSpansOf(body, LAYER_FIELDS.get(kind) ?? []),
    ...(name !== undefined ? { name } : {}),
  };
  const common = (index: number, repeatIteration: number | undefined) => ({
    index,
    ...base,
    ...(repeatIteration !== undefined ? { repeatIteration } : {}),
  });
  switch (kind) {
    case 'conv': {
      const channels = positiveIntegerOf(fieldOf(body, 'channels'));
      const kernel = perDimension(body, 'kernel', ctx);
      const stride = perDimension(body, 'stride', ctx);
      const paddingNode = fieldOf(body, 'padding');
      const padding = paddingNode === undefined ? 'same' : stringOf(paddingNode);
      if (channels === undefined || !kernel || !stride || (padding !== 'same' && padding !== 'valid')) return undefined;
      return { kind: 'layer', make: (i, r): ConvLayer => ({ kind: 'conv', ...common(i, r), channels, kernel, stride, padding }) };
    }
    case 'pool': {
      const globalNode = fieldOf(body, 'global');
      const global = globalNode === undefined ? false : booleanOf(globalNode);
      if (global === undefined) return undefined;
      if (global) {
        if (fieldOf(body, 'window')) return undefined;
        return { kind: 'layer', make: (i, r): PoolLayer => ({ kind: 'pool', ...common(i, r), window: [], global: true }) };
      }
      if (!fieldOf(body, 'window')) return undefined;
      const window = perDimension(body, 'window', ctx);
      if (!window) return undefined;
      return { kind: 'layer', make: (i, r): PoolLayer => ({ kind: 'pool', ...common(i, r), window, global: false }) };
    }
    case 'dense': {
      const units = positiveIntegerOf(fieldOf(body, 'units'));
      if (units === undefined) return undefined;
      return { kind: 'layer', make: (i, r): DenseLayer => ({ kind: 'dense', ...common(i, r), units }) };
    }
    case 'recurrent': {
      const hidden = positiveIntegerOf(fieldOf(body, 'hidden'));
      const depthNode = fieldOf(body, 'depth');
      const depth = depthNode === undefined ? 1 : positiveIntegerOf(depthNode);
      let ok = hidden !== undefined && depth !== undefined;
      if (ctx.dims !== undefined && ctx.dims !== 1) {
        ctx.sink.error(
          'config/recurrent-needs-1d',
          `${displayPath(item)} is a recurrent layer, which needs a 1D input ([length]), but ${ctx.shapePath} is ${ctx.shapeText}`,
          item.span,
        );
        ok = false;
      }
      if (!ok || hidden === undefined || depth === undefined) return undefined;
      return { kind: 'layer', make: (i, r): RecurrentLayer => ({ kind: 'recurrent', ...common(i, r), hidden, depth }) };
    }
  }
}

function readRepeat(body: LocatedMap, ctx: Context): LayerTemplate | undefined {
  const timesNode = fieldOf(body, 'times');
  const times = positiveIntegerOf(timesNode);
  const inner = fieldOf(body, 'layers');
  const templates = inner?.kind === 'seq' ? readLayerList(inner, ctx) : undefined;
  if (times === undefined || !timesNode || !templates) return undefined;
  return { kind: 'repeat', times, timesSpan: timesNode.span, timesPath: displayPath(timesNode), body: templates };
}

/**
 * A size given for every dimension (`3`) or per dimension (`[3, 3]`), as one entry per input
 * dimension. Absent means 1. A list whose length differs from the input's dimensions is an error.
 */
function perDimension(body: LocatedMap, field: string, ctx: Context): number[] | undefined {
  const node = fieldOf(body, field);
  if (ctx.dims === undefined) return undefined;
  if (node === undefined) return new Array<number>(ctx.dims).fill(1);
  const scalar = positiveIntegerOf(node);
  if (scalar !== undefined) return new Array<number>(ctx.dims).fill(scalar);
  const list = positiveIntegerListOf(node);
  // Lists of other lengths than 1 or 2 are already reported by the schema.
  if (!list || list.length < 1 || list.length > 2) return undefined;
  if (list.length !== ctx.dims) {
    const form = ctx.dims === 1 ? '[n]' : '[height, width]';
    ctx.sink.error(
      'config/dimension-mismatch',
      `${displayPath(node)} has ${list.length} entries, but ${ctx.shapePath} is ${ctx.shapeText} (${ctx.dims}D); give one integer for every dimension or ${form}`,
      node.span,
    );
    return undefined;
  }
  return list;
}
