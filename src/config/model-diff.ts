/**
 * What a pull request changed in an architecture: the normalised base and head models compared
 * field by field, each change carrying the span of the head's YAML, so that a failing check can
 * point at the line that shrank the capacity. Layers are aligned by a longest common subsequence
 * of their kinds, so inserting or deleting a layer does not make every later layer look changed.
 */
import type { Span } from '../diagnostic.js';
import type { Layer, LayeredModel, Model } from './model.js';
import { layerLabel } from './model.js';

export interface FieldChange {
  /** Layer label in the head (`input` for input fields, `model` for model-wide ones). */
  readonly layer: number | string;
  /** Canonical field name, or `layer` for an added or removed layer. */
  readonly field: string;
  readonly from: string;
  readonly to: string;
  /** Where the change is in the head file (for a removed layer: the next layer, or the model). */
  readonly span: Span;
}

const FIELDS: Record<Layer['kind'], readonly string[]> = {
  conv: ['channels', 'kernel', 'stride', 'padding'],
  pool: ['window', 'global'],
  dense: ['units'],
  recurrent: ['hidden', 'depth'],
};

export function diffModels(base: Model, head: Model): FieldChange[] {
  if (base.kind !== 'layered' || head.kind !== 'layered') {
    return base.kind === head.kind && JSON.stringify(stripSpans(base)) === JSON.stringify(stripSpans(head))
      ? []
      : [{ layer: 'model', field: 'network', from: base.kind, to: head.kind, span: head.span }];
  }
  const changes: FieldChange[] = [];
  const field = (layer: number | string, name: string, from: unknown, to: unknown, span: Span): void => {
    const a = show(from);
    const b = show(to);
    if (a !== b) changes.push({ layer, field: name, from: a, to: b, span });
  };
  field('input', 'shape', base.input.shape, head.input.shape, head.input.fieldSpans['shape'] ?? head.input.span);
  field('input', 'features', base.input.features, head.input.features, head.input.fieldSpans['features'] ?? head.input.span);
  field('model', 'weight_sharing', base.weightSharing, head.weightSharing, head.span);
  for (const [b, h] of align(base, head)) {
    if (b && h) {
      for (const name of FIELDS[h.kind]) {
        field(layerLabel(h), name, (b as unknown as Record<string, unknown>)[name], (h as unknown as Record<string, unknown>)[name], h.fieldSpans[name] ?? h.span);
      }
    } else if (h) {
      changes.push({ layer: layerLabel(h), field: 'layer', from: '(none)', to: h.kind, span: h.span });
    } else if (b) {
      const next = head.layers.find((l) => l.index >= b.index);
      changes.push({ layer: layerLabel(b), field: 'layer', from: b.kind, to: '(removed)', span: next?.span ?? head.span });
    }
  }
  return changes;
}

function show(v: unknown): string {
  return Array.isArray(v) ? `[${v.join(', ')}]` : String(v);
}

/** Pairs of aligned layers; a missing side is a layer added to or removed from the head. */
function align(base: LayeredModel, head: LayeredModel): [Layer | undefined, Layer | undefined][] {
  const a = base.layers;
  const b = head.layers;
  const n = a.length;
  const m = b.length;
  const lcs: number[][] = Array.from({ length: n + 1 }, () => new Array<number>(m + 1).fill(0));
  for (let i = n - 1; i >= 0; i--) {
    for (let j = m - 1; j >= 0; j--) {
      lcs[i]![j] = a[i]!.kind === b[j]!.kind ? lcs[i + 1]![j + 1]! + 1 : Math.max(lcs[i + 1]![j]!, lcs[i]![j + 1]!);
    }
  }
  const out: [Layer | undefined, Layer | undefined][] = [];
  let i = 0;
  let j = 0;
  while (i < n || j < m) {
    if (i < n && j < m && a[i]!.kind === b[j]!.kind && lcs[i]![j] === lcs[i + 1]![j + 1]! + 1) out.push([a[i++], b[j++]]);
    else if (j < m && (i >= n || lcs[i]![j + 1]! >= lcs[i + 1]![j]!)) out.push([undefined, b[j++]]);
    else out.push([a[i++], undefined]);
  }
  return out;
}

function stripSpans(value: unknown): unknown {
  if (Array.isArray(value)) return value.map(stripSpans);
  if (value && typeof value === 'object') {
    const out: Record<string, unknown> = {};
    for (const [k, v] of Object.entries(value)) if (k !== 'span' && k !== 'file') out[k] = stripSpans(v);
    return out;
  }
  return value;
}
