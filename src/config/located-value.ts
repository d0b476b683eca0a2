/**
 * The model part of the YAML document as a plain tree in which every value remembers its source
 * span and how it was reached. The schema validator sees the plain value (`toPlain`), and every
 * error it reports is mapped back through this tree to the YAML node. YAML aliases are expanded
 * here under a budget, so a "billion laughs" document is refused instead of exhausting memory.
 * A plain scalar that YAML 1.1 loaders read differently is reported here (`yaml-versions.ts`).
 */
import { isAlias, isMap, isScalar, isSeq, type Document, type LineCounter, type Node } from 'yaml';
import type { Span } from '../diagnostic.js';
import { AnchorIndex } from './anchor-index.js';
import type { DiagnosticSink } from './diagnostic-sink.js';
import { formatFieldPath, type PathSegment } from './field-path.js';
import { formatPointer } from './json-pointer.js';
import { MAX_ALIAS_EXPANSIONS, MAX_NESTING_DEPTH } from './limits.js';
import { spanFromOffsets, spanOfRange } from './source-span.js';
import { yamlVersionProblem } from './yaml-versions.js';

interface LocatedCommon {
  readonly span: Span;
  readonly parent: Located | undefined;
  /** How the parent reaches this value: the key as written, or the sequence index. */
  readonly segment: PathSegment | undefined;
  /** On the root only: the segments of the model path that lead to it. */
  readonly base?: readonly PathSegment[];
  /** On the root only: how messages name the tree as a whole, when not "the model". */
  readonly rootName?: string;
}

export interface LocatedEntry {
  /** The canonical key (an alias such as `out_channels` is renamed to `channels`). */
  key: string;
  /** The key as written in the file. */
  readonly writtenKey: string;
  readonly keySpan: Span;
  readonly value: Located;
}

export interface LocatedMap extends LocatedCommon {
  readonly kind: 'map';
  readonly entries: LocatedEntry[];
}

export interface LocatedSeq extends LocatedCommon {
  readonly kind: 'seq';
  readonly items: Located[];
}

export type ScalarValue = string | number | boolean | null;

export interface LocatedScalar extends LocatedCommon {
  readonly kind: 'scalar';
  readonly value: ScalarValue;
}

export type Located = LocatedMap | LocatedSeq | LocatedScalar;

/** The segments from the document root to `node`, as written. */
export function pathOf(node: Located): PathSegment[] {
  const out: PathSegment[] = [];
  let cur: Located | undefined = node;
  let root: Located = node;
  while (cur) {
    if (cur.segment !== undefined) out.push(cur.segment);
    root = cur;
    cur = cur.parent;
  }
  out.reverse();
  return [...(root.base ?? []), ...out];
}

/** `model.layers[2].conv.channels`. */
export function displayPath(node: Located, ...more: PathSegment[]): string {
  let root: Located = node;
  while (root.parent) root = root.parent;
  return formatFieldPath([...pathOf(node), ...more], root.rootName);
}

/** `/model/layers/2/conv/channels`. */
export function pointerOf(node: Located): string {
  return formatPointer(pathOf(node));
}

export function entryOf(map: LocatedMap, key: string): LocatedEntry | undefined {
  return map.entries.find((e) => e.key === key);
}

export function fieldOf(map: LocatedMap, key: string): Located | undefined {
  return entryOf(map, key)?.value;
}

/** Follows a JSON pointer relative to `root` over canonical keys (as the validator reports them). */
export function locate(root: Located, segments: readonly string[]): Located | undefined {
  let cur: Located | undefined = root;
  for (const s of segments) {
    if (!cur) return undefined;
    if (cur.kind === 'map') cur = fieldOf(cur, s);
    else if (cur.kind === 'seq') cur = /^(0|[1-9][0-9]*)$/.test(s) ? cur.items[Number(s)] : undefined;
    else return undefined;
  }
  return cur;
}

/** The value the schema validator checks: own properties only, so `__proto__` stays a key. */
export function toPlain(node: Located): unknown {
  switch (node.kind) {
    case 'scalar':
      return node.value;
    case 'seq':
      return node.items.map(toPlain);
    case 'map': {
      const out: Record<string, unknown> = {};
      for (const e of node.entries) {
        Object.defineProperty(out, e.key, { value: toPlain(e.value), enumerable: true, writable: true, configurable: true });
      }
      return out;
    }
  }
}

/** A short description of a value for messages: `the string "64"`, `a list`, ... */
export function describeValue(node: Located | undefined): string {
  if (!node) return 'nothing';
  if (node.kind === 'map') return 'a mapping';
  if (node.kind === 'seq') return 'a list';
  return describeScalar(node.value);
}

export function describeScalar(value: unknown): string {
  if (value === null) return 'an empty value';
  if (typeof value === 'string') {
    const shown = value.length > 40 ? `${value.slice(0, 40)}…` : value;
    return `the string ${JSON.stringify(shown)}`;
  }
  if (typeof value === 'number' || typeof value === 'boolean') return String(value);
  if (Array.isArray(value)) return 'a list';
  if (typeof value === 'object') return 'a mapping';
  return String(value);
}

/** How messages speak of the converted tree; the defaults are the config loader's wording. */
export interface ConvertNaming {
  /** The tree as a whole, e.g. "the policy". */
  readonly rootName?: string;
  /** What the tree describes, e.g. "policy" (as in "no policy needs that"). */
  readonly subject?: string;
}

interface ConvertState {
  readonly anchors: AnchorIndex;
  readonly rootName: string;
  readonly subject: string;
  readonly lines: LineCounter;
  readonly sink: DiagnosticSink;
  expansions: number;
  /** Aliases whose targets are being converted (an alias inside its own anchor is a cycle). */
  readonly active: Set<Node>;
  failed: boolean;
  reportedBudget: boolean;
  reportedDepth: boolean;
}

/**
 * Converts the YAML node at the model path. Returns undefined (with diagnostics) when the tree
 * cannot be read: too many alias expansions, an alias cycle, too deep, or keys that are not
 * plain scalars.
 */
export function convertNode(
  doc: Document,
  lines: LineCounter,
  sink: DiagnosticSink,
  node: unknown,
  base: readonly PathSegment[],
  fallback: Span,
  naming: ConvertNaming = {},
): Located | undefined {
  const state: ConvertState = {
    anchors: new AnchorIndex(doc),
    rootName: naming.rootName ?? 'the model',
    subject: naming.subject ?? 'architecture',
    lines,
    sink,
    expansions: 0,
    active: new Set(),
    failed: false,
    reportedBudget: false,
    reportedDepth: false,
  };
  const root = convert(state, node, undefined, undefined, fallback, 0, base, undefined, naming.rootName);
  return state.failed ? undefined : root;
}

function convert(
  st: ConvertState,
  node: unknown,
  parent: Located | undefined,
  segment: PathSegment | undefined,
  fallback: Span,
  depth: number,
  base?: readonly PathSegment[],
  aliasSpan?: Span,
  rootName?: string,
): Located | undefined {
  const common = (own: Span | undefined) => ({
    span: aliasSpan ?? own ?? fallback,
    parent,
    segment,
    ...(base ? { base } : {}),
    ...(rootName !== undefined ? { rootName } : {}),
  });
  if (depth > MAX_NESTING_DEPTH) {
    if (!st.reportedDepth) {
      st.reportedDepth = true;
      st.sink.error('config/too-deep', `${st.rootName} is nested more than ${MAX_NESTING_DEPTH} levels deep here; no ${st.subject} needs that`, aliasSpan ?? fallback);
    }
    st.failed = true;
    return undefined;
  }
  if (node === null || node === undefined) {
    return { kind: 'scalar', value: null, ...common(undefined) };
  }
  if (isAlias(node)) {
    const own = spanOfRange(st.lines, node.range) ?? fallback;
    st.expansions += 1;
    if (st.expansions > MAX_ALIAS_EXPANSIONS) {
      if (!st.reportedBudget) {
        st.reportedBudget = true;
        st.sink.error(
          'config/alias-limit',
          `too many alias expansions: ${st.rootName} expands more than ${MAX_ALIAS_EXPANSIONS} aliases (*${node.source}); a document that multiplies itself through aliases is refused`,
          own,
        );
      }
      st.failed = true;
      return undefined;
    }
    const target = st.anchors.resolve(node);
    if (!target) {
      st.sink.error('config/yaml', `the alias *${node.source} refers to no anchor &${node.source} before it`, own);
      st.failed = true;
      return undefined;
    }
    if (st.active.has(target)) {
      st.sink.error('config/alias-cycle', `the alias *${node.source} is inside its own anchor &${node.source}, which would make the value infinite`, own);
      st.failed = true;
      return undefined;
    }
    st.active.add(target);
    try {
      return convert(st, target, parent, segment, own, depth + 1, base, aliasSpan ?? own, rootName);
    } finally {
      st.active.delete(target);
    }
  }
  if (isScalar(node)) {
    const own = spanOfRange(st.lines, node.range);
    const v = node.value;
    if (v === null || typeof v === 'string' || typeof v === 'number' || typeof v === 'boolean') {
      const versions = yamlVersionProblem(node, v);
      if (versions) st.sink.error('config/yaml-version', versions, aliasSpan ?? own ?? fallback);
      return { kind: 'scalar', value: v, ...common(own) };
    }
    st.sink.error('config/type', `this value (${typeof v}) is not a plain string, number, boolean or null`, aliasSpan ?? own ?? fallback);
    st.failed = true;
    return undefined;
  }
  if (isSeq(node)) {
    const own = spanOfRange(st.lines, node.range);
    const seq: LocatedSeq = { kind: 'seq', items: [], ...common(own) };
    node.items.forEach((item, i) => {
      const child = convert(st, item, seq, i, seq.span, depth + 1);
      if (child) seq.items.push(child);
    });
    return seq;
  }
  if (isMap(node)) {
    const own = spanOfRange(st.lines, node.range);
    const map: LocatedMap = { kind: 'map', entries: [], ...common(own) };
    const firstAt = new Map<string, Span>();
    for (const pair of node.items) {
      const keyNode: unknown = isAlias(pair.key) ? st.anchors.resolve(pair.key) : pair.key;
      const keySpan =
        (isAlias(pair.key) || isScalar(pair.key) || isMap(pair.key) || isSeq(pair.key) ? spanOfRange(st.lines, pair.key.range) : undefined) ?? map.span;
      if (!isScalar(keyNode) || (keyNode.value !== null && typeof keyNode.value === 'object')) {
        st.sink.error('config/key-type', `${formatFieldPath(pathOf(map), st.rootName)} has a key that is not a plain name; keys must be strings such as 'layers'`, keySpan);
        st.failed = true;
        continue;
      }
      const key = String(keyNode.value);
      const earlier = firstAt.get(key);
      if (earlier) {
        st.sink.error('config/duplicate-key', `${formatFieldPath([...pathOf(map), key], st.rootName)} is given twice (first on line ${earlier.line}); keep one`, keySpan);
        st.failed = true;
        continue;
      }
      firstAt.set(key, keySpan);
      const valueFallback = spanFromOffsets(st.lines, keySpan.endOffset, keySpan.endOffset);
      const value = convert(st, pair.value, map, key, valueFallback, depth + 1);
      if (value) map.entries.push({ key, writtenKey: key, keySpan, value });
    }
    return map;
  }
  st.sink.error('config/type', 'this YAML node is not a mapping, list or scalar', aliasSpan ?? fallback);
  st.failed = true;
  return undefined;
}

