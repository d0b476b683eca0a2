/**
 * The Actions toolkit is imported in one module only, src/action/main.ts, so that everything else
 * the action renders stays a pure function that tests call without a runner or a mock.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { join, relative } from 'node:path';
import { expect, test } from 'vitest';
import { REPO } from './action-fixture.js';

function sources(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((e) =>
    e.isDirectory() ? sources(join(dir, e.name)) : e.name.endsWith('.ts') ? [join(dir, e.name)] : [],
  );
}

test('only src/action/main.ts imports @actions/core', () => {
  const importers = sources(join(REPO, 'src'))
    .filter((f) => /from\s+['"]@actions\//.test(readFileSync(f, 'utf8')))
    .map((f) => relative(REPO, f).split('\\').join('/'));
  expect(importers).toEqual(['src/action/main.ts']);
});
