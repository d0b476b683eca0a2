/**
 * The validators that the build precompiles from schema/ (standalone code) must report exactly
 * what the validator library reports when it compiles the same schema at run time — the library
 * is the reference here — including which schema object failed, which the messages rely on.
 */
import { describe, expect, test } from 'vitest';
import { Ajv, type ErrorObject } from 'ajv';
import { parse } from 'yaml';
import { compiledSchemaFile } from '../../src/config/model-schema.js';
import { AJV_OPTIONS } from '../../src/config/schema-options.js';
import { fuzzCase } from '../fuzz/generate.js';

function documents(pick: (c: ReturnType<typeof fuzzCase>) => string | undefined, key?: string): unknown[] {
  const out: unknown[] = [];
  for (let i = 0; out.length < 400 && i < 3000; i++) {
    const text = pick(fuzzCase(11, i));
    if (text === undefined) continue;
    try {
      const value = parse(text, { maxAliasCount: 50, logLevel: 'silent' }) as unknown;
      out.push(key && value && typeof value === 'object' ? (value as Record<string, unknown>)[key] : value);
    } catch {
      // text damaged beyond YAML: not a validator input
    }
  }
  return out;
}

describe.each([
  ['model.schema.json', () => documents((c) => c.config, 'model')],
  ['policy.schema.json', () => documents((c) => c.policy)],
])('%s', (name, inputs) => {
  test('the build made a current precompiled validator (run `npm run build` if not)', () => {
    expect(compiledSchemaFile(name).origin).toBe('precompiled');
  });

  test('on 400 generated documents it reports what the run-time compiled validator reports', () => {
    const compiled = compiledSchemaFile(name);
    const reference = new Ajv({ ...AJV_OPTIONS }).compile(compiled.schema);
    const view = (errors: readonly ErrorObject[] | null | undefined) =>
      (errors ?? []).map((e) => ({
        instancePath: e.instancePath,
        schemaPath: e.schemaPath,
        keyword: e.keyword,
        params: e.params,
        message: e.message,
        at: e.parentSchema ? compiled.locations.get(e.parentSchema) : undefined,
      }));
    let invalid = 0;
    for (const doc of inputs()) {
      const ok = compiled.validate(doc);
      expect(ok).toBe(reference(doc));
      if (!ok) invalid++;
      expect(view(compiled.validate.errors)).toEqual(view(reference.errors));
    }
    expect(invalid).toBeGreaterThan(50);
  });
});
