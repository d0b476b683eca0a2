/**
 * The `partitions` section of a policy: a team names its own partitions (`organ-pair`,
 * `lesion-roi`) and builds each from a built-in kind. Each entry becomes the spec string that
 * `resolvePartition` reads, so that requirements can use a name and a built-in spec alike. The
 * schema has checked the field types; this checks what depends on several fields or on the
 * built-in vocabulary.
 */
import type { DiagnosticSink } from '../config/diagnostic-sink.js';
import { displayPath, entryOf, fieldOf, type Located, type LocatedMap } from '../config/located-value.js';
import { nonNegativeIntegerOf, stringOf } from '../config/located-read.js';
import { BUILTIN_KINDS } from '../partition/partition.js';
import { isBuiltinKind } from './builtin-partition-spec.js';
import type { NamedPartition } from './policy.js';

/** The spelling the schema allows for partition names and policy ids. */
export const NAME_PATTERN = /^[a-z0-9][a-z0-9._-]*$/;

const BODY_FIELDS = ['rows', 'cols', 'range', 'positions'] as const;

export function readNamedPartitions(node: LocatedMap, file: string, sink: DiagnosticSink): Map<string, NamedPartition> {
  const out = new Map<string, NamedPartition>();
  for (const entry of node.entries) {
    const name = entry.key;
    if (!NAME_PATTERN.test(name)) {
      sink.error(
        'policy/invalid-partition-name',
        `the partition name '${name}' in ${displayPath(node)} must be lower-case letters, digits, '.', '_' or '-', starting with a letter or digit`,
        entry.keySpan,
      );
      continue;
    }
    if (isBuiltinKind(name)) {
      sink.error(
        'policy/partition-shadows-builtin',
        `the partition name '${name}' is a built-in partition kind; a named partition may not shadow one (built-in: ${BUILTIN_KINDS.join(', ')}); choose another name`,
        entry.keySpan,
      );
      continue;
    }
    const spec = specOf(entry.value, sink);
    if (spec !== undefined) out.set(name, { name, spec, file, span: entry.keySpan });
  }
  return out;
}

/** The spec string of one body, or undefined (with a diagnostic unless the schema has one). */
function specOf(body: Located, sink: DiagnosticSink): string | undefined {
  if (body.kind !== 'map') return undefined;
  const kind = stringOf(fieldOf(body, 'kind'));
  if (kind === undefined || !isBuiltinKind(kind)) return undefined;
  const path = displayPath(body);
  const present = BODY_FIELDS.filter((f) => entryOf(body, f) !== undefined);
  const misplaced = (allowed: readonly string[], why: string): boolean => {
    let bad = false;
    for (const f of present) {
      if (allowed.includes(f)) continue;
      sink.error('policy/invalid-partition', `${path} has '${f}', but ${why}`, entryOf(body, f)!.keySpan);
      bad = true;
    }
    return bad;
  };
  switch (kind) {
    case 'block': {
      if (misplaced(['rows', 'cols', 'range'], `a block takes 'rows' and 'cols' (2D) or 'range' (1D)`)) return undefined;
      const has = (f: string) => present.includes(f as (typeof BODY_FIELDS)[number]);
      const twoD = has('rows') && has('cols') && !has('range');
      const oneD = has('range') && !has('rows') && !has('cols');
      if (!twoD && !oneD) {
        sink.error(
          'policy/invalid-partition',
          `${path} is a block, which needs 'rows' and 'cols' (2D, e.g. {kind: block, rows: [8, 24], cols: [8, 24]}) or 'range' (1D, e.g. {kind: block, range: [0, 16]}), not ${present.length === 0 ? 'none of them' : present.map((f) => `'${f}'`).join(' and ')}`,
          body.span,
        );
        return undefined;
      }
      const ranges = (twoD ? ['rows', 'cols'] : ['range']).map((f) => rangeOf(fieldOf(body, f), sink));
      if (ranges.some((r) => r === undefined)) return undefined;
      return `block:${ranges.map((r) => `${r![0]}-${r![1]}`).join(',')}`;
    }
    case 'positions': {
      if (misplaced(['positions'], `the positions kind takes only 'positions'`)) return undefined;
      const list = fieldOf(body, 'positions');
      if (!list) {
        sink.error('policy/invalid-partition', `${path} needs 'positions', the list of side-A positions, e.g. {kind: positions, positions: [0, 5, 9]}`, body.span);
        return undefined;
      }
      if (list.kind !== 'seq' || list.items.length === 0) return undefined;
      const values = list.items.map(nonNegativeIntegerOf);
      if (values.some((v) => v === undefined)) return undefined;
      return `positions:${values.join(',')}`;
    }
    default:
      if (misplaced([], `the kind '${kind}' takes no fields besides 'kind'`)) return undefined;
      return kind;
  }
}

/** A half-open [start, end) with start < end; the schema has checked it is two integers ≥ 0. */
function rangeOf(node: Located | undefined, sink: DiagnosticSink): readonly [number, number] | undefined {
  if (node?.kind !== 'seq' || node.items.length !== 2) return undefined;
  const start = nonNegativeIntegerOf(node.items[0]);
  const end = nonNegativeIntegerOf(node.items[1]);
  if (start === undefined || end === undefined) return undefined;
  if (start >= end) {
    sink.error('policy/invalid-partition', `${displayPath(node)} is [${start}, ${end}], an empty range; half-open ranges need start < end`, node.span);
    return undefined;
  }
  return [start, end];
}
