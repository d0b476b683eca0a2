/**
 * `npm run bench` is where the performance figures come from, and nothing else runs its scripts:
 * a merge once left a block unclosed and the bench could not start. The scripts must at least
 * parse (node --check compiles without running).
 */
import { spawnSync } from 'node:child_process';
import { readdirSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { expect, test } from 'vitest';

const dir = fileURLToPath(new URL('../../bench/', import.meta.url));

test.each(readdirSync(dir).filter((f) => f.endsWith('.mjs')))('bench/%s parses', (file) => {
  const r = spawnSync(process.execPath, ['--check', dir + file], { encoding: 'utf8' });
  expect(r.stderr).toBe('');
  expect(r.status).toBe(0);
});
