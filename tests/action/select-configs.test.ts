/**
 * The `configs` globs over a workspace: root-relative, dot directories included, negation, a
 * leading './' accepted, and the directories a scan always skips (node_modules, build output).
 */
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { afterAll, expect, test } from 'vitest';
import { selectConfigs } from '../../src/action/select-configs.js';

const root = mkdtempSync(join(tmpdir(), 'rankfloor-select-'));
afterAll(() => rmSync(root, { recursive: true, force: true }));
for (const f of ['models/a.yaml', 'models/sub/b.yml', 'models/notes.txt', '.ci/c.yaml', 'other/d.yaml', 'node_modules/pkg/e.yaml', 'dist/f.yaml']) {
  mkdirSync(dirname(join(root, f)), { recursive: true });
  writeFileSync(join(root, f), 'model: {}\n');
}

test('globs pick YAML files of the workspace, sorted', () => {
  expect(selectConfigs(root, ['models/**'])).toEqual(['models/a.yaml', 'models/sub/b.yml']);
  expect(selectConfigs(root, ['**/*.yaml'])).toEqual(['.ci/c.yaml', 'models/a.yaml', 'other/d.yaml']);
  expect(selectConfigs(root, ['./other/*.yaml', 'models/*.yaml'])).toEqual(['models/a.yaml', 'other/d.yaml']);
});

test('a leading ! excludes; exclusions alone select nothing', () => {
  expect(selectConfigs(root, ['models/**', '!models/sub/**'])).toEqual(['models/a.yaml']);
  expect(selectConfigs(root, ['!models/**'])).toEqual([]);
  expect(selectConfigs(root, ['nowhere/*.yaml'])).toEqual([]);
});
