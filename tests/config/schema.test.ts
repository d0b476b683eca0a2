import { readFileSync } from 'node:fs';
import { describe, expect, test } from 'vitest';
import { compiledModelSchema, modelSchemaPath } from '../../src/config/model-schema.js';
import { properties } from '../helpers/schema-properties.js';

const schema = JSON.parse(readFileSync(new URL('../../schema/model.schema.json', import.meta.url), 'utf8')) as Record<string, unknown>;


describe('the shipped schema', () => {
  test('is draft-07 and compiles in strict mode', () => {
    expect(schema['$schema']).toBe('http://json-schema.org/draft-07/schema#');
    expect(() => compiledModelSchema()).not.toThrow();
  });

  test('the loader finds the same file', () => {
    expect(modelSchemaPath()).toBe(new URL('../../schema/model.schema.json', import.meta.url).pathname);
  });

  test('every field has a description (conditions inside `if` are not fields)', () => {
    const props = properties(schema).filter(([at]) => !at.includes('/if/'));
    expect(props.length).toBeGreaterThan(15);
    const missing = props.filter(([, p]) => typeof p['description'] !== 'string' || (p['description'] as string).length < 5).map(([at]) => at);
    expect(missing).toEqual([]);
  });

  test('every definition has a description', () => {
    const defs = schema['definitions'] as Record<string, Record<string, unknown>>;
    expect(Object.keys(defs).sort()).toEqual(['bond', 'input', 'layer', 'layerList', 'network', 'output', 'tensor']);
    for (const d of Object.values(defs)) expect(typeof d['description']).toBe('string');
  });

  test('layer entries are left to the layer reader: the schema constrains nothing in them', () => {
    const layer = (schema['definitions'] as Record<string, Record<string, unknown>>)['layer']!;
    expect(Object.keys(layer)).toEqual(['description']);
  });

  test('a validator accepts a model (input aliases already renamed) and rejects an unknown field', () => {
    const { validate } = compiledModelSchema();
    const layers = [{ conv: { out_channels: 3, kernel_size: [2] } }, 'relu', { type: 'Linear', out_features: 2 }];
    expect(validate({ input: { shape: [4], channels: 2, representation: 8 }, output: { position: 1 }, layers })).toBe(true);
    expect(validate({ input: { shape: [3, 4, 4], channels: 3 }, layers })).toBe(true);
    expect(validate({ input: { shape: [4], chanels: 2 }, layers })).toBe(false);
    expect(validate({ input: { shape: [4] }, output: { position: [1, 2, 3] }, layers })).toBe(false);
    // `output` belongs to layered models
    expect(validate({ network: { shape: [1], tensors: [{ name: 'a' }] }, output: { position: 0 } })).toBe(false);
  });
});
