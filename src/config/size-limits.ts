/**
 * Size checks done with arithmetic on the located tree, before anything is built or allocated
 * from the numbers a config states. A 100-byte config can ask for a billion input positions or a
 * width of 2^40; both are refused here, at the field that asked, in microseconds, instead of
 * after the partition masks or the network have been allocated. The walk is generic over the
 * layer vocabulary: every integer in the model is a size, a count or a position.
 */
import type { DiagnosticSink } from './diagnostic-sink.js';
import { MAX_INPUT_POSITIONS, MAX_MODEL_INTEGER } from './limits.js';
import { displayPath, fieldOf, type Located } from './located-value.js';

/** Reports every integer above MAX_MODEL_INTEGER and an input shape with too many positions. */
export function checkModelSizes(root: Located, sink: DiagnosticSink): void {
  walk(root, sink);
  if (root.kind !== 'map') return;
  for (const holder of ['input', 'network']) {
    const node = fieldOf(root, holder);
    const shape = node?.kind === 'map' ? fieldOf(node, 'shape') : undefined;
    if (shape?.kind !== 'seq') continue;
    let positions = 1;
    for (const item of shape.items) {
      if (item.kind !== 'scalar' || typeof item.value !== 'number' || !(item.value >= 1)) return;
      positions *= item.value;
    }
    if (positions > MAX_INPUT_POSITIONS) {
      const count = Number.isSafeInteger(positions) ? positions.toLocaleString('en-US') : `more than ${Number.MAX_SAFE_INTEGER.toLocaleString('en-US')}`;
      sink.error(
        'network/too-large',
        `${displayPath(shape)} has ${count} positions; rankfloor analyses inputs of at most ${MAX_INPUT_POSITIONS.toLocaleString('en-US')} positions (every position is a node of the tensor network)`,
        shape.span,
      );
    }
  }
}

function walk(node: Located, sink: DiagnosticSink): void {
  if (node.kind === 'scalar') {
    const v = node.value;
    if (typeof v === 'number' && v > MAX_MODEL_INTEGER) {
      sink.error(
        'config/number-too-large',
        `${displayPath(node)} is ${Number.isSafeInteger(v) ? v : String(v)}; rankfloor accepts sizes and counts up to ${MAX_MODEL_INTEGER} (2^31 − 1), far beyond any real architecture`,
        node.span,
      );
    }
    return;
  }
  if (node.kind === 'seq') for (const item of node.items) walk(item, sink);
  else for (const e of node.entries) walk(e.value, sink);
}
