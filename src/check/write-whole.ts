/**
 * Report files (JSON, SARIF, JUnit) are written through a temporary file and a rename, so that a
 * later step or a reader never sees half a report. Shared by the CLI and the Action.
 */
import { mkdirSync, renameSync, writeFileSync } from 'node:fs';
import { dirname } from 'node:path';

export function writeWhole(path: string, text: string): void {
  mkdirSync(dirname(path), { recursive: true });
  const tmp = `${path}.tmp-${process.pid}`;
  writeFileSync(tmp, text);
  renameSync(tmp, path);
}
