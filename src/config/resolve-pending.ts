/**
 * What the layer reader could not settle before the layers were expanded and their widths known:
 * - an embedding's own vocabulary (`num_embeddings`): only an embedding that reads the input takes
 *   one; it gives the input its vocabulary when the input states none, and must agree when it does;
 * - sizes a config states beside the ones it is read by (`embed_dim` of an attention layer, the
 *   `max_len` of a position table, `value_dim`): checked against the layer's input;
 * - the MLP width of a transformer block given as a ratio (`mlp_ratio`), and the dense layer that
 *   maps back to the block's width: filled in from the input width.
 * Problems are reported at the field that states the size.
 */
import type { DiagnosticSink } from './diagnostic-sink.js';
import { INPUT, layerLabel, positionCount, type InputSpec, type Layer, type LayeredModel } from './model.js';
import { inferShapes, type AdjustProblem, type LayerShape } from './model-shapes.js';
import type { DeclaredSize, Pending, Stated } from './layer-templates.js';

export function resolvePending(model: LayeredModel, pending: ReadonlyMap<number, Pending>, sink: DiagnosticSink): LayeredModel | undefined {
  if (pending.size === 0) return model;
  const input = resolveVocabulary(model, pending, sink);
  if (!input) return undefined;
  const withInput: LayeredModel = { ...model, input };
  if (![...pending.values()].some((p) => p.declared || p.unitsPerWidth)) return withInput;
  const layers: Layer[] = [];
  const inputWidths: number[] = [];
  const shapes = inferShapes(withInput, (layer, shape) => {
    inputWidths.push(shape.width);
    const p = pending.get(layer.index);
    const out = p ? adjust(layer, shape, p, inputWidths) : layer;
    if (!('code' in out)) layers.push(out);
    return out;
  });
  if (!shapes.ok) {
    for (const d of shapes.diagnostics) sink.error(d.code, d.message, d.span);
    return undefined;
  }
  return { ...withInput, layers };
}

function resolveVocabulary(model: LayeredModel, pending: ReadonlyMap<number, Pending>, sink: DiagnosticSink): InputSpec | undefined {
  let input = model.input;
  let from: Stated | undefined;
  let ok = true;
  for (const [index, p] of pending) {
    const v = p.vocabulary;
    if (!v) continue;
    const layer = model.layers[index]!;
    if (layer.inputs[0] !== INPUT) {
      const reads = model.layers[layer.inputs[0]!]!;
      sink.error(
        'config/embedding-vocabulary',
        `${v.where} is given on layer ${layerLabel(layer)}, which reads layer ${layerLabel(reads)} (line ${reads.span.line}), not the input: only an embedding that reads the token input has one row per token`,
        v.span,
      );
      ok = false;
      continue;
    }
    const known = input.vocabulary;
    if (known === undefined) {
      for (const field of ['representation', 'channels'] as const) {
        if (input[field] === undefined) continue;
        sink.error(
          'config/conflicting-fields',
          `${v.where} makes the input a sequence of ${v.value} tokens, but model.input gives ${field === 'channels' ? 'channels' : 'a representation'} (line ${input.fieldSpans[field]?.line ?? input.span.line}): ${field === 'channels' ? 'a token position holds one token, not channels' : 'a token position supports exactly its V indicator functions, so M = V'}; drop it`,
          v.span,
        );
        ok = false;
      }
      input = { ...input, vocabulary: v.value, fieldSpans: { ...input.fieldSpans, vocabulary: v.span } };
      from = v;
    } else if (known !== v.value) {
      const said = from ? `${from.where} (line ${from.span.line})` : `model.input (line ${input.fieldSpans['vocabulary']?.line ?? input.span.line})`;
      sink.error('config/vocabulary-mismatch', `${v.where} is ${v.value}, but ${said} gives a vocabulary of ${known} tokens; a token embedding has one row per token, so they must agree`, v.span);
      ok = false;
    }
  }
  return ok ? input : undefined;
}

/** `inputWidths[i]`: the width layer i reads (known for this layer and every earlier one). */
function adjust(layer: Layer, shape: LayerShape, p: Pending, inputWidths: readonly number[]): Layer | AdjustProblem {
  for (const d of p.declared ?? []) {
    const problem = check(layer, shape, d);
    if (problem) return problem;
  }
  const factor = p.unitsPerWidth;
  if (!factor || layer.kind !== 'dense') return layer;
  const width = inputWidths[layer.index + factor.offset]!;
  const units = factor.value * width;
  if (!Number.isSafeInteger(units) || units < 1) {
    return {
      code: 'config/mlp-width',
      message: `${factor.where} is ${factor.value}, and ${factor.value} × the width ${width} is not a whole number of units; give the MLP's width instead (e.g. mlp: ${Math.max(1, Math.round(units))})`,
      span: factor.span,
    };
  }
  return { ...layer, units };
}

function check(layer: Layer, shape: LayerShape, d: DeclaredSize): AdjustProblem | undefined {
  const where = `layer ${layerLabel(layer)}`;
  switch (d.against) {
    case 'input-width':
      if (d.value === shape.width) return undefined;
      return { code: 'config/width-mismatch', message: `${d.where} is ${d.value}, but ${where} reads vectors of width ${shape.width}; it must equal the width of the layer's input`, span: d.span };
    case 'head-width': {
      if (layer.kind !== 'attention') return undefined;
      const a = layer.headDim ?? shape.width / layer.heads;
      if (d.value === a) return undefined;
      return { code: 'config/width-mismatch', message: `${d.where} is ${d.value}, but the heads of ${where} are ${a} wide (queries, keys and values have one head width here); drop it or make it equal`, span: d.span };
    }
    case 'positions': {
      const n = positionCount(shape.shape);
      if (d.value >= n) return undefined;
      return { code: 'config/too-few-positions', message: `${d.where} is ${d.value}, but ${where} reads ${n} positions; the table needs a vector for every position`, span: d.span };
    }
  }
}
