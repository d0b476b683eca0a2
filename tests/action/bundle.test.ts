/**
 * The committed bundle must be what the sources build to: GitHub runs dist/action.js as it is in
 * the repository, so a source change without `npm run bundle` would ship stale code. This
 * rebuilds into a temporary directory and compares byte for byte.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { isBuiltin } from 'node:module';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, expect, test } from 'vitest';
import { REPO } from './action-fixture.js';

const out = mkdtempSync(join(tmpdir(), 'rankfloor-bundle-'));
afterAll(() => rmSync(out, { recursive: true, force: true }));

test('dist/ is the bundle of the current sources (run `npm run bundle` and commit dist/ if not)', () => {
  const r = spawnSync(process.execPath, [join(REPO, 'scripts', 'bundle-action.mjs'), '--outdir', out], { cwd: out, encoding: 'utf8' });
  expect(r.stderr).toBe('');
  expect(r.status).toBe(0);
  for (const name of ['action.js', 'base-worker.js', 'package.json']) {
    const built = readFileSync(join(out, name));
    const committed = readFileSync(join(REPO, 'dist', name));
    // Comparing buffers would print megabytes on a mismatch; the first differing offset says enough.
    const firstDiff = built.findIndex((byte, i) => byte !== committed[i]);
    expect({ name, sameLength: built.length === committed.length, firstDiff }).toEqual({ name, sameLength: true, firstDiff: -1 });
  }
  expect(JSON.parse(readFileSync(join(REPO, 'dist', 'package.json'), 'utf8'))).toEqual({ type: 'module' });
});

test('the bundle starts with the require shim and imports nothing outside Node', () => {
  for (const file of ['action.js', 'base-worker.js']) {
    const text = readFileSync(join(REPO, 'dist', file), 'utf8');
    expect(text.split('\n', 1)[0]).toBe("import { createRequire as __createRequire } from 'module'; const require = __createRequire(import.meta.url);");
    const imports = [...text.matchAll(/^import .* from ["']([^"']+)["'];?$/gm)].map((m) => m[1]!);
    expect(imports.length).toBeGreaterThan(0);
    // Anything else would have to be installed next to the action, which the runner never does.
    expect(imports.filter((s) => !isBuiltin(s))).toEqual([]);
  }
});
