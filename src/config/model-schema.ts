/**
 * Loads and compiles the structural schema shipped as `schema/model.schema.json`. The file sits
 * two levels up from `src/config/` but one level up from `build/config/` (the build copies
 * `schema/` into `build/`), so both places are tried. A missing schema is an installation bug,
 * not a problem in the user's file, and throws.
 */
import { existsSync, readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { Ajv, type ErrorObject, type ValidateFunction } from 'ajv';

const CANDIDATES = ['../../schema/model.schema.json', '../schema/model.schema.json'];

export interface CompiledSchema {
  readonly schema: Record<string, unknown>;
  readonly validate: ValidateFunction;
  /** Where each schema object sits inside the schema file, as a JSON pointer (`/definitions/conv`). */
  readonly locations: ReadonlyMap<object, string>;
}

let cached: CompiledSchema | undefined;

export function modelSchemaPath(): string {
  for (const relative of CANDIDATES) {
    const path = fileURLToPath(new URL(relative, import.meta.url));
    if (existsSync(path)) return path;
  }
  throw new Error(`model.schema.json not found (looked for ${CANDIDATES.join(' and ')} relative to ${import.meta.url}); the installation is incomplete`);
}

export function compiledModelSchema(): CompiledSchema {
  if (cached) return cached;
  const schema = JSON.parse(readFileSync(modelSchemaPath(), 'utf8')) as Record<string, unknown>;
  const ajv = new Ajv({ allErrors: true, strict: true, verbose: true, allowUnionTypes: true });
  const validate = ajv.compile(schema);
  const locations = new Map<object, string>();
  const walk = (node: unknown, at: string) => {
    if (node === null || typeof node !== 'object') return;
    if (!Array.isArray(node)) locations.set(node, at);
    for (const [k, v] of Object.entries(node)) walk(v, `${at}/${k}`);
  };
  walk(schema, '');
  cached = { schema, validate, locations };
  return cached;
}

/** All structural errors of `value` (an empty list when it conforms). */
export function validateAgainstSchema(value: unknown): ErrorObject[] {
  const { validate } = compiledModelSchema();
  return validate(value) ? [] : [...(validate.errors ?? [])];
}
