/**
 * Loads the structural schemas shipped in `schema/` (`model.schema.json`, and the policy schema,
 * which the policy loader validates the same way) and their validators. The build precompiles
 * each schema into a standalone validator (`build/validators/*.cjs`, made by
 * scripts/finish-build.mjs from the schema files, which stay the source of truth), so a run loads
 * a small module instead of the validator library and its compiler: that halves the start-up of
 * the CLI. A precompiled validator is used only if it was made from the schema text found next
 * to it (a hash is compared); otherwise, and in the source tree before a build, the schema is
 * compiled at run time with the same options.
 *
 * Errors carry the schema object that failed (`parentSchema`) as an object of the loaded schema,
 * whichever way the validator was made (a precompiled module's own copies are mapped back), so
 * that messages can look up where in the schema it sits. A missing schema is an installation bug and throws.
 */
import { createHash } from 'node:crypto';
import { existsSync, readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { fileURLToPath } from 'node:url';
import type { ErrorObject, ValidateFunction } from 'ajv';
import { AJV_OPTIONS, validatorFileName } from './schema-options.js';

/** Where a shipped schema file sits relative to this module, in the source tree and in the build. */
const CANDIDATE_DIRS = ['../../schema/', '../schema/'];
/** Where the precompiled validators sit: in the build, and from the source tree once built. */
const VALIDATOR_DIRS = ['../validators/', '../../build/validators/'];
const MODEL_SCHEMA = 'model.schema.json';

export interface CompiledSchema {
  readonly schema: Record<string, unknown>;
  readonly validate: ValidateFunction;
  /** Where each schema object sits inside the schema file, as a JSON pointer (`/definitions/conv`). */
  readonly locations: ReadonlyMap<object, string>;
  /** How the validator was made: precompiled by the build, or compiled at run time. */
  readonly origin: 'precompiled' | 'runtime';
}

export type SchemaCompiler = (schema: Record<string, unknown>) => ValidateFunction;

const require = createRequire(import.meta.url);
const cached = new Map<string, CompiledSchema>();

/** Default: the validator library from node_modules, loaded only when a schema needs it. */
let compiler: SchemaCompiler = (schema) => {
  const { Ajv } = require('ajv') as typeof import('ajv');
  return new Ajv({ ...AJV_OPTIONS }).compile(schema);
};

/** Replaces the run-time compiler (the Action's bundle brings its own copy of the library). */
export function setSchemaCompiler(next: SchemaCompiler): void {
  compiler = next;
  cached.clear();
}

/** The path of a schema shipped in `schema/` (the model schema, the policy schema). */
export function schemaFilePath(name: string): string {
  for (const dir of CANDIDATE_DIRS) {
    const path = fileURLToPath(new URL(dir + name, import.meta.url));
    if (existsSync(path)) return path;
  }
  const looked = CANDIDATE_DIRS.map((dir) => dir + name).join(' and ');
  throw new Error(`${name} not found (looked for ${looked} relative to ${import.meta.url}); the installation is incomplete`);
}

/** The hash a precompiled validator records of the schema text it was made from. */
export function schemaTextHash(text: string): string {
  return createHash('sha256').update(text).digest('hex');
}

interface PrecompiledModule extends ValidateFunction {
  readonly sourceHash?: string;
  /** The module's copies of the schema objects, each with its place in the schema file. */
  readonly schemaRoots?: readonly [object, string][];
}

function precompiled(name: string, hash: string): PrecompiledModule | undefined {
  for (const dir of VALIDATOR_DIRS) {
    const path = fileURLToPath(new URL(dir + validatorFileName(name), import.meta.url));
    if (!existsSync(path)) continue;
    const mod = require(path) as PrecompiledModule;
    return mod.sourceHash === hash && mod.schemaRoots ? mod : undefined;
  }
  return undefined;
}

/** Pairs every object of a precompiled module's schema copy with the loaded schema's object. */
function pairObjects(copy: unknown, loaded: unknown, into: Map<object, object>): void {
  if (copy === null || typeof copy !== 'object' || loaded === null || typeof loaded !== 'object') return;
  if (!Array.isArray(copy)) into.set(copy, loaded);
  for (const [k, v] of Object.entries(copy)) pairObjects(v, (loaded as Record<string, unknown>)[k], into);
}

/** Validates once per schema and hands the errors back with `parentSchema` from the loaded schema. */
export function compiledSchemaFile(name: string): CompiledSchema {
  const hit = cached.get(name);
  if (hit) return hit;
  const text = readFileSync(schemaFilePath(name), 'utf8');
  const schema = JSON.parse(text) as Record<string, unknown>;
  const locations = new Map<object, string>();
  const objects = new Map<string, object>();
  const walk = (node: unknown, at: string) => {
    if (node === null || typeof node !== 'object') return;
    if (!Array.isArray(node)) {
      locations.set(node, at);
      objects.set(at, node);
    }
    for (const [k, v] of Object.entries(node)) walk(v, `${at}/${k}`);
  };
  walk(schema, '');
  const pre = precompiled(name, schemaTextHash(text));
  let validate: ValidateFunction;
  if (pre) {
    const same = new Map<object, object>();
    for (const [copy, at] of pre.schemaRoots!) pairObjects(copy, objects.get(at), same);
    const rebind = (e: ErrorObject): ErrorObject => (e.parentSchema && same.has(e.parentSchema) ? { ...e, parentSchema: same.get(e.parentSchema) as ErrorObject['parentSchema'] } : e);
    validate = ((data: unknown) => {
      const ok = pre(data) as boolean;
      validate.errors = ok ? null : (pre.errors ?? []).map(rebind);
      return ok;
    }) as ValidateFunction;
  } else validate = compiler(schema);
  const compiled: CompiledSchema = { schema, validate, locations, origin: pre ? 'precompiled' : 'runtime' };
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
