/**
 * Loads and compiles the structural schemas shipped in `schema/` (`model.schema.json`, and the
 * policy schema, which the policy loader compiles the same way). The files sit two levels up from
 * `src/config/` but one level up from `build/config/` (the build copies `schema/` into `build/`),
 * so both places are tried. A missing schema is an installation bug, not a problem in the user's
 * file, and throws.
 */
import { existsSync, readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { Ajv, type ErrorObject, type ValidateFunction } from 'ajv';

/** Where a shipped schema file sits relative to this module, in the source tree and in the build. */
const CANDIDATE_DIRS = ['../../schema/', '../schema/'];
const MODEL_SCHEMA = 'model.schema.json';

export interface CompiledSchema {
  readonly schema: Record<string, unknown>;
  readonly validate: ValidateFunction;
  /** Where each schema object sits inside the schema file, as a JSON pointer (`/definitions/conv`). */
  readonly locations: ReadonlyMap<object, string>;
}

const cached = new Map<string, CompiledSchema>();

/** The path of a schema shipped in `schema/` (the model schema, the policy schema). */
export function schemaFilePath(name: string): string {
  for (const dir of CANDIDATE_DIRS) {
    const path = fileURLToPath(new URL(dir + name, import.meta.url));
    if (existsSync(path)) return path;
  }
  const looked = CANDIDATE_DIRS.map((dir) => dir + name).join(' and ');
  throw new Error(`${name} not found (looked for ${looked} relative to ${import.meta.url}); the installation is incomplete`);
}

/** Compiles a shipped schema once, with the options every loader relies on (all errors, verbose). */
export function compiledSchemaFile(name: string): CompiledSchema {
  const hit = cached.get(name);
  if (hit) return hit;
  const schema = JSON.parse(readFileSync(schemaFilePath(name), 'utf8')) as Record<string, unknown>;
  const ajv = new Ajv({ allErrors: true, strict: true, verbose: true, allowUnionTypes: true });
  const validate = ajv.compile(schema);
  const locations = new Map<object, string>();
  const walk = (node: unknown, at: string) => {
    if (node === null || typeof node !== 'object') return;
    if (!Array.isArray(node)) locations.set(node, at);
    for (const [k, v] of Object.entries(node)) walk(v, `${at}/${k}`);
  };
  walk(schema, '');
  const compiled = { schema, validate, locations };
  cached.set(name, compiled);
  return compiled;
}

export function modelSchemaPath(): string {
  return schemaFilePath(MODEL_SCHEMA);
}

export function compiledModelSchema(): CompiledSchema {
  return compiledSchemaFile(MODEL_SCHEMA);
}

/** All structural errors of `value` (an empty list when it conforms). */
export function validateAgainstSchema(value: unknown): ErrorObject[] {
  const { validate } = compiledModelSchema();
  return validate(value) ? [] : [...(validate.errors ?? [])];
}
