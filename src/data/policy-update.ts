/**
 * Writes minimums into a policy's text: a new policy, or an existing one edited in place with its
 * comments and layout kept (YAML document API). A minimum never lowers what the policy already
 * requires for that partition (its own requirement or an inherited one): a floor a team set is
 * lowered by hand, after review. Each minimum written carries a comment with its evidence.
 */
import { isMap, isScalar, isSeq, parseDocument, YAMLMap, YAMLSeq, type Document } from 'yaml';

export interface Minimum {
  /** A partition name from the policy or a built-in spec, as a requirement writes it. */
  readonly partition: string;
  readonly minRank: bigint;
  /** The evidence, one sentence per entry; wrapped into comment lines. */
  readonly evidence: readonly string[];
}

export type MinimumChange =
  | { readonly partition: string; readonly action: 'added'; readonly minRank: bigint }
  | { readonly partition: string; readonly action: 'raised'; readonly minRank: bigint; readonly previous: bigint }
  | { readonly partition: string; readonly action: 'kept'; readonly minRank: bigint; readonly previous: bigint };

export interface NewPolicy {
  readonly id: string;
  readonly description: string;
  /** Comment lines at the top of the file. */
  readonly header: readonly string[];
  /** Extra top-level settings, e.g. `surrogate`. */
  readonly settings?: Readonly<Record<string, string>>;
}

const COMMENT_WIDTH = 96;
const TO_STRING = { lineWidth: 0, flowCollectionPadding: false } as const;

/**
 * `existing`: the file's text and the minimum the loaded policy requires per partition (inherited
 * ones included; keys from `partitionKey`), or undefined to start `fresh`.
 */
export function writeMinimums(
  existing: { text: string; effective: ReadonlyMap<string, bigint> } | undefined,
  fresh: NewPolicy,
  minimums: readonly Minimum[],
): { text: string; changes: MinimumChange[] } {
  const doc = existing ? parseDocument(existing.text) : parseDocument(newPolicyText(fresh));
  const effective = existing?.effective ?? new Map<string, bigint>();
  const changes: MinimumChange[] = [];
  const present = doc.get('require', true);
  let seq: YAMLSeq | undefined = isSeq(present) ? present : undefined;
  const requireList = (): YAMLSeq => {
    if (!seq) {
      seq = new YAMLSeq();
      doc.set('require', seq);
    }
    seq.flow = false;
    return seq;
  };
  for (const m of minimums) {
    const previous = effective.get(partitionKey(m.partition));
    if (previous !== undefined && previous >= m.minRank) {
      changes.push({ partition: m.partition, action: 'kept', minRank: m.minRank, previous });
      continue;
    }
    const list = requireList();
    const index = list.items.findIndex((item) => isMap(item) && partitionKey(scalarText(item.get('partition', true)) ?? '') === partitionKey(m.partition));
    const comment = wrapComment(m.evidence);
    if (index >= 0) {
      const item = list.items[index] as YAMLMap;
      item.delete('min_bits');
      item.set('min_rank', rankValue(doc, m.minRank));
      // The first item's comment belongs to the sequence; the justification of the old value goes.
      if (index === 0) list.commentBefore = undefined;
      item.commentBefore = comment;
    } else {
      const item = doc.createNode({ partition: m.partition, min_rank: rankValue(doc, m.minRank) }) as YAMLMap;
      item.flow = true;
      item.commentBefore = comment;
      list.items.push(item);
    }
    changes.push(previous === undefined ? { partition: m.partition, action: 'added', minRank: m.minRank } : { partition: m.partition, action: 'raised', minRank: m.minRank, previous });
  }
  return { text: doc.toString(TO_STRING), changes };
}

function newPolicyText(p: NewPolicy): string {
  const lines = p.header.flatMap((h) => wrap(h, COMMENT_WIDTH - 2)).map((l) => `# ${l}`);
  lines.push(`id: ${p.id}`, `description: ${JSON.stringify(p.description)}`);
  for (const [key, value] of Object.entries(p.settings ?? {})) lines.push(`${key}: ${value}`);
  return lines.join('\n') + '\n';
}

/** Integers up to 2^53 as numbers; larger powers of two as `2^k`; other large ones as digit strings. */
function rankValue(doc: Document, rank: bigint): unknown {
  if (rank <= BigInt(Number.MAX_SAFE_INTEGER)) return Number(rank);
  const bits = rank.toString(2);
  const text = /^10*$/.test(bits) ? `2^${bits.length - 1}` : rank.toString();
  const node = doc.createNode(text);
  return node;
}

/** Two spellings of one partition (`block:0-4,0-8` and `block:0-4, 0-8`) are the same requirement. */
export function partitionKey(partition: string): string {
  return partition.replace(/\s+/g, '');
}

function scalarText(node: unknown): string | undefined {
  return isScalar(node) && typeof node.value === 'string' ? node.value : undefined;
}

/** The evidence as comment text for the YAML library (each line starts with a space after '#'). */
function wrapComment(sentences: readonly string[]): string {
  return wrap(sentences.join(' '), COMMENT_WIDTH - 4)
    .map((l) => ` ${l}`)
    .join('\n');
}

function wrap(text: string, width: number): string[] {
  const words = text.split(/\s+/).filter((w) => w !== '');
  const lines: string[] = [];
  let line = '';
  for (const w of words) {
    if (line !== '' && line.length + 1 + w.length > width) {
      lines.push(line);
      line = w;
    } else line = line === '' ? w : `${line} ${w}`;
  }
  if (line !== '') lines.push(line);
  return lines;
}
