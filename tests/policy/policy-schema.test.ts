/**
 * The policy schema as shipped: the draft the model schema uses, descriptions on every field (it
 * documents the format), and the rules it states in its own right.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, test } from 'vitest';
import { compiledSchemaFile } from '../../src/config/model-schema.js';
import { BUILTIN_KINDS } from '../../src/partition/partition.js';
import { policySchemaPath } from '../../src/policy/policy-schema.js';
import { properties } from '../helpers/schema-properties.js';

const schema = JSON.parse(readFileSync(new URL('../../schema/policy.schema.json', import.meta.url), 'utf8')) as Record<string, unknown>;
const defs = schema['definitions'] as Record<string, Record<string, unknown>>;


describe('the shipped policy schema', () => {
  test('is draft-07, like the model schema, and compiles in strict mode', () => {
    const model = JSON.parse(readFileSync(new URL('../../schema/model.schema.json', import.meta.url), 'utf8')) as Record<string, unknown>;
    expect(schema['$schema']).toBe(model['$schema']);
    expect(schema['$schema']).toBe('http://json-schema.org/draft-07/schema#');
    expect(() => compiledSchemaFile('policy.schema.json')).not.toThrow();
  });

  test('the loader reads the same file', () => {
    expect(policySchemaPath()).toBe(new URL('../../schema/policy.schema.json', import.meta.url).pathname);
  });

  test('every field and every definition has a description', () => {
    const props = properties(schema).filter(([at]) => !at.includes('/oneOf/'));
    expect(props.map(([at]) => at).filter((at) => !at.includes('/definitions/'))).toEqual([
      '/properties/id',
      '/properties/description',
      '/properties/extends',
      '/properties/surrogate',
      '/properties/model_path',
      '/properties/applies_to',
      '/properties/unproven',
      '/properties/max_drop_bits',
      '/properties/removal',
      '/properties/partitions',
      '/properties/require',
    ]);
    const missing = props.filter(([, p]) => typeof p['description'] !== 'string' || (p['description'] as string).length < 5).map(([at]) => at);
    expect(missing).toEqual([]);
    for (const d of Object.values(defs)) expect(typeof d['description']).toBe('string');
  });

  test('named partitions offer exactly the built-in kinds', () => {
    const kind = (defs['namedPartition']!['properties'] as Record<string, Record<string, unknown>>)['kind']!;
    expect(kind['enum']).toEqual([...BUILTIN_KINDS]);
  });

  test('a validator accepts a plain policy and rejects both minimums at once', () => {
    const { validate } = compiledSchemaFile('policy.schema.json');
    const ok = { id: 'p', description: 'd', require: [{ partition: 'left-right', min_rank: '2^40' }, { partition: 'x', min_bits: 1.5 }] };
    expect(validate(ok)).toBe(true);
    expect(validate({ ...ok, require: [{ partition: 'x', min_rank: 3, min_bits: 2 }] })).toBe(false);
    expect(validate({ ...ok, require: [{ partition: 'x' }] })).toBe(false);
    expect(validate({ ...ok, applies_to: ['../x'] })).toBe(false);
    expect(validate({ ...ok, applies_to: ['!x/*.yaml', '..x/y'] })).toBe(true);
  });
});
