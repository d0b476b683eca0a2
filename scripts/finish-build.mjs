// Makes the built CLI entry executable and copies the JSON Schemas next to the build, so that
// `npx rankfloor` works straight after `npm ci` (the `prepare` script runs the build).
import { chmodSync, cpSync, existsSync } from 'node:fs';

chmodSync('build/cli/main.js', 0o755);
if (existsSync('schema')) cpSync('schema', 'build/schema', { recursive: true });
