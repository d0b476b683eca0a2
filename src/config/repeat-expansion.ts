/**
 * Flattens `repeat` blocks into the layer list the later stages read. The size of the result is
 * computed before anything is expanded, so `repeat: {times: 1000000000}` costs nothing and is
 * refused with a diagnostic at the `times` that caused it.
 */
import type { Span } from '../diagnostic.js';
import type { Layer } from './model.js';
import type { DiagnosticSink } from './diagnostic-sink.js';
import { MAX_EXPANDED_LAYERS } from './limits.js';
import { displayPath, fieldOf, type Located } from './located-value.js';

/** A layer before expansion: it gets its flattened index and repeat iteration when expanded. */
export type LayerTemplate =
  | { readonly kind: 'layer'; readonly make: (index: number, repeatIteration: number | undefined) => Layer }
  | {
      readonly kind: 'repeat';
      readonly times: number;
      readonly timesSpan: Span;
      readonly timesPath: string;
      readonly body: readonly LayerTemplate[];
    };

/** How many layers the templates expand to (may be a huge or infinite float; never expanded). */
export function expandedCount(templates: readonly LayerTemplate[]): number {
  let total = 0;
  for (const t of templates) total += t.kind === 'layer' ? 1 : t.times * expandedCount(t.body);
  return total;
}

/**
 * Expands the templates, or reports `config/too-many-layers` at the `times` of the top-level
 * repeat that contributes most (at `listSpan` when no repeat is involved).
 */
export function expandTemplates(
  templates: readonly LayerTemplate[],
  listPath: string,
  listSpan: Span,
  sink: DiagnosticSink,
): Layer[] | undefined {
  let total = 0;
  let culprit: { count: number; template: Extract<LayerTemplate, { kind: 'repeat' }> } | undefined;
  for (const t of templates) {
    const count = t.kind === 'layer' ? 1 : t.times * expandedCount(t.body);
    total += count;
    if (t.kind === 'repeat' && (!culprit || count > culprit.count)) culprit = { count, template: t };
  }
  if (total > MAX_EXPANDED_LAYERS) {
    const amount = Number.isSafeInteger(total) ? `${total} layers` : `more than ${Number.MAX_SAFE_INTEGER} layers`;
    if (culprit) {
      sink.error(
        'config/too-many-layers',
        `${culprit.template.timesPath} is ${culprit.template.times}, which makes the model expand to ${amount}; at most ${MAX_EXPANDED_LAYERS} layers are allowed after expanding repeat blocks`,
        culprit.template.timesSpan,
      );
    } else {
      sink.error('config/too-many-layers', `${listPath} has ${amount}; at most ${MAX_EXPANDED_LAYERS} are allowed`, listSpan);
    }
    return undefined;
  }
  const out: Layer[] = [];
  const expand = (list: readonly LayerTemplate[], iteration: number | undefined) => {
    for (const t of list) {
      if (t.kind === 'layer') out.push(t.make(out.length, iteration));
      else for (let i = 0; i < t.times; i++) expand(t.body, i);
    }
  };
  expand(templates, undefined);
  return out;
}

/**
 * Refuses, before validation, a model whose YAML already lists more layer entries than can ever
 * expand to an allowed model (each entry becomes at least one layer). This keeps the validator's
 * work bounded on huge documents.
 */
export function checkLayerEntryCount(root: Located, sink: DiagnosticSink): boolean {
  if (root.kind !== 'map') return true;
  const layers = fieldOf(root, 'layers');
  if (layers?.kind !== 'seq') return true;
  const count = countEntries(layers);
  if (count <= MAX_EXPANDED_LAYERS) return true;
  sink.error(
    'config/too-many-layers',
    `${displayPath(layers)} lists ${count} layers (counting those inside repeat blocks); at most ${MAX_EXPANDED_LAYERS} layers are allowed`,
    layers.span,
  );
  return false;
}

function countEntries(list: Located): number {
  if (list.kind !== 'seq') return 0;
  let n = 0;
  for (const item of list.items) {
    const body = item.kind === 'map' && item.entries.length === 1 && item.entries[0]!.key === 'repeat' ? item.entries[0]!.value : undefined;
    if (body?.kind === 'map') n += countEntries(fieldOf(body, 'layers') ?? body);
    else n += 1;
  }
  return n;
}
