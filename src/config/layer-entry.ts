/**
 * The forms a layer entry takes in a YAML list, reduced to one: a kind, where the kind is
 * written, and the field entries. Accepted:
 *
 *   - conv: {channels: 32, kernel: 3}           the kind as the single key (canonical)
 *   - {type: Conv2d, out_channels: 32}           a kind key: `type`, `layer` or `kind`
 *   - relu                                       a bare kind name
 *   - relu: {}  /  - relu: null                  a kind without fields
 *   - activation: relu  /  - dropout: 0.1        a scalar body (see `scalar`)
 */
import type { Span } from '../diagnostic.js';
import type { DiagnosticSink } from './diagnostic-sink.js';
import { displayPath, type Located, type LocatedEntry, type LocatedScalar } from './located-value.js';
import { lookupKind, type KindMatch } from './kind-names.js';
import { normaliseWord } from './pointwise-ops.js';

export interface LayerEntry {
  /** The list item. */
  readonly item: Located;
  readonly match: KindMatch;
  /** The kind as written (`Conv2d`). */
  readonly kindWritten: string;
  readonly kindSpan: Span;
  /** The node messages name as the layer's body: `model.layers[0].conv`, or the item itself. */
  readonly body: Located;
  /** The fields (the kind key of the `type:` form left out). */
  readonly fields: readonly LocatedEntry[];
  /** A scalar written as the whole body (`- activation: relu`). */
  readonly scalar?: LocatedScalar;
}

const KIND_KEYS = new Set(['type', 'layer', 'kind']);

const FORMS = "write a layer as '- conv: {channels: 64}', '- {type: Conv2d, out_channels: 64}' or '- relu'";

export function readLayerEntry(item: Located, sink: DiagnosticSink): LayerEntry | undefined {
  const path = displayPath(item);
  if (item.kind === 'scalar') {
    if (typeof item.value !== 'string' || item.value.length === 0) {
      sink.error('config/type', `${path} must be a layer, got ${item.value === null ? 'an empty entry' : String(item.value)}; ${FORMS}`, item.span);
      return undefined;
    }
    return withKind(item, item.value, item.span, item, [], undefined, sink);
  }
  if (item.kind === 'seq') {
    sink.error('config/type', `${path} must be a layer, got a list; ${FORMS}`, item.span);
    return undefined;
  }
  const kindKeys = item.entries.filter((e) => KIND_KEYS.has(normaliseWord(e.key)));
  if (kindKeys.length > 1) {
    sink.error('config/layer-kind', `${path} gives its kind ${kindKeys.length} times (${kindKeys.map((e) => `'${e.writtenKey}'`).join(', ')}); keep one`, kindKeys[1]!.keySpan);
    return undefined;
  }
  if (kindKeys.length === 1) {
    const key = kindKeys[0]!;
    const v = key.value;
    if (v.kind !== 'scalar' || typeof v.value !== 'string' || v.value.length === 0) {
      sink.error('config/type', `${displayPath(v)} must be a layer kind such as 'Conv2d' or 'relu', got ${v.kind === 'scalar' ? String(v.value) : `a ${v.kind === 'map' ? 'mapping' : 'list'}`}`, v.span);
      return undefined;
    }
    return withKind(item, v.value, v.span, item, item.entries.filter((e) => e !== key), undefined, sink);
  }
  if (item.entries.length === 0) {
    sink.error('config/layer-kind', `${path} is an empty mapping; ${FORMS}`, item.span);
    return undefined;
  }
  if (item.entries.length > 1) {
    const kinds = item.entries.filter((e) => lookupKind(e.key).ok);
    const keys = item.entries.map((e) => `'${e.writtenKey}'`).join(', ');
    if (kinds.length > 1) {
      sink.error('config/layer-kind', `${path} has ${kinds.length} kinds (${keys}); one entry is one layer: put each kind in its own '- ' entry`, item.span);
    } else if (kinds.length === 1) {
      const stray = item.entries.find((e) => e !== kinds[0])!;
      sink.error(
        'config/layer-kind',
        `${path} has '${stray.writtenKey}' beside its kind '${kinds[0]!.writtenKey}'; fields go inside the kind ('- ${kinds[0]!.writtenKey}: {${stray.writtenKey}: …}') or name the kind with 'type: ${kinds[0]!.writtenKey}'`,
        stray.keySpan,
      );
    } else {
      sink.error('config/layer-kind', `${path} (${keys}) names no layer kind; give it with 'type', e.g. '- {type: conv, channels: 64}'`, item.span);
    }
    return undefined;
  }
  const only = item.entries[0]!;
  const v = only.value;
  if (v.kind === 'seq') {
    sink.error('config/type', `${displayPath(v)} must be a mapping of the layer's fields, got a list`, v.span);
    return undefined;
  }
  if (v.kind === 'map') return withKind(item, only.key, only.keySpan, v, v.entries, undefined, sink);
  return withKind(item, only.key, only.keySpan, v, [], v.value === null ? undefined : v, sink);
}

function withKind(
  item: Located,
  written: string,
  kindSpan: Span,
  body: Located,
  fields: readonly LocatedEntry[],
  scalar: LocatedScalar | undefined,
  sink: DiagnosticSink,
): LayerEntry | undefined {
  const found = lookupKind(written);
  if (!found.ok) {
    sink.error(found.code, `${displayPath(item)}: ${found.message}`, kindSpan);
    return undefined;
  }
  return { item, match: found.match, kindWritten: written, kindSpan, body, fields, ...(scalar ? { scalar } : {}) };
}
