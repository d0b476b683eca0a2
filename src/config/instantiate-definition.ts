/**
 * A definition's model with its parameters set: a copy of the model tree in which every `=…`
 * expression is replaced by its value, exactly computed, at the same place (so every later stage
 * — sizes, schema, the layer reader, shapes — reads it as if the number had been written there,
 * and points at the expression when something is wrong with it). Each computed value remembers
 * the parameters it read, which the layer reader turns into per-field provenance, and a problem
 * the later stages find at a computed value says how it was computed.
 */
import type { Span } from '../diagnostic.js';
import { expressionSpan, type Definition, type DefinitionSink } from './definition-document.js';
import { formatExact, toNumber, type Exact } from './exact-number.js';
import { evaluateExpression, namesOf, type ParameterValue } from './expression.js';
import { displayPath, type Located, type LocatedMap } from './located-value.js';
import type { ParameterUse } from './model.js';

/** One parameter's value for an instance, and where it was set. */
export interface ParameterBinding {
  readonly value: ParameterValue;
  /** The config's value; absent when the definition's default is used. */
  readonly span?: Span;
  /** For a list the config sets: each entry's span. */
  readonly itemSpans?: readonly Span[];
  /** For messages: `configs/small.yaml:4:10`, or `the default`. */
  readonly where: string;
}

export interface Instance {
  readonly root: LocatedMap;
  /** The parameters a value (and everything inside it) was computed from, with where the config sets each. */
  readonly paramsOf: (node: Located) => readonly ParameterUse[];
}

/** Undefined (with diagnostics at the expressions in `sink`) when an expression cannot be evaluated. */
export function instantiate(def: Definition, bindings: ReadonlyMap<string, ParameterBinding>, sink: DefinitionSink): Instance | undefined {
  const values = new Map<string, ParameterValue>();
  for (const [name, b] of bindings) values.set(name, b.value);
  const used = new WeakMap<Located, readonly string[]>();
  let ok = true;

  const copy = (node: Located, parent: Located | undefined): Located => {
    if (node.kind === 'map') {
      const map: LocatedMap = { ...node, parent, entries: [] };
      for (const e of node.entries) map.entries.push({ ...e, value: copy(e.value, map) });
      return map;
    }
    if (node.kind === 'seq') {
      const seq = { ...node, parent, items: [] as Located[] };
      for (const item of node.items) seq.items.push(copy(item, seq));
      return seq;
    }
    const parsed = def.expressions.get(node);
    if (!parsed) return { ...node, parent };
    const result = evaluateExpression(parsed.expr, values);
    if (!result.ok) {
      ok = false;
      const read = describeBindings(bindings, namesOf(parsed.expr));
      sink.error(result.error.code, `${displayPath(node)}: ${result.error.message}${read ? ` (with ${read})` : ''}`, expressionSpan(def.lines, node, parsed.at, result.error.start, result.error.end));
      return { ...node, parent };
    }
    const out: Located = { ...node, parent, value: toNumber(result.value) };
    used.set(out, result.used);
    sink.notes.set(node.span.offset, noteOf(parsed.text, result.value, result.used, bindings));
    return out;
  };

  const root = copy(def.model, def.model.parent) as LocatedMap;
  if (!ok) return undefined;

  const memo = new WeakMap<Located, readonly ParameterUse[]>();
  const paramsOf = (node: Located): readonly ParameterUse[] => {
    const hit = memo.get(node);
    if (hit) return hit;
    const names: string[] = [];
    const visit = (n: Located): void => {
      for (const name of used.get(n) ?? []) if (!names.includes(name)) names.push(name);
      if (n.kind === 'map') for (const e of n.entries) visit(e.value);
      else if (n.kind === 'seq') for (const item of n.items) visit(item);
    };
    visit(node);
    const uses = names.map((name) => {
      const span = bindings.get(name)?.span;
      return span ? { name, span } : { name };
    });
    memo.set(node, uses);
    return uses;
  };
  return { root, paramsOf };
}

/** `0.5`, `[2, 2, 2, 2]`. */
export function showValue(v: ParameterValue): string {
  return Array.isArray(v) ? `[${(v as readonly Exact[]).map(formatExact).join(', ')}]` : formatExact(v as Exact);
}

function describeBindings(bindings: ReadonlyMap<string, ParameterBinding>, names: readonly string[]): string {
  return names
    .filter((n) => bindings.has(n))
    .map((n) => {
      const b = bindings.get(n)!;
      return `${n} = ${showValue(b.value)} from ${b.where}`;
    })
    .join(', ');
}

function noteOf(text: string, value: Exact, names: readonly string[], bindings: ReadonlyMap<string, ParameterBinding>): string {
  const read = describeBindings(bindings, names);
  return `computed as ${formatExact(value)} by '${text}'${read ? ` with ${read}` : ''}`;
}
