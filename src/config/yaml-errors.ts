/**
 * Reports the parser's own errors (syntax, resource exhaustion, duplicate keys) as diagnostics at
 * their source positions. The parser words duplicate keys without naming them, so the duplicated
 * key and the line of its first occurrence are looked up in the document.
 */
import { isScalar, visit, type Document, type LineCounter } from 'yaml';
import type { DiagnosticSink } from './diagnostic-sink.js';
import { spanFromOffsets } from './source-span.js';

export function reportYamlErrors(doc: Document, lines: LineCounter, sink: DiagnosticSink): void {
  const duplicates = doc.errors.some((e) => e.code === 'DUPLICATE_KEY') ? duplicateKeys(doc, lines) : new Map<number, string>();
  for (const e of doc.errors) {
    const span = spanFromOffsets(lines, e.pos[0], e.pos[1]);
    if (e.code === 'DUPLICATE_KEY') {
      const detail = duplicates.get(e.pos[0]);
      sink.error('config/duplicate-key', detail ?? 'this key appears twice in one mapping; keep one', span);
    } else {
      sink.error('config/yaml', `invalid YAML: ${e.message}`, span);
    }
  }
}

/** Start offset of every repeated key → a message naming it and its first line. */
function duplicateKeys(doc: Document, lines: LineCounter): Map<number, string> {
  const out = new Map<number, string>();
  visit(doc, {
    Map(_, map) {
      const first = new Map<string, number>();
      for (const pair of map.items) {
        if (!isScalar(pair.key) || !pair.key.range) continue;
        const name = String(pair.key.value);
        const at = pair.key.range[0];
        const earlier = first.get(name);
        if (earlier === undefined) first.set(name, at);
        else out.set(at, `the key '${name}' appears twice in one mapping (first on line ${lines.linePos(earlier).line}); keep one`);
      }
    },
  });
  return out;
}
