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
import { MAX_PROBES } from '../cut/probe/certified-probe.js';
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
  /** With `pass`: the rule whose lower bound then proves it. */
  readonly rule?: string;
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
 * group cheapest first. For each candidate, the smallest value with which the requirement no
 * longer fails: the upper bound reaches `minRank`, and with `unproven: fail` a lower bound does
 * too. Bounds never decrease when a width grows, so a doubling probe followed by bisection finds
 * it. The search over layer fields first finds where the upper bound reaches the minimum with the
 * certified probe off (its lower bound cannot matter there), and only then asks for lower bounds,
 * from that value on.
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
  // The certified probe never proves more than MAX_PROBES: above that it cannot help a fix.
  const probing = minRank <= BigInt(MAX_PROBES);
  const judge = (m: LayeredModel, probe: boolean): PartitionBounds | undefined => {
    const a = analyseLayered(m, { surrogate, ...(probe && probing ? {} : { probeBudget: 0 }) });
    if (!a.ok) return undefined;
    const b = a.bounds(partition, probe && probing ? minRank : null);
    return 'diagnostic' in b ? undefined : b;
  };
  const near = nearLayers(model, cutLayers);
  const restoring = (m: LayeredModel): PartitionBounds | undefined => {
    const b = judge(m, true);
    return b && restores(b, minRank, unproven) ? b : undefined;
  };
  const byParameter = parameters ? searchParameterFixes(model, parameters, near, cutLayers.has('input'), restoring, minRank) : [];
  const baseParams = parameterCount(model);
  const fixes: Fix[] = [];
  const file = model.architecture ? { file: model.architecture.path } : {};
  for (const cand of candidates(model, near)) {
    const reaches = (v: number): boolean => {
      const b = judge(cand.apply(model, v), false);
      return b !== undefined && b.upper.rank >= minRank;
    };
    // An unproven requirement may have its ceiling already: then only the proof is missing.
    const ceiling = reaches(cand.from) ? cand.from : smallest(cand.from, cand.max, reaches);
    if (ceiling === undefined) continue;
    let to = ceiling;
    let found = judge(cand.apply(model, to), true);
    if (unproven === 'fail' && !(found && restores(found, minRank, 'fail'))) {
      const proven = smallest(ceiling, cand.max, (v) => {
        const b = judge(cand.apply(model, v), true);
        return b !== undefined && restores(b, minRank, 'fail');
      });
      if (proven === undefined) continue;
      to = proven;
      found = judge(cand.apply(model, to), true);
    }
    if (!found || to === cand.from) continue;
    const fixed = cand.apply(model, to);
    const pass = found.lower !== null && found.lower.rank >= minRank;
    fixes.push({
      layer: cand.layer,
      field: cand.field,
      line: cand.span.line,
      column: cand.span.column,
      ...file,
      from: cand.from,
      to,
      addedParameters: parameterCount(fixed) - baseParams,
      verdict: pass ? 'pass' : 'unproven',
      ...(pass ? { rule: found.lower!.method } : {}),
    });
  }
  return [...cheapestFirst(byParameter), ...cheapestFirst(fixes)];
}

export function cheapestFirst(fixes: readonly Fix[]): Fix[] {
  return [...fixes].sort((a, b) => (a.addedParameters < b.addedParameters ? -1 : a.addedParameters > b.addedParameters ? 1 : a.line - b.line));
}

/**
 * The smallest v in (from, max] with ok(v), for ok monotone in v (false at `from`): doubling, then
 * bisection. Undefined when even `max` fails.
 */
function smallest(from: number, max: number, ok: (v: number) => boolean): number | undefined {
  let lo = from;
  let hi = Math.min(max, Math.max(from + 1, from * 2));
  for (;;) {
    if (ok(hi)) break;
    if (hi >= max) return undefined;
    lo = hi;
    hi = Math.min(max, hi * 2);
  }
  while (hi - lo > 1) {
    const mid = Math.floor((lo + hi) / 2);
    if (ok(mid)) hi = mid;
    else lo = mid;
  }
  return hi;
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
