/**
 * Finds the architecture inside a larger config (a training file also holds optimizer, data and
 * schedule settings) by following the model path over the parsed YAML. When the path does not
 * resolve, the diagnostic points at the deepest node that does exist and lists what is there.
 */
import { isAlias, isMap, isScalar, isSeq, type Document, type LineCounter } from 'yaml';
import { AnchorIndex } from './anchor-index.js';
import type { Span } from '../diagnostic.js';
import { closest } from '../text/suggest.js';
import type { DiagnosticSink } from './diagnostic-sink.js';
import { formatFieldPath, type PathSegment } from './field-path.js';
import { formatPointer, isArrayIndex } from './json-pointer.js';
import { modelCandidates } from './model-candidates.js';
import { spanFromOffsets, spanOfRange } from './source-span.js';

export interface ResolvedModelNode {
  /** The YAML node at the path (possibly an alias; the converter resolves it). */
  readonly node: unknown;
  /** The path as map keys and sequence indices. */
  readonly segments: readonly PathSegment[];
  /** Where to point when the node itself has no range (an empty value). */
  readonly fallback: Span;
}

export function resolveModelNode(
  doc: Document,
  lines: LineCounter,
  sink: DiagnosticSink,
  pointer: string,
  segments: readonly string[],
): ResolvedModelNode | undefined {
  const anchors = new AnchorIndex(doc);
  const docSpan = spanFromOffsets(lines, 0, 0);
  let cur: unknown = doc.contents;
  let curSpan = spanOfRange(lines, rangeOf(cur)) ?? docSpan;
  const walked: PathSegment[] = [];
  const fail = (detail: string, hintKeys: readonly string[]) => {
    const where = walked.length === 0 ? 'the document' : formatFieldPath(walked);
    const keys = hintKeys.length > 0 ? ` (it has ${hintKeys.slice(0, 8).map((k) => `'${k}'`).join(', ')}${hintKeys.length > 8 ? ', …' : ''})` : '';
    sink.error('config/model-missing', `the model path '${pointer}' does not resolve: ${where} ${detail}${keys}; ${pathHint(doc, walked, hintKeys)}`, curSpan);
    return undefined;
  };
  for (let i = 0; i < segments.length; i++) {
    const seg = segments[i]!;
    // A path step through an alias follows it (an alias never points at another alias).
    if (isAlias(cur)) cur = anchors.resolve(cur);
    if (isMap(cur)) {
      const keys: string[] = [];
      let found: { value: unknown; keyRange: [number, number, number] | undefined } | undefined;
      for (const pair of cur.items) {
        const k = isScalar(pair.key) ? pair.key.value : undefined;
        if (k === undefined || (k !== null && typeof k === 'object')) continue;
        keys.push(String(k));
        if (String(k) === seg) found = { value: pair.value, keyRange: rangeOf(pair.key) };
      }
      if (!found) {
        const guess = closest(seg, keys);
        return fail(`has no key '${seg}'${guess ? ` (did you mean '${guess}'?)` : ''}`, guess ? [] : keys);
      }
      walked.push(seg);
      const keySpan = spanOfRange(lines, found.keyRange) ?? curSpan;
      cur = found.value;
      curSpan = spanOfRange(lines, rangeOf(cur)) ?? spanFromOffsets(lines, keySpan.endOffset, keySpan.endOffset);
    } else if (isSeq(cur)) {
      if (!isArrayIndex(seg) || Number(seg) >= cur.items.length) {
        return fail(`is a list of ${cur.items.length} entries, so '${seg}' is not one of its indices`, []);
      }
      walked.push(Number(seg));
      cur = cur.items[Number(seg)];
      curSpan = spanOfRange(lines, rangeOf(cur)) ?? curSpan;
    } else {
      return fail(cur === null || cur === undefined || (isScalar(cur) && cur.value === null) ? `is empty, so it has no '${seg}'` : `is a single value, so it has no '${seg}'`, []);
    }
  }
  if (cur === null || cur === undefined) {
    if (segments.length === 0) {
      sink.error('config/model-missing', `the document is empty; expected the model architecture at '${pointer || '/'}' (see --model-path)`, docSpan);
      return undefined;
    }
  }
  return { node: cur, segments: walked, fallback: curSpan };
}

function rangeOf(node: unknown): [number, number, number] | undefined {
  if (node && typeof node === 'object' && 'range' in node) {
    const r = (node as { range?: unknown }).range;
    if (Array.isArray(r) && r.length === 3) return r as [number, number, number];
  }
  return undefined;
}

/**
 * What to pass instead: the mappings of this file that look like an architecture, else a pointer
 * through the keys the deepest resolved mapping has.
 */
function pathHint(doc: Document, walked: readonly PathSegment[], keys: readonly string[]): string {
  const candidates = modelCandidates(doc);
  if (candidates.length > 0) {
    const list = candidates.map((c) => `--model-path ${c === '' ? "''" : c}`).join(' or ');
    return `this file holds an architecture elsewhere: pass ${list} (or set model_path in the policy)`;
  }
  if (keys.length > 0) {
    return `pass --model-path with the JSON pointer of the architecture, which starts with one of the keys listed, e.g. --model-path ${formatPointer([...walked, keys[0]!])}`;
  }
  return 'pass --model-path with the JSON pointer of the architecture (or set model_path in the policy)';
}
