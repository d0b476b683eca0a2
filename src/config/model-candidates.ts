/**
 * Where the architecture probably sits in a file whose model path did not resolve: the mappings
 * that hold `input` and `layers` (or name an `architecture` definition), or a `network` with `tensors`, as JSON pointers, so that the hint can name the exact
 * `--model-path` to pass instead of a made-up example. The search is breadth-first over the
 * parsed document (aliases are not followed) and bounded, so a huge document costs little.
 */
import { isMap, isScalar, isSeq, type Document } from 'yaml';
import { formatPointer } from './json-pointer.js';
import type { PathSegment } from './field-path.js';

const MAX_VISITED = 5000;
const MAX_CANDIDATES = 3;

export function modelCandidates(doc: Document): string[] {
  const found: string[] = [];
  const queue: { node: unknown; path: PathSegment[] }[] = [{ node: doc.contents, path: [] }];
  for (let visited = 0; queue.length > 0 && visited < MAX_VISITED && found.length < MAX_CANDIDATES; visited++) {
    const { node, path } = queue.shift()!;
    if (isMap(node)) {
      const keys = node.items.map((p) => (isScalar(p.key) ? String(p.key.value) : undefined));
      const network = node.items[keys.indexOf('network')]?.value;
      const layered = (keys.includes('input') && keys.includes('layers')) || keys.includes('architecture');
      if (layered || (isMap(network) && network.items.some((p) => isScalar(p.key) && p.key.value === 'tensors'))) {
        found.push(formatPointer(path));
        continue;
      }
      node.items.forEach((p, i) => {
        if (keys[i] !== undefined) queue.push({ node: p.value, path: [...path, keys[i]!] });
      });
    } else if (isSeq(node)) {
      node.items.forEach((item, i) => queue.push({ node: item, path: [...path, i] }));
    }
  }
  return found;
}
