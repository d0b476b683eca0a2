/**
 * The structural schema of policy files (`schema/policy.schema.json`), compiled and mapped to
 * diagnostics by the config loader's machinery. The schema states every rule so that editors can
 * validate policies too, but some rules read better from the loader's own checks, which know the
 * built-in vocabulary and the exact syntax: name patterns, the min_rank syntax, relative
 * applies_to globs and "exactly one of min_rank and min_bits". The validator's errors for those
 * are dropped here so that each problem is reported once, by the check with the clearer message.
 */
import type { ErrorObject } from 'ajv';
import type { DiagnosticSink } from '../config/diagnostic-sink.js';
import type { Located } from '../config/located-value.js';
import { toPlain } from '../config/located-value.js';
import { compiledSchemaFile, schemaFilePath } from '../config/model-schema.js';
import { reportSchemaErrors } from '../config/schema-errors.js';

const POLICY_SCHEMA = 'policy.schema.json';

/** The requirement's "exactly one of min_rank and min_bits" (see the schema file). */
const MINIMUM_CHOICE = '/definitions/requirement/allOf/1';

export function policySchemaPath(): string {
  return schemaFilePath(POLICY_SCHEMA);
}

/** Validates the policy tree and reports the structural problems the loader does not check itself. */
export function reportPolicySchemaErrors(root: Located, sink: DiagnosticSink): void {
  const { validate, locations } = compiledSchemaFile(POLICY_SCHEMA);
  if (validate(toPlain(root))) return;
  const where = (e: ErrorObject) => (e.parentSchema ? locations.get(e.parentSchema) : undefined) ?? '';
  const errors = (validate.errors ?? []).filter(
    (e) => e.keyword !== 'pattern' && e.keyword !== 'propertyNames' && !where(e).startsWith(MINIMUM_CHOICE),
  );
  reportSchemaErrors(errors, root, locations, sink);
}
