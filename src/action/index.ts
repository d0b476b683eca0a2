/**
 * The entry point that the runner starts (bundled into dist/action.js). It only starts the action;
 * everything else lives in main.ts, which can be imported without running anything.
 */
import { useBundledSchemaCompiler } from '../config/schema-runtime.js';
import { run } from './main.js';

useBundledSchemaCompiler();
await run();
