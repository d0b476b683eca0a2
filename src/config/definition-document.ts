/**
 * One architecture definition file on its own: YAML text → its name, its parameters (type,
 * default, range, step, description) and its model tree with every `=…` expression parsed, or
 * diagnostics for every problem found in the file. The YAML, located-tree and schema stages are
 * the config loader's, so limits and messages behave alike; diagnostics are reported under
 * `definition/` codes (see `DefinitionSink`). Evaluating the expressions needs parameter values,
 * so it happens per config (`instantiate-definition.ts`); syntax is checked here, once.
 */
import { LineCounter, parseDocument } from 'yaml';
import type { Span } from '../diagnostic.js';
import { DiagnosticSink } from './diagnostic-sink.js';
import { compare, formatExact, fromNumber, isInteger, OverflowError, type Exact } from './exact-number.js';
import { isExpressionText, parseExpression, type Expr, type ParameterValue } from './expression.js';
import { MAX_DOCUMENT_BYTES } from './limits.js';
import { convertNode, describeValue, displayPath, fieldOf, type Located, type LocatedMap, type LocatedScalar } from './located-value.js';
import { stringOf } from './located-read.js';
import { compiledSchemaFile } from './model-schema.js';
import { reportSchemaErrors } from './schema-errors.js';
import { spanFromOffsets } from './source-span.js';
import { toPlain } from './located-value.js';
import { reportYamlErrors } from './yaml-errors.js';

export const DEFINITION_SCHEMA = 'definition.schema.json';

export type ParameterType = 'int' | 'number' | 'list';

export interface ParameterDecl {
  readonly name: string;
  readonly type: ParameterType;
  readonly default: ParameterValue;
  /** Inclusive; for a list, of each entry. */
  readonly min: Exact;
  readonly max: Exact;
  /** Fixes propose multiples of this. */
  readonly step: Exact;
  /** For a list: the number of entries a config gives. */
  readonly length?: number;
  readonly description: string;
  /** The parameter's name in the definition. */
  readonly span: Span;
}

/** An expression of the model tree, parsed, with where its characters sit in the file. */
export interface ParsedExpression {
  readonly text: string;
  readonly expr: Expr;
  /** Source offset of the `=`, when the characters of the value map one to one onto the file. */
  readonly at?: number;
}

export interface Definition {
  /** As diagnostics name it. */
  readonly file: string;
  /** Root-relative, forward slashes. */
  readonly path: string;
  readonly name: string;
  readonly description: string;
  readonly lines: LineCounter;
  readonly parameters: ReadonlyMap<string, ParameterDecl>;
  /** The `model` mapping as written (expressions not evaluated). */
  readonly model: LocatedMap;
  readonly expressions: ReadonlyMap<LocatedScalar, ParsedExpression>;
}

const TYPES: ReadonlyMap<string, ParameterType> = new Map([
  ['int', 'int'],
  ['integer', 'int'],
  ['number', 'number'],
  ['float', 'number'],
  ['decimal', 'number'],
  ['list', 'list'],
]);

/** Names an expression reads as something else, and the key a config uses for the path. */
const RESERVED_NAMES = new Set(['ceil', 'floor', 'min', 'max', 'architecture']);

const DEFAULT_STEP: Readonly<Record<ParameterType, Exact>> = { int: { n: 1n, d: 1n }, list: { n: 1n, d: 1n }, number: { n: 1n, d: 100n } };

/**
 * Diagnostics of a definition file: the shared readers' `config/…` codes become `definition/…`,
 * and a problem at a computed value says how it was computed (`notes`, by source offset).
 */
export class DefinitionSink extends DiagnosticSink {
  readonly notes = new Map<number, string>();

  override error(code: string, message: string, span?: Span): void {
    const renamed = code.startsWith('config/') ? `definition/${code.slice('config/'.length)}` : code;
    const note = span ? this.notes.get(span.offset) : undefined;
    super.error(renamed, note ? `${message} (${note})` : message, span);
  }
}

/** Reads a definition; undefined (with diagnostics in `sink`) when it cannot be used. */
export function readDefinition(text: string, file: string, path: string, sink: DiagnosticSink): Definition | undefined {
  const bytes = Buffer.byteLength(text, 'utf8');
  if (bytes > MAX_DOCUMENT_BYTES) {
    sink.error('definition/too-large', `the definition file is ${bytes} bytes; files larger than ${MAX_DOCUMENT_BYTES} bytes (4 MiB) are refused`);
    return undefined;
  }
  const lines = new LineCounter();
  const doc = parseDocument(text, { lineCounter: lines, prettyErrors: false, uniqueKeys: true });
  reportYamlErrors(doc, lines, sink);
  if (sink.count > 0) return undefined;
  const root = convertNode(doc, lines, sink, doc.contents, [], spanFromOffsets(lines, 0, 0), { rootName: 'the definition', subject: 'architecture definition' });
  if (!root) return undefined;
  if (root.kind !== 'map') {
    sink.error('definition/type', `the definition file holds ${describeValue(root)}; a definition is a mapping with 'name', 'description', 'parameters' and 'model'`, root.span);
    return undefined;
  }
  const { validate, locations } = compiledSchemaFile(DEFINITION_SCHEMA);
  if (!validate(toPlain(root))) reportSchemaErrors(validate.errors ?? [], root, locations, sink);
  if (sink.count > 0) return undefined;

  const parameters = new Map<string, ParameterDecl>();
  const params = fieldOf(root, 'parameters');
  if (params?.kind === 'map') {
    for (const entry of params.entries) {
      const decl = readParameter(entry.key, entry.keySpan, entry.value as LocatedMap, sink);
      if (decl) parameters.set(entry.key, decl);
    }
  }
  const model = fieldOf(root, 'model') as LocatedMap;
  const expressions = new Map<LocatedScalar, ParsedExpression>();
  collectExpressions(model, text, lines, expressions, sink);
  if (sink.count > 0) return undefined;
  return {
    file,
    path,
    name: stringOf(fieldOf(root, 'name'))!,
    description: stringOf(fieldOf(root, 'description'))!,
    lines,
    parameters,
    model,
    expressions,
  };
}

function readParameter(name: string, keySpan: Span, body: LocatedMap, sink: DiagnosticSink): ParameterDecl | undefined {
  const where = `parameters.${name}`;
  if (RESERVED_NAMES.has(name)) {
    const why = name === 'architecture' ? 'a config names the definition with it' : 'it is a function of the expressions';
    sink.error('definition/invalid-name', `${where}: '${name}' cannot name a parameter: ${why}`, keySpan);
    return undefined;
  }
  const type = TYPES.get(stringOf(fieldOf(body, 'type'))!)!;
  const bound = (key: 'min' | 'max' | 'step'): Exact | undefined => {
    const node = fieldOf(body, key);
    if (!node) return undefined;
    const v = exactNumber(node, sink, 'definition');
    if (v === null) return undefined;
    if (!v || (type !== 'number' && !isInteger(v))) {
      sink.error('definition/invalid-number', `${displayPath(node)} must be ${type === 'number' ? 'a number' : 'a whole number'} for a parameter of type ${type}, got ${describeValue(node)}`, node.span);
      return undefined;
    }
    return v;
  };
  const min = bound('min');
  const max = bound('max');
  const step = bound('step') ?? DEFAULT_STEP[type];
  if (!min || !max) return undefined;
  const maxNode = fieldOf(body, 'max')!;
  if (compare(min, max) > 0) {
    sink.error('definition/invalid-range', `${displayPath(maxNode)} is ${formatExact(max)}, below min ${formatExact(min)}; the range is min to max, both included`, maxNode.span);
    return undefined;
  }
  const defaultNode = fieldOf(body, 'default')!;
  const lengthNode = fieldOf(body, 'length');
  if (lengthNode && type !== 'list') {
    sink.error('definition/invalid-field', `${displayPath(lengthNode)}: only a list parameter has a length`, lengthNode.span);
    return undefined;
  }
  const declaredLength = lengthNode?.kind === 'scalar' ? Number(lengthNode.value) : undefined;
  const decl = { name, type, min, max, step, description: stringOf(fieldOf(body, 'description'))!, span: keySpan, ...(declaredLength !== undefined ? { length: declaredLength } : {}) };
  const value = readParameterValue(defaultNode, decl, sink, 'definition', displayPath(defaultNode));
  if (!value) return undefined;
  const length = Array.isArray(value) ? value.length : undefined;
  return { ...decl, default: value, ...(length !== undefined ? { length } : {}) };
}

/**
 * A parameter value as written (a default in the definition or a setting in a config), checked
 * against the declaration: its type, a list's length, the range. Reported at the value under
 * `<owner>/…` codes. `what` names the value in messages ("the default", "model.width").
 */
export function readParameterValue(node: Located, decl: Omit<ParameterDecl, 'default'>, sink: DiagnosticSink, owner: 'definition' | 'config', what: string, declaredIn = ''): ParameterValue | undefined {
  const range = `${formatExact(decl.min)} to ${formatExact(decl.max)}`;
  const one = (item: Located, label: string): Exact | undefined => {
    const v = exactNumber(item, sink, owner);
    if (v === null) return undefined;
    const whole = decl.type !== 'number';
    if (!v || (whole && !isInteger(v))) {
      sink.error(`${owner}/parameter-type`, `${label} must be ${whole ? 'a whole number' : 'a number'} (parameter ${decl.name} is of type ${decl.type}${declaredIn}), got ${describeValue(item)}`, item.span);
      return undefined;
    }
    if (compare(v, decl.min) < 0 || compare(v, decl.max) > 0) {
      const side = compare(v, decl.min) < 0 ? `below the minimum ${formatExact(decl.min)}` : `above the maximum ${formatExact(decl.max)}`;
      sink.error(`${owner}/parameter-range`, `${label} is ${formatExact(v)}, ${side}: parameter ${decl.name} allows ${range}${declaredIn}`, item.span);
      return undefined;
    }
    return v;
  };
  if (decl.type !== 'list') {
    if (node.kind !== 'scalar') {
      sink.error(`${owner}/parameter-type`, `${what} must be a number (parameter ${decl.name} is of type ${decl.type}${declaredIn}), got ${describeValue(node)}`, node.span);
      return undefined;
    }
    return one(node, what);
  }
  if (node.kind !== 'seq') {
    sink.error(`${owner}/parameter-type`, `${what} must be a list of whole numbers (parameter ${decl.name} is a list${declaredIn}), got ${describeValue(node)}`, node.span);
    return undefined;
  }
  if (decl.length !== undefined && node.items.length !== decl.length) {
    sink.error(`${owner}/parameter-length`, `${what} has ${node.items.length} entr${node.items.length === 1 ? 'y' : 'ies'}; parameter ${decl.name} takes ${decl.length}${declaredIn}`, node.span);
    return undefined;
  }
  if (node.items.length === 0) {
    sink.error(`${owner}/parameter-length`, `${what} is empty; parameter ${decl.name} takes at least one entry`, node.span);
    return undefined;
  }
  const out: Exact[] = [];
  let ok = true;
  node.items.forEach((item, i) => {
    const v = one(item, `${what}[${i}]`);
    if (v) out.push(v);
    else ok = false;
  });
  return ok ? out : undefined;
}

/**
 * The exact value of a YAML number; undefined when the node is not a finite number; null (after
 * reporting it) when it is one too large to hold exactly (2^63 and beyond).
 */
function exactNumber(node: Located, sink: DiagnosticSink, owner: 'definition' | 'config'): Exact | undefined | null {
  if (node.kind !== 'scalar' || typeof node.value !== 'number') return undefined;
  try {
    return fromNumber(node.value);
  } catch (e) {
    if (!(e instanceof OverflowError)) throw e;
    sink.error(`${owner}/number-too-large`, `${displayPath(node)} is ${String(node.value)}; parameter values stay below 2^63`, node.span);
    return null;
  }
}

/** Parses every `=…` string of the model, reporting syntax at the characters at fault. */
function collectExpressions(node: Located, text: string, lines: LineCounter, out: Map<LocatedScalar, ParsedExpression>, sink: DiagnosticSink): void {
  if (node.kind === 'map') for (const e of node.entries) collectExpressions(e.value, text, lines, out, sink);
  else if (node.kind === 'seq') for (const item of node.items) collectExpressions(item, text, lines, out, sink);
  else if (isExpressionText(node.value)) {
    const at = contentOffset(text, node);
    const parsed = parseExpression(node.value);
    if (parsed.ok) out.set(node, { text: node.value, expr: parsed.expr, ...(at !== undefined ? { at } : {}) });
    else sink.error(parsed.error.code, `${displayPath(node)}: ${parsed.error.message}`, expressionSpan(lines, node, at, parsed.error.start, parsed.error.end));
  }
}

/**
 * Where the value's first character sits in the file, when the value is written as is (plain,
 * or quoted without escapes); undefined for escaped or block scalars, whose characters do not map
 * one to one (problems then point at the whole value).
 */
function contentOffset(text: string, node: LocatedScalar): number | undefined {
  const raw = text.slice(node.span.offset, node.span.endOffset);
  const value = String(node.value);
  if (raw === value) return node.span.offset;
  const q = raw[0];
  if ((q === '"' || q === "'") && raw.length === value.length + 2 && raw.slice(1, -1) === value) return node.span.offset + 1;
  return undefined;
}

/** The span of characters [start, end) of an expression, or of its whole value. */
export function expressionSpan(lines: LineCounter, node: LocatedScalar, at: number | undefined, start: number, end: number): Span {
  if (at === undefined) return node.span;
  return spanFromOffsets(lines, at + start, at + end);
}
