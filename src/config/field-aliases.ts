/**
 * Renames the alias fields of the model-level mappings (`input.features`, `input.in_channels`, …)
 * to their canonical names before the schema sees the model. Only the key is renamed: the value
 * keeps its YAML node and the entry its written key, so spans and messages still point at what the
 * user wrote, and the builder can tell which spelling was used. Giving an alias together with its
 * canonical name (or two aliases of one field) is an error, reported at every spelling after the
 * first. Keys are compared like layer fields (case, `_` and `-` ignored: `inChannels`). Layer
 * fields have their own table (`layer-vocabulary.ts`).
 */
import type { DiagnosticSink } from './diagnostic-sink.js';
import { displayPath, fieldOf, type Located, type LocatedEntry, type LocatedMap } from './located-value.js';
import { normaliseWord } from './pointwise-ops.js';

/** Alias → canonical field of `model.input`. `features` is the data's channels, not M. */
export const INPUT_ALIASES: ReadonlyMap<string, string> = new Map([
  ['features', 'channels'],
  ['in_channels', 'channels'],
  ['num_channels', 'channels'],
  ['vocab_size', 'vocabulary'],
  ['vocabulary_size', 'vocabulary'],
  ['vocab', 'vocabulary'],
  ['num_tokens', 'vocabulary'],
  ['n_vocab', 'vocabulary'],
  ['ntoken', 'vocabulary'],
]);

const INPUT_FIELDS = ['shape', 'channels', 'representation', 'vocabulary'];

export function normaliseFieldAliases(root: Located, sink: DiagnosticSink): void {
  if (root.kind !== 'map') return;
  const input = fieldOf(root, 'input');
  if (input?.kind === 'map') normaliseBody(input, INPUT_FIELDS, INPUT_ALIASES, sink);
}

function normaliseBody(body: LocatedMap, fields: readonly string[], aliases: ReadonlyMap<string, string>, sink: DiagnosticSink): void {
  const bySpelling = new Map<string, string>();
  for (const f of fields) bySpelling.set(normaliseWord(f), f);
  for (const [alias, canonical] of aliases) bySpelling.set(normaliseWord(alias), canonical);
  const byCanonical = new Map<string, LocatedEntry[]>();
  for (const entry of body.entries) {
    const canonical = bySpelling.get(normaliseWord(entry.key)) ?? entry.key;
    const group = byCanonical.get(canonical) ?? [];
    group.push(entry);
    byCanonical.set(canonical, group);
  }
  const dropped = new Set<LocatedEntry>();
  for (const [canonical, group] of byCanonical) {
    const first = group[0];
    if (!first) continue;
    first.key = canonical;
    for (const extra of group.slice(1)) {
      dropped.add(extra);
      const spellings = group.map((e) => `'${e.writtenKey}'`);
      const listed = spellings.length === 2 ? `${spellings.join(' and ')}, which both mean` : `${spellings.join(', ')}, which all mean`;
      sink.error('config/alias-conflict', `${displayPath(body)} gives ${listed} '${canonical}'; keep only one of them`, extra.keySpan);
    }
  }
  if (dropped.size > 0) {
    const kept = body.entries.filter((e) => !dropped.has(e));
    body.entries.splice(0, body.entries.length, ...kept);
  }
}
