/**
 * Compiling a schema when the program runs, with the validator library bundled in: for the GitHub
 * Action's single-file bundle, which ships no precompiled validators and no node_modules. The CLI
 * and the library use the validators precompiled by the build instead and never load this.
 */
import { Ajv } from 'ajv';
import { setSchemaCompiler } from './model-schema.js';
import { AJV_OPTIONS } from './schema-options.js';

export function useBundledSchemaCompiler(): void {
  setSchemaCompiler((schema) => new Ajv({ ...AJV_OPTIONS }).compile(schema));
}
