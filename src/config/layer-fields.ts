/**
 * Matches a layer's field entries against its kind's row of the field table: each key, compared
 * like kind names, becomes its canonical field; an unknown key is reported with "did you mean"
 * (over canonical names and aliases, shown as written in the table); a field given twice under
 * different spellings is reported at the later one. The values keep their YAML nodes, so messages
 * and spans point at what the user wrote.
 */
import type { Span } from '../diagnostic.js';
import { closest } from '../text/suggest.js';
import type { DiagnosticSink } from './diagnostic-sink.js';
import { displayPath, type Located, type LocatedEntry } from './located-value.js';
import type { FieldSpec } from './layer-vocabulary.js';
import { normaliseWord } from './pointwise-ops.js';

export class LayerFields {
  private readonly values = new Map<string, LocatedEntry>();
  /** Canonical fields that an unknown key was suggested as (a misspelt required field). */
  private readonly suggested = new Set<string>();
  /** False when a key was unknown, refused or given twice (already reported). */
  ok = true;

  constructor(
    /** The node messages name as the body. */
    readonly body: Located,
    entries: readonly LocatedEntry[],
    readonly specs: readonly FieldSpec[],
    sink: DiagnosticSink,
  ) {
    const bySpelling = new Map<string, FieldSpec>();
    for (const s of specs) for (const w of [s.name, ...(s.aliases ?? [])]) bySpelling.set(normaliseWord(w), s);
    const path = displayPath(body);
    for (const entry of entries) {
      const spec = bySpelling.get(normaliseWord(entry.key));
      if (!spec) {
        this.unknown(entry, path, sink);
        continue;
      }
      if (spec.refused) {
        sink.error('config/unsupported-field', `${path}.${entry.writtenKey}: ${spec.refused}`, entry.keySpan);
        this.ok = false;
        continue;
      }
      const earlier = this.values.get(spec.name);
      if (earlier) {
        sink.error(
          'config/alias-conflict',
          `${path} gives '${earlier.writtenKey}' and '${entry.writtenKey}', which both mean '${spec.name}'; keep only one of them`,
          entry.keySpan,
        );
        this.ok = false;
        continue;
      }
      this.values.set(spec.name, entry);
    }
  }

  private unknown(entry: LocatedEntry, path: string, sink: DiagnosticSink): void {
    this.ok = false;
    if (entry.key === '<<') {
      sink.error('config/unknown-field', `${path} uses a YAML merge key ('<<'), which is not supported; write the fields out, or alias the whole mapping`, entry.keySpan);
      return;
    }
    const spellings = this.specs.flatMap((s) => (s.refused ? [] : [s.name, ...(s.aliases ?? [])]));
    const guess = closest(normaliseWord(entry.key), spellings.map(normaliseWord));
    const said = guess ? spellings.find((s) => normaliseWord(s) === guess) : undefined;
    const meant = said ? this.specs.find((s) => s.name === said || s.aliases?.includes(said)) : undefined;
    if (meant) this.suggested.add(meant.name);
    const read = this.specs.filter((s) => !s.ignored && !s.refused).map((s) => s.name);
    sink.error(
      'config/unknown-field',
      `unknown field '${entry.writtenKey}' in ${path}${said ? ` (did you mean '${said}'?)` : ''}; it reads ${read.join(', ')}`,
      entry.keySpan,
    );
  }

  get(name: string): Located | undefined {
    return this.values.get(name)?.value;
  }

  has(name: string): boolean {
    return this.values.has(name);
  }

  /** An unknown key was reported with "did you mean" this field (so its absence is not reported again). */
  wasSuggested(name: string): boolean {
    return this.suggested.has(name);
  }

  /** The key as written, for messages. */
  written(name: string): string {
    return this.values.get(name)?.writtenKey ?? name;
  }

  keySpan(name: string): Span | undefined {
    return this.values.get(name)?.keySpan;
  }

  /** Per read field, what `of` says of its value; fields it says nothing of are left out. */
  provenance<T>(of: (node: Located) => readonly T[]): Record<string, readonly T[]> {
    const out: Record<string, readonly T[]> = {};
    for (const [name, entry] of this.values) {
      const found = of(entry.value);
      if (found.length > 0) out[name] = found;
    }
    return out;
  }

  /** Value spans of the given canonical fields that are present (all read fields when omitted). */
  spans(names?: readonly string[]): Record<string, Span> {
    const out: Record<string, Span> = {};
    for (const [name, entry] of this.values) {
      if (names && !names.includes(name)) continue;
      const spec = this.specs.find((s) => s.name === name);
      if (!spec?.ignored) out[name] = entry.value.span;
    }
    return out;
  }
}
