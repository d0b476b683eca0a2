/**
 * The smallest change that restores a failing requirement: for each width field on or next to the
 * minimal cut, the smallest value of that one field with which the requirement no longer fails,
 * found by search on the engine itself (so it is exact for the surrogate). Bounds never decrease
 * when a width grows, so a doubling probe followed by bisection finds the smallest value.
 */
import type { Layer, LayeredModel } from '../config/model.js';
import { INPUT, firstMaps, layerLabel } from '../config/model.js';
import type { Span } from '../diagnostic.js';
import type { Partition } from '../partition/partition.js';
import { analyseLayered } from '../cut/bounds.js';
import type { PartitionBounds, Surrogate } from '../cut/types.js';
import type { ParameterSpace } from '../config/parameter-space.js';
import { searchParameterFixes } from './parameter-fixes.js';
import { parameterCount } from './parameters.js';
import type { UnprovenMode } from './policy.js';

export interface Fix {
  /** Layer label (name or index); `parameter` for a parameter of an architecture definition. */
  readonly layer: number | string;
  /** Canonical field name: `channels`, `units`, `hidden`, `depth`; a parameter's name (`width`, `stages[1]`). */
  readonly field: string;
  readonly line: number;
  readonly column: number;
  /** The file the line is in when it is not the config: the architecture definition (root-relative). */
  readonly file?: string;
  /** A parameter the config does not set yet (it uses the default): the fix adds it; the line is the config's `architecture`. */
  readonly added?: true;
  readonly from: number;
  readonly to: number;
  readonly addedParameters: bigint;
  /** The requirement's verdict with the fix applied. */
  readonly verdict: 'pass' | 'unproven';
}

/** Whether bounds meet a minimum under a policy's handling of unproven requirements. */
export function restores(b: PartitionBounds, minRank: bigint, unproven: UnprovenMode): boolean {
  if (b.upper.rank < minRank) return false;
  return unproven === 'warn' || (b.lower !== null && b.lower.rank >= minRank);
}

interface Candidate {
  readonly layer: number | string;
  readonly field: string;
  readonly span: Span;
  readonly from: number;
  readonly max: number;
  readonly apply: (model: LayeredModel, value: number) => LayeredModel;
}

const MAX_WIDTH = 1 << 16;
const MAX_DEPTH = 64;

/**
 * For a model built from an architecture definition, the parameters are searched first (each
 * within its declared range, `parameter-fixes.ts`), then the layer fields of the definition; each
 * group cheapest first.
 */
export function searchFixes(
  model: LayeredModel,
  partition: Partition,
  minRank: bigint,
  unproven: UnprovenMode,
  surrogate: Surrogate,
  cutLayers: ReadonlySet<number | string>,
  parameters?: ParameterSpace,
): Fix[] {
  const judge = (m: LayeredModel): PartitionBounds | undefined => {
    const a = analyseLayered(m, { surrogate });
    if (!a.ok) return undefined;
    const b = a.bounds(partition);
    return 'diagnostic' in b ? undefined : b;
  };
  const near = nearLayers(model, cutLayers);
  const restoring = (m: LayeredModel): PartitionBounds | undefined => {
    const b = judge(m);
    return b && restores(b, minRank, unproven) ? b : undefined;
  };
  const byParameter = parameters ? searchParameterFixes(model, parameters, near, cutLayers.has('input'), restoring, minRank) : [];
  const baseParams = parameterCount(model);
  const fixes: Fix[] = [];
  const file = model.architecture ? { file: model.architecture.path } : {};
  for (const cand of candidates(model, near)) {
    const at = (v: number): PartitionBounds | undefined => judge(cand.apply(model, v));
    let lo = cand.from;
    let hi = Math.min(cand.max, Math.max(cand.from + 1, cand.from * 2));
    let found: PartitionBounds | undefined;
    for (;;) {
      const b = at(hi);
      if (b && restores(b, minRank, unproven)) {
        found = b;
        break;
      }
      if (hi >= cand.max) break;
      lo = hi;
      hi = Math.min(cand.max, hi * 2);
    }
    if (!found) continue;
    while (hi - lo > 1) {
      const mid = Math.floor((lo + hi) / 2);
      const b = at(mid);
      if (b && restores(b, minRank, unproven)) {
        hi = mid;
        found = b;
      } else lo = mid;
    }
    const fixed = cand.apply(model, hi);
    fixes.push({
      layer: cand.layer,
      field: cand.field,
      line: cand.span.line,
      column: cand.span.column,
      ...file,
      from: cand.from,
      to: hi,
      addedParameters: parameterCount(fixed) - baseParams,
      verdict: found.lower !== null && found.lower.rank >= minRank ? 'pass' : 'unproven',
    });
  }
  return [...cheapestFirst(byParameter), ...cheapestFirst(fixes)];
}

export function cheapestFirst(fixes: readonly Fix[]): Fix[] {
  return [...fixes].sort((a, b) => (a.addedParameters < b.addedParameters ? -1 : a.addedParameters > b.addedParameters ? 1 : a.line - b.line));
}

/** The layers the cut crosses and their neighbours in the layer graph (the layers they read and those that read them). */
export function nearLayers(model: LayeredModel, cutLayers: ReadonlySet<number | string>): Set<number> {
  const near = new Set<number>();
  const consumers: number[][] = model.layers.map(() => []);
  for (const l of model.layers) for (const i of l.inputs) if (i !== INPUT) consumers[i]!.push(l.index);
  for (const l of model.layers) {
    if (!cutLayers.has(layerLabel(l))) continue;
    near.add(l.index);
    for (const i of l.inputs) if (i !== INPUT) near.add(i);
    for (const c of consumers[l.index]!) near.add(c);
  }
  if (cutLayers.has('input') && model.input.representation === undefined) for (const l of firstMaps(model)) near.add(l.index);
  return near;
}

/**
 * Width fields of the layers the cut crosses and of their neighbours (`nearLayers`). When the
 * input legs are cut and M follows the first layer's width, that layer's width is a candidate;
 * the data's raw channels and an M set by the config are never proposed (they are not the
 * architecture's to change).
 */
function candidates(model: LayeredModel, near: ReadonlySet<number>): Candidate[] {
  const seen = new Set<string>();
  const out: Candidate[] = [];
  for (const i of [...near].sort((a, b) => a - b)) {
    const layer = model.layers[i]!;
    for (const field of widthFields(layer)) {
      // Layers expanded from one `repeat` entry share their YAML: a fix edits every copy.
      const key = `${layer.path}#${field}`;
      if (seen.has(key)) continue;
      seen.add(key);
      out.push({
        layer: layerLabel(layer),
        field,
        span: layer.fieldSpans[field] ?? layer.span,
        from: fieldValue(layer, field),
        max: field === 'depth' ? MAX_DEPTH : MAX_WIDTH,
        apply: (m, v) => ({ ...m, layers: m.layers.map((l) => (l.path === layer.path ? withField(l, field, v) : l)) }),
      });
    }
  }
  return out;
}

function widthFields(layer: Layer): string[] {
  switch (layer.kind) {
    case 'conv':
      return layer.channels === undefined ? [] : ['channels'];
    case 'conv-transpose':
      return ['channels'];
    case 'dense':
      return ['units'];
    case 'recurrent':
      return ['hidden', 'depth'];
    default:
      return [];
  }
}

function fieldValue(layer: Layer, field: string): number {
  return (layer as unknown as Record<string, number>)[field]!;
}

function withField(layer: Layer, field: string, value: number): Layer {
  return { ...layer, [field]: value } as Layer;
}
