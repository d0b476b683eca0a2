/**
 * Turns the validator's errors into diagnostics a person can act on: each one is placed on the
 * YAML node its `instancePath` names, says which field is wrong and what is allowed, and the
 * follow-on errors that one mistake causes (the `if` of a conditional, checks on a value of the
 * wrong type) are left out. Layer entries are not schema-checked: the layer reader reports them.
 */
import type { ErrorObject } from 'ajv';
import type { Span } from '../diagnostic.js';
import { closest } from '../text/suggest.js';
import type { DiagnosticSink } from './diagnostic-sink.js';
import { describeScalar, displayPath, entryOf, locate, type Located } from './located-value.js';
import { INPUT_ALIASES } from './field-aliases.js';

/** Schema locations with their own wording (see schema/model.schema.json). */
const MODEL_EITHER_OR = '/allOf/1/else';
const MODEL_NOT_BOTH = '/allOf/1/then';
const LAYER_LIST = '/definitions/layerList';
const INPUT = '/definitions/input';

export function reportSchemaErrors(
  errors: readonly ErrorObject[],
  root: Located,
  locations: ReadonlyMap<object, string>,
  sink: DiagnosticSink,
): void {
  const typeErrorAt = new Set(errors.filter((e) => e.keyword === 'type').map((e) => e.instancePath));
  // A misspelt required field shows up twice: as an unknown key and as a missing field. The
  // unknown-key message names the field, so the missing-field one is dropped.
  const suggested = new Set<string>();
  for (const e of errors) {
    if (e.keyword !== 'additionalProperties') continue;
    const guess = suggestionFor(e, locations);
    if (guess) suggested.add(`${e.instancePath}\u0000${guess}`);
  }
  const requiredGroups = new Map<string, ErrorObject[]>();
  for (const e of errors) {
    if (e.keyword === 'if') continue;
    if (e.keyword !== 'type' && typeErrorAt.has(e.instancePath)) continue;
    if (e.keyword === 'required') {
      if (suggested.has(`${e.instancePath}\u0000${String((e.params as Record<string, unknown>)['missingProperty'])}`)) continue;
      const key = `${e.instancePath}\u0000${where(e, locations)}`;
      const group = requiredGroups.get(key) ?? [];
      group.push(e);
      requiredGroups.set(key, group);
      continue;
    }
    reportOne(e, root, locations, sink);
  }
  for (const group of requiredGroups.values()) reportRequired(group, root, locations, sink);
}

function where(e: ErrorObject, locations: ReadonlyMap<object, string>): string | undefined {
  return e.parentSchema ? locations.get(e.parentSchema) : undefined;
}

function segmentsOf(instancePath: string): string[] {
  if (instancePath === '') return [];
  return instancePath
    .slice(1)
    .split('/')
    .map((s) => s.replace(/~1/g, '/').replace(/~0/g, '~'));
}

function reportOne(e: ErrorObject, root: Located, locations: ReadonlyMap<object, string>, sink: DiagnosticSink): void {
  const node = locate(root, segmentsOf(e.instancePath)) ?? root;
  const path = displayPath(node);
  const loc = where(e, locations);
  const parent = (e.parentSchema ?? {}) as Record<string, unknown>;
  const params = e.params as Record<string, unknown>;
  const at: Span = node.span;
  switch (e.keyword) {
    case 'type': {
      const isNumber = typeof e.data === 'number';
      const code = isNumber && typeIncludes(parent, 'integer') ? 'config/invalid-number' : 'config/type';
      sink.error(code, `${path} must be ${expected(parent, loc)}, got ${describeScalar(e.data)}`, at);
      return;
    }
    case 'minimum':
    case 'exclusiveMinimum':
    case 'maximum':
    case 'exclusiveMaximum': {
      const limit = Number(params['limit']);
      const noun = typeIncludes(parent, 'integer') ? 'integer' : 'number';
      const what =
        e.keyword === 'minimum' && limit === 1 && noun === 'integer'
          ? 'a positive integer'
          : e.keyword === 'minimum' && limit === 0
            ? `a non-negative ${noun}`
            : `${params['comparison'] ?? ''} ${limit}`.trim();
      sink.error('config/invalid-number', `${path} must be ${what}, got ${describeScalar(e.data)}`, at);
      return;
    }
    case 'enum': {
      const allowed = (Array.isArray(e.schema) ? e.schema : []).map(String);
      const guess = typeof e.data === 'string' ? closest(e.data, allowed) : undefined;
      sink.error(
        'config/invalid-value',
        `${path} must be one of ${allowed.map((a) => `'${a}'`).join(', ')}, got ${describeScalar(e.data)}${guess ? ` (did you mean '${guess}'?)` : ''}`,
        at,
      );
      return;
    }
    case 'const':
      sink.error('config/invalid-value', `${path} must be ${JSON.stringify(e.schema)}, got ${describeScalar(e.data)}`, at);
      return;
    case 'minLength':
      sink.error('config/invalid-value', `${path} must be a non-empty string`, at);
      return;
    case 'minItems':
    case 'maxItems': {
      const count = Array.isArray(e.data) ? e.data.length : 0;
      if (loc === LAYER_LIST) {
        sink.error('config/empty-layers', `${path} is empty; list at least one layer`, at);
        return;
      }
      sink.error('config/invalid-length', `${path} must have ${lengthRule(parent)}, got ${count}${lengthHint(loc)}`, at);
      return;
    }
    case 'additionalProperties': {
      reportUnknownKey(e, node, loc, parent, sink);
      return;
    }
    case 'not': {
      if (loc === MODEL_NOT_BOTH && node.kind === 'map') {
        const layered = ['input', 'output', 'layers', 'weight_sharing'].filter((k) => entryOf(node, k)).map((k) => `'${k}'`);
        sink.error(
          'config/model-kind',
          `${path} has both 'network' and ${layered.join(', ')}; a model is either layered ('input' + 'layers') or an explicit tensor network ('network'), not both`,
          at,
        );
        return;
      }
      break;
    }
    default:
      break;
  }
  sink.error('config/schema', `${path} ${e.message ?? 'is not valid'}`, at);
}

function reportUnknownKey(
  e: ErrorObject,
  node: Located,
  loc: string | undefined,
  parent: Record<string, unknown>,
  sink: DiagnosticSink,
): void {
  const key = String((e.params as Record<string, unknown>)['additionalProperty']);
  const entry = node.kind === 'map' ? entryOf(node, key) : undefined;
  const at = entry?.keySpan ?? node.span;
  const path = displayPath(node);
  if (key === '<<') {
    sink.error('config/unknown-field', `${path} uses a YAML merge key ('<<'), which is not supported; write the fields out, or alias the whole mapping`, at);
    return;
  }
  const allowed = Object.keys((parent['properties'] ?? {}) as Record<string, unknown>);
  const guess = closest(key, [...allowed, ...aliasesAt(loc)]);
  sink.error(
    'config/unknown-field',
    `unknown field '${key}' in ${path}${guess ? ` (did you mean '${guess}'?)` : ''}; allowed: ${allowed.join(', ')}`,
    at,
  );
}

function aliasesAt(loc: string | undefined): string[] {
  return loc === INPUT ? [...INPUT_ALIASES.keys()] : [];
}

/** The canonical field an unknown key is probably a misspelling of. */
function suggestionFor(e: ErrorObject, locations: ReadonlyMap<object, string>): string | undefined {
  const key = String((e.params as Record<string, unknown>)['additionalProperty']);
  const loc = where(e, locations);
  const allowed = Object.keys(((e.parentSchema as Record<string, unknown> | undefined)?.['properties'] ?? {}) as Record<string, unknown>);
  const guess = closest(key, [...allowed, ...aliasesAt(loc)]);
  if (!guess) return undefined;
  return (loc === INPUT ? INPUT_ALIASES.get(guess) : undefined) ?? guess;
}

function reportRequired(group: readonly ErrorObject[], root: Located, locations: ReadonlyMap<object, string>, sink: DiagnosticSink): void {
  const first = group[0];
  if (!first) return;
  const node = locate(root, segmentsOf(first.instancePath)) ?? root;
  const path = displayPath(node);
  const loc = where(first, locations);
  const missing = group.map((e) => String((e.params as Record<string, unknown>)['missingProperty']));
  const quoted = missing.map((m) => `'${m}'`).join(' and ');
  if (loc === MODEL_EITHER_OR) {
    sink.error(
      'config/model-kind',
      `${path} needs either 'input' and 'layers' (a layered model) or 'network' (an explicit tensor network); missing ${quoted}`,
      node.span,
    );
    return;
  }
  const properties = ((first.parentSchema as Record<string, unknown> | undefined)?.['properties'] ?? {}) as Record<string, { description?: unknown }>;
  const explained = missing.map((m) => {
    const d = Object.hasOwn(properties, m) ? properties[m]?.description : undefined;
    return typeof d === 'string' ? `'${m}' (${d.replace(/\.$/, '').replace(/^[A-Z](?=[a-z])/, (c) => c.toLowerCase())})` : `'${m}'`;
  });
  sink.error('config/missing-field', `${path} is missing ${explained.join(' and ')}`, node.span);
}

function typeIncludes(schema: Record<string, unknown>, type: string): boolean {
  const t = schema['type'];
  return t === type || (Array.isArray(t) && t.includes(type));
}

/** What a schema accepts, in words. */
function expected(schema: Record<string, unknown>, loc: string | undefined): string {
  if (loc === LAYER_LIST) return 'a list of layers';
  if (loc === '') return "a mapping (with 'input' and 'layers', or 'network')";
  const t = schema['type'];
  const types = Array.isArray(t) ? t.map(String) : [String(t)];
  const words = types.map((type) => {
    switch (type) {
      case 'integer':
        return schema['minimum'] === 0 ? 'a non-negative integer' : 'a positive integer';
      case 'array': {
        const items = schema['items'] as Record<string, unknown> | undefined;
        if (types.length > 1 && items?.['type'] === 'integer') return `a list of ${lengthRule(schema).replace(/ entries$/, '')} positive integers`;
        return 'a list';
      }
      case 'object':
        return 'a mapping';
      case 'string':
        return Array.isArray(schema['enum']) ? `one of ${schema['enum'].map((v) => `'${String(v)}'`).join(', ')}` : 'a string';
      case 'boolean':
        return 'true or false';
      default:
        return type;
    }
  });
  return words.join(' or ');
}

function lengthRule(schema: Record<string, unknown>): string {
  const min = typeof schema['minItems'] === 'number' ? schema['minItems'] : undefined;
  const max = typeof schema['maxItems'] === 'number' ? schema['maxItems'] : undefined;
  if (min !== undefined && max !== undefined) {
    if (min === max) return `${min} entries`;
    return max === min + 1 ? `${min} or ${max} entries` : `${min} to ${max} entries`;
  }
  if (min !== undefined) return `at least ${min} entries`;
  if (max !== undefined) return `at most ${max} entries`;
  return 'a valid number of entries';
}

function lengthHint(loc: string | undefined): string {
  if (loc?.endsWith('/properties/shape')) return ' ([length] or [height, width])';
  if (loc === '/definitions/bond/properties/between') return ' (a bond joins at least 2 tensors)';
  return '';
}
