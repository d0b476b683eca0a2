/**
 * The validator options every shipped schema is compiled with, at build time (precompiled
 * standalone validators, scripts/finish-build.mjs) and at run time (the fallback) alike, so both
 * report the same errors: all of them, verbose (with the schema object that failed), strict.
 */
export const AJV_OPTIONS = { allErrors: true, strict: true, verbose: true, allowUnionTypes: true } as const;

/** The file name of a schema's precompiled validator in the build (`model.schema.json` → `model.schema.cjs`). */
export function validatorFileName(schemaFile: string): string {
  return schemaFile.replace(/\.json$/, '.cjs');
}
