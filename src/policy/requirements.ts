/**
 * The `require` list of one policy file: each entry names a partition and a minimum rank. Entries
 * are read here as they stand in their file (exact minimum, optional overrides, spans); which
 * `unproven` and `max_drop_bits` apply is settled only once the whole extends chain is merged,
 * because a parent's requirement follows the settings of the policy that inherits it.
 */
import type { Span } from '../diagnostic.js';
import type { DiagnosticSink } from '../config/diagnostic-sink.js';
import { displayPath, entryOf, fieldOf, type Located, type LocatedSeq } from '../config/located-value.js';
import { stringOf } from '../config/located-read.js';
import { BUILTIN_KINDS } from '../partition/partition.js';
import { closest } from '../text/suggest.js';
import { checkBuiltinSpec } from './builtin-partition-spec.js';
import { readMinBits, readMinRank } from './minimum-rank.js';
import { MAX_MINIMUM_BITS } from './policy-limits.js';
import type { UnprovenMode } from './policy.js';

const MINIMUM_FIELDS = ['min_rank', 'min_bits'];

/** A requirement before merging: its own overrides only. */
export interface DraftRequirement {
  /** Identifies "the same partition" for duplicates and overrides: a name, or a spec without spaces. */
  readonly key: string;
  readonly partition: string;
  readonly partitionSpan: Span;
  readonly minRank: bigint;
  readonly written: string;
  readonly unproven?: UnprovenMode;
  readonly maxDropBits?: number;
  readonly file: string;
  readonly span: Span;
}

/** Where a requirement names its partition; every entry with a partition string has one. */
export interface PartitionReference {
  readonly partition: string;
  readonly span: Span;
}

export interface RequirementList {
  /** The entries that are well formed. */
  readonly requirements: DraftRequirement[];
  /** The partition of every entry that names one, well formed or not, for the reference check. */
  readonly references: PartitionReference[];
}

/**
 * Reads the `require` list. `sourceOf` gives the text of a scalar as written, which keeps the
 * digits of integers beyond 2^53.
 */
export function readRequirements(
  list: LocatedSeq,
  file: string,
  sourceOf: (node: Located) => string | undefined,
  sink: DiagnosticSink,
): RequirementList {
  const requirements: DraftRequirement[] = [];
  const references: PartitionReference[] = [];
  const firstLineByKey = new Map<string, number>();
  for (const item of list.items) {
    if (item.kind !== 'map') continue;
    const partitionNode = fieldOf(item, 'partition');
    const partition = stringOf(partitionNode)?.trim();
    let ok = partition !== undefined && partition !== '' && partitionNode !== undefined;
    if (ok && partition !== undefined && partitionNode) {
      references.push({ partition, span: partitionNode.span });
      const key = partitionKey(partition);
      const earlier = firstLineByKey.get(key);
      if (earlier !== undefined) {
        sink.error(
          'policy/duplicate-requirement',
          `${displayPath(partitionNode)} requires '${partition}' again (first on line ${earlier}); keep one requirement per partition in a file`,
          partitionNode.span,
        );
        ok = false;
      } else {
        firstLineByKey.set(key, partitionNode.span.line);
      }
    }
    const rankEntry = entryOf(item, 'min_rank');
    const bitsEntry = entryOf(item, 'min_bits');
    if (rankEntry && bitsEntry) {
      const later = rankEntry.keySpan.offset > bitsEntry.keySpan.offset ? rankEntry : bitsEntry;
      sink.error(
        'policy/min-rank-or-bits',
        `${displayPath(item)} has both 'min_rank' and 'min_bits'; give the minimum once, as a rank (min_rank: 2^40) or in bits (min_bits: 40)`,
        later.keySpan,
      );
      ok = false;
    } else if (!rankEntry && !bitsEntry && !item.entries.some((e) => closest(e.key, MINIMUM_FIELDS) !== undefined)) {
      // A misspelt min_rank is reported as an unknown field that names it; "no minimum" would
      // only repeat that.
      sink.error(
        'policy/min-rank-or-bits',
        `${displayPath(item)} has no minimum; add 'min_rank' (e.g. min_rank: 64 or min_rank: 2^40) or 'min_bits' (e.g. min_bits: 12)`,
        item.span,
      );
      ok = false;
    }
    const minimum = rankEntry ? readRank(rankEntry.value, sourceOf, sink) : bitsEntry ? readBits(bitsEntry.value, sourceOf, sink) : undefined;
    const unprovenNode = fieldOf(item, 'unproven');
    const unproven = unprovenNode === undefined ? undefined : unprovenModeOf(unprovenNode);
    const dropNode = fieldOf(item, 'max_drop_bits');
    const maxDropBits = dropNode === undefined ? undefined : dropBitsOf(dropNode);
    if ((unprovenNode && !unproven) || (dropNode && maxDropBits === undefined)) ok = false;
    if (!ok || !minimum || partition === undefined || !partitionNode) continue;
    requirements.push({
      key: partitionKey(partition),
      partition,
      partitionSpan: partitionNode.span,
      minRank: minimum.minRank,
      written: minimum.written,
      ...(unproven !== undefined ? { unproven } : {}),
      ...(maxDropBits !== undefined ? { maxDropBits } : {}),
      file,
      span: item.span,
    });
  }
  return { requirements, references };
}

/**
 * Reports requirements whose partition is neither a named partition visible to their file (its
 * own or a parent's) nor a well-formed built-in spec. `named` includes names whose definition
 * has a problem of its own, so that one mistake is not reported again at every use.
 */
export function checkPartitionReferences(references: readonly PartitionReference[], named: ReadonlySet<string>, sink: DiagnosticSink): void {
  for (const r of references) {
    if (named.has(r.partition)) continue;
    const check = checkBuiltinSpec(r.partition);
    if (check.ok) continue;
    if (check.unknownKind) {
      const names = [...named.keys()];
      const guess = closest(check.kind, [...names, ...BUILTIN_KINDS]);
      const namedText = names.length > 0 ? `named partitions: ${names.join(', ')}; ` : '';
      sink.error(
        'policy/unknown-partition',
        `unknown partition '${r.partition}'${guess ? ` (did you mean '${guess}'?)` : ''}; ${namedText}built-in: ${BUILTIN_KINDS.join(', ')}`,
        r.span,
      );
    } else {
      sink.error('policy/invalid-partition-spec', check.message, r.span);
    }
  }
}

/** Names cannot contain ':' or spaces, so a name and a spec never share a key. */
function partitionKey(partition: string): string {
  return partition.replace(/\s+/g, '');
}

function readRank(node: Located, sourceOf: (node: Located) => string | undefined, sink: DiagnosticSink) {
  if (node.kind !== 'scalar' || (typeof node.value !== 'string' && typeof node.value !== 'number')) return undefined;
  // A float such as 64.5 is the schema's to report; only integers and strings are read here.
  if (typeof node.value === 'number' && !Number.isInteger(node.value)) return undefined;
  if (typeof node.value === 'number' && node.value < 1) return undefined;
  const read = readMinRank(node.value, sourceOf(node));
  if (!read.ok) {
    sink.error(read.code, `${displayPath(node)}: ${read.message}`, node.span);
    return undefined;
  }
  return read;
}

function readBits(node: Located, sourceOf: (node: Located) => string | undefined, sink: DiagnosticSink) {
  if (node.kind !== 'scalar' || typeof node.value !== 'number') return undefined;
  if (!Number.isFinite(node.value) || node.value < 0 || node.value > MAX_MINIMUM_BITS) return undefined;
  const read = readMinBits(node.value, sourceOf(node));
  if (!read.ok) {
    sink.error(read.code, `${displayPath(node)}: ${read.message}`, node.span);
    return undefined;
  }
  return read;
}

export function unprovenModeOf(node: Located | undefined): UnprovenMode | undefined {
  const s = stringOf(node);
  return s === 'warn' || s === 'fail' ? s : undefined;
}

export function dropBitsOf(node: Located | undefined): number | undefined {
  return node?.kind === 'scalar' && typeof node.value === 'number' && Number.isFinite(node.value) && node.value >= 0 ? node.value : undefined;
}
