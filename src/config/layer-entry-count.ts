/**
 * Refuses, before anything is read, a model whose YAML already lists more layer entries than can
 * ever expand to an allowed model. Entries are counted as leaves: an entry holding nested layer
 * lists (a repeat, a residual, branches) counts as what it holds, once, so the count never exceeds
 * the expanded size and no allowed model is refused. This keeps the reader's work bounded on huge
 * documents.
 */
import type { DiagnosticSink } from './diagnostic-sink.js';
import { MAX_EXPANDED_LAYERS } from './limits.js';
import { displayPath, fieldOf, type Located } from './located-value.js';
import { normaliseWord } from './pointwise-ops.js';

/** Keys whose value is a list of layers (or, for `paths`, a list of such lists) in any block. */
const LIST_KEYS = new Set(['layers', 'body', 'main', 'path', 'shortcut', 'projection', 'downsample', 'skip'].map(normaliseWord));
const PATHS_KEYS = new Set(['paths', 'branches'].map(normaliseWord));

export function checkLayerEntryCount(root: Located, sink: DiagnosticSink): boolean {
  if (root.kind !== 'map') return true;
  const layers = fieldOf(root, 'layers');
  if (layers?.kind !== 'seq') return true;
  const count = countList(layers);
  if (count <= MAX_EXPANDED_LAYERS) return true;
  sink.error(
    'config/too-many-layers',
    `${displayPath(layers)} lists ${count} layers (counting those inside blocks); at most ${MAX_EXPANDED_LAYERS} layers are allowed`,
    layers.span,
  );
  return false;
}

function countList(list: Located): number {
  if (list.kind !== 'seq') return 0;
  let n = 0;
  for (const item of list.items) n += countEntry(item);
  return n;
}

function countEntry(item: Located): number {
  if (item.kind !== 'map') return 1;
  const maps = [item, ...item.entries.map((e) => e.value).filter((v) => v.kind === 'map')];
  let nested = 0;
  let holds = false;
  for (const m of maps) {
    if (m.kind !== 'map') continue;
    for (const e of m.entries) {
      const key = normaliseWord(e.key);
      if (LIST_KEYS.has(key) && e.value.kind === 'seq') {
        holds = true;
        nested += countList(e.value);
      } else if (PATHS_KEYS.has(key) && e.value.kind === 'seq') {
        holds = true;
        for (const p of e.value.items) nested += p.kind === 'seq' ? countList(p) : countEntry(p);
      }
    }
  }
  return holds ? nested : 1;
}
