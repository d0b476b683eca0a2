/**
 * Builds the normalised `LayeredModel` from a (schema-checked) located tree: the input and output
 * specs, the layer list read into templates (every entry form, alias and block), the names and
 * `from:` references checked, and the templates expanded into the DAG of layers; then what needs
 * widths (stated sizes, an MLP ratio, an embedding's vocabulary) is resolved (`resolve-pending.ts`).
 * Shapes are inferred afterwards by the loader (`model-shapes.ts`), on the finished model.
 */
import type { LayeredModel } from './model.js';
import type { DiagnosticSink } from './diagnostic-sink.js';
import { displayPath, fieldOf, type LocatedMap } from './located-value.js';
import { asMap, booleanOf } from './located-read.js';
import type { ReadContext } from './field-readers.js';
import { readInput, readOutput } from './read-input.js';
import { readLayerList } from './read-layers.js';
import { checkNames } from './layer-names.js';
import { expandTemplates } from './expand-layers.js';
import { resolvePending } from './resolve-pending.js';

/** `paramsOf`: in an architecture definition, the parameters a value was computed from. */
export function buildLayeredModel(root: LocatedMap, file: string, sink: DiagnosticSink, paramsOf?: ReadContext['paramsOf']): LayeredModel | undefined {
  const inputNode = asMap(fieldOf(root, 'input'));
  const input = readInput(inputNode, sink, paramsOf);
  const output = readOutput(asMap(fieldOf(root, 'output')));
  const ws = fieldOf(root, 'weight_sharing');
  const weightSharing = ws === undefined ? true : booleanOf(ws);
  const shapeNode = inputNode ? fieldOf(inputNode, 'shape') : undefined;
  const ctx: ReadContext = {
    sink,
    dims: input?.shape.length,
    shapeText: input ? `[${input.shape.join(', ')}]` : '',
    shapePath: shapeNode ? displayPath(shapeNode) : 'the input shape',
    ...(paramsOf ? { paramsOf } : {}),
  };
  const layersNode = fieldOf(root, 'layers');
  const templates = layersNode ? readLayerList(layersNode, ctx) : undefined;
  const refs = templates && checkNames(templates, sink);
  if (!input || !output || weightSharing === undefined || !templates || !refs || !layersNode) return undefined;
  const expanded = expandTemplates(templates, refs, displayPath(layersNode), layersNode.span, sink);
  if (!expanded) return undefined;
  const model: LayeredModel = { kind: 'layered', file, input, weightSharing, layers: expanded.layers, output, span: root.span };
  return resolvePending(model, expanded.pending, sink);
}
