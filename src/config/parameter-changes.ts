/**
 * What a pull request changed in a config built from an architecture definition, said where the
 * reviewer must look. The layer fields the model diff finds changed are traced back through
 * their provenance (`Layer.fieldParams`): a field computed from a parameter whose value the head
 * sets differently is an effect of that parameter, reported once, at the parameter's line in the
 * config (`width: 0.5`), with the layers it changed. A change no parameter explains came from
 * the definition itself and stays at its line there (`file` names the definition). A config that
 * switched to another definition (or between a definition and a list of layers) reports that
 * switch at its `architecture` line, with every layer change as its effect.
 */
import type { FieldChange, LayerEffect } from './model-diff.js';
import { layerLabel, type FieldParameters, type Layer, type LayeredModel } from './model.js';

const LISTED = '(layers listed in the config)';

export function attributeToParameters(base: LayeredModel, head: LayeredModel, changes: readonly FieldChange[]): FieldChange[] {
  const from = base.architecture;
  const to = head.architecture;
  if (!to) {
    // Back to a list of layers: the layer changes are in the config already.
    return [{ layer: 'model', field: 'architecture', from: from!.path, to: LISTED, span: head.span }, ...changes];
  }
  if (!from || from.path !== to.path) {
    return [{ layer: 'model', field: 'architecture', from: from?.path ?? LISTED, to: to.path, span: to.span, effects: changes.map(effectOf) }];
  }
  const before = new Map(from.parameters.map((p) => [p.name, p.value]));
  const changed = to.parameters.filter((p) => before.get(p.name) !== p.value);
  const names = new Set(changed.map((p) => p.name));
  const effects = new Map<string, LayerEffect[]>(changed.map((p) => [p.name, []]));
  const headLayers = byLabel(head);
  const baseLayers = byLabel(base);
  const left: FieldChange[] = [];
  for (const c of changes) {
    const fed = provenance(c, head, headLayers, baseLayers).filter((n) => names.has(n));
    if (fed.length === 0) left.push({ ...c, file: to.path });
    else for (const n of fed) effects.get(n)!.push(effectOf(c));
  }
  const parameters: FieldChange[] = changed.map((p) => ({
    layer: 'parameter',
    field: p.name,
    from: before.get(p.name) ?? '(none)',
    to: p.value,
    span: p.span ?? to.span,
    effects: effects.get(p.name)!,
  }));
  return [...parameters, ...left];
}

function effectOf(c: FieldChange): LayerEffect {
  return { layer: c.layer, field: c.field, from: c.from, to: c.to };
}

function byLabel(model: LayeredModel): Map<string, Layer> {
  return new Map(model.layers.map((l) => [String(layerLabel(l)), l]));
}

/** The parameters a changed field was computed from (on the side where it exists). */
function provenance(c: FieldChange, head: LayeredModel, headLayers: Map<string, Layer>, baseLayers: Map<string, Layer>): string[] {
  const names = (params: FieldParameters | undefined, field: string): string[] => (params?.[field] ?? []).map((u) => u.name);
  if (c.layer === 'input') return names(head.input.fieldParams, c.field);
  if (c.field === 'layer') {
    // An added layer exists in the head, a removed one only in the base.
    const layer = c.to === '(removed)' ? baseLayers.get(String(c.layer)) : headLayers.get(String(c.layer));
    return names(layer?.fieldParams, 'layer');
  }
  return names(headLayers.get(String(c.layer))?.fieldParams, c.field);
}
