/**
 * What a pull request changed in an architecture: the normalised base and head models compared
 * field by field, each change carrying the span of the head's YAML, so that a failing check can
 * point at the line that shrank the capacity. Layers are aligned by a longest common subsequence
 * of their kinds over the topological layer list, so inserting or deleting a layer does not make
 * every later layer look changed. Fields are named as the YAML's canonical fields
 * (`depth_multiplier`, not the model's `depthMultiplier`).
 */
import type { Span } from '../diagnostic.js';
import type { Layer, LayeredModel, Model, Padding } from './model.js';
import { INPUT, layerLabel } from './model.js';
import { attributeToParameters } from './parameter-changes.js';

export interface FieldChange {
  /** Layer label in the head (`input`/`output` for their fields, `model` for model-wide ones). */
  readonly layer: number | string;
  /** Canonical field name, or `layer` for an added or removed layer. */
  readonly field: string;
  readonly from: string;
  readonly to: string;
  /** Where the change is in the head file (for a removed layer: the next layer, or the model). */
  readonly span: Span;
  /** The file `span` is in when it is not the config: the architecture definition (root-relative). */
  readonly file?: string;
  /**
   * For a parameter of an architecture definition whose value the head sets differently (`layer`
   * is `parameter`, `field` its name, `span` its line in the config, or the config's
   * `architecture` line when the head uses the default): what it changed in the layers.
   */
  readonly effects?: readonly LayerEffect[];
}

/** A change of one layer field that a parameter made. */
export interface LayerEffect {
  /** Head label; the base label of a removed layer. */
  readonly layer: number | string;
  readonly field: string;
  readonly from: string;
  readonly to: string;
}

/** Compared fields per kind: the model's property, and the YAML field reports name (and spans key). */
type Compared = readonly (readonly [property: string, field: string])[];
const same = (...names: string[]): [string, string][] => names.map((n) => [n, n]);

const FIELDS: Record<Layer['kind'], Compared> = {
  conv: [...same('channels', 'kernel', 'stride', 'dilation', 'padding', 'groups'), ['depthMultiplier', 'depth_multiplier']],
  'conv-transpose': [...same('channels', 'kernel', 'stride', 'dilation', 'padding'), ['outputPadding', 'output_padding'], ['groups', 'groups']],
  pool: same('mode', 'window', 'stride', 'padding', 'global'),
  dense: same('units'),
  flatten: [],
  upsample: same('factor', 'mode'),
  recurrent: same('hidden', 'depth', 'cell', 'bidirectional', 'merge', 'sequence'),
  embedding: same('dim'),
  position: same('mode'),
  'class-token': [],
  attention: [...same('heads'), ['headDim', 'head_dim'], ...same('causal', 'window')],
  pointwise: same('op'),
  merge: same('mode'),
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
  for (const name of ['shape', 'channels', 'representation', 'vocabulary'] as const) {
    field('input', name, base.input[name], head.input[name], head.input.fieldSpans[name] ?? head.input.span);
  }
  field('model', 'weight_sharing', base.weightSharing, head.weightSharing, head.span);
  field('output', 'position', base.output.position, head.output.position, head.output.span ?? head.span);
  for (const [b, h] of align(base, head)) {
    if (b && h) {
      for (const [property, name] of FIELDS[h.kind]) {
        field(layerLabel(h), name, (b as unknown as Record<string, unknown>)[property], (h as unknown as Record<string, unknown>)[property], h.fieldSpans[name] ?? h.span);
      }
      if (b.kind === 'merge' && h.kind === 'merge' && h.origin === 'skip') {
        field(layerLabel(h), 'from', skipSources(base, b), skipSources(head, h), h.fieldSpans['from'] ?? h.span);
      }
    } else if (h) {
      changes.push({ layer: layerLabel(h), field: 'layer', from: '(none)', to: h.kind, span: h.span });
    } else if (b) {
      const next = head.layers.find((l) => l.index >= b.index);
      changes.push({ layer: layerLabel(b), field: 'layer', from: b.kind, to: '(removed)', span: next?.span ?? head.span });
    }
  }
  return base.architecture || head.architecture ? attributeToParameters(base, head, changes) : changes;
}

function show(v: unknown): string {
  if (v === undefined) return '(none)';
  if (Array.isArray(v)) return `[${v.join(', ')}]`;
  if (v && typeof v === 'object' && 'mode' in v) {
    const p = v as Padding;
    return p.mode === 'explicit' ? `[${p.amount.join(', ')}]` : p.mode;
  }
  return String(v);
}

/** The labels of the earlier layers a skip merges with (its inputs after the current grid). */
function skipSources(model: LayeredModel, layer: Layer): string[] {
  return layer.inputs.slice(1).map((i) => (i === INPUT ? 'input' : String(layerLabel(model.layers[i]!))));
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
