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
    expect(props.length).toBeGreaterThan(30);
    const missing = props.filter(([, p]) => typeof p['description'] !== 'string' || (p['description'] as string).length < 5).map(([at]) => at);
    expect(missing).toEqual([]);
  });

  test('every definition has a description', () => {
    const defs = schema['definitions'] as Record<string, Record<string, unknown>>;
    expect(Object.keys(defs).sort()).toEqual(['bond', 'conv', 'dense', 'input', 'layer', 'layerList', 'network', 'pool', 'recurrent', 'repeat', 'tensor']);
    for (const d of Object.values(defs)) expect(typeof d['description']).toBe('string');
  });

  test('the layer kinds are exactly the five', () => {
    const layer = (schema['definitions'] as Record<string, Record<string, unknown>>)['layer']!;
    expect(Object.keys(layer['properties'] as object)).toEqual(['conv', 'pool', 'dense', 'recurrent', 'repeat']);
    expect([layer['minProperties'], layer['maxProperties'], layer['additionalProperties']]).toEqual([1, 1, false]);
  });

  test('a validator accepts a normalised model and rejects an unknown field', () => {
    const { validate } = compiledModelSchema();
    expect(validate({ input: { shape: [4], features: 2 }, layers: [{ conv: { channels: 3, kernel: [2] } }] })).toBe(true);
    expect(validate({ input: { shape: [4], features: 2 }, layers: [{ conv: { channels: 3, chanels: 2 } }] })).toBe(false);
  });
});
