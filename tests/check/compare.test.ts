/**
 * `check --base`, `--changed` and `--staged` through the built CLI in temporary git repositories:
 * base and head bounds per requirement, the drop limit, attribution of the changed line on the
 * minimal cut, policies judged from the base, new and deleted configs, and the staged version.
 */
import { spawnSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { describe, expect, test } from 'vitest';
import { runCli } from '../e2e/run-cli.js';
import { pyramid } from './pyramid.js';

function git(cwd: string, ...args: string[]): string {
  const r = spawnSync('git', ['-c', 'user.name=t', '-c', 'user.email=t@example.invalid', '-c', 'commit.gpgsign=false', ...args], {
    cwd,
    encoding: 'utf8',
    env: { ...process.env, GIT_CONFIG_NOSYSTEM: '1', HOME: cwd },
  });
  if (r.status !== 0) throw new Error(`git ${args.join(' ')}: ${r.stderr}`);
  return r.stdout.trim();
}

function write(root: string, path: string, text: string): void {
  mkdirSync(dirname(join(root, path)), { recursive: true });
  writeFileSync(join(root, path), text);
}

const POLICY = `id: pairs
description: left/right coupling
applies_to: ["configs/*.yaml"]
max_drop_bits: 2
require:
  - {partition: left-right, min_rank: 16}
`;

const config = (lastWidth: number): string => pyramid(lastWidth);

/** A repository with a base commit; returns its root and the base sha. */
function repo(files: Record<string, string>): { root: string; base: string } {
  const root = mkdtempSync(join(tmpdir(), 'rankfloor-git-'));
  git(root, 'init', '-q', '-b', 'main');
  for (const [p, t] of Object.entries(files)) write(root, p, t);
  git(root, 'add', '-A');
  git(root, 'commit', '-q', '-m', 'base');
  return { root, base: git(root, 'rev-parse', 'HEAD') };
}

function json(root: string, ...args: string[]) {
  const r = runCli(['check', '--policy', 'policies', '--format', 'json', ...args], root);
  return { code: r.code, doc: r.stdout ? JSON.parse(r.stdout) : undefined, stderr: r.stderr };
}

describe('check --base', () => {
  test('a head that shrinks the cut layer fails, with base, head, change and the changed line', () => {
    const { root, base } = repo({ 'policies/pairs.yaml': POLICY, 'configs/a.yaml': config(64) });
    write(root, 'configs/a.yaml', config(8));
    git(root, 'commit', '-qam', 'trim');
    const { code, doc } = json(root, '--base', base);
    expect(code).toBe(1);
    const q = doc.results[0].requirements[0];
    expect(doc.results[0].comparison).toBe('compared');
    expect(q.verdict).toBe('fail');
    // shared weights: the two left children of the top window pass only Sym^2 of their 8
    // channels, C(8 + 1, 2) = 36 (derived here), below the last layer's 64
    expect(q.base.upper).toEqual({ rank: '36', log2: 5.169925 });
    expect(q.upper).toEqual({ rank: '8', log2: 3 });
    expect(q.change_bits).toBe(-2.169925);
    expect(q.drop_fails).toBe(true);
    // line 8 of the head config: `- conv: {channels: 8, name: last}`, the channels value at column 24
    expect(q.attributed).toEqual([{ layer: 'last', field: 'channels', from: '64', to: '8', line: 8, column: 24 }]);
    const text = runCli(['check', '--policy', 'policies', '--base', base], root);
    expect(text.stdout).toContain('change  base 5.17 bits → head 3.00 bits (-2.17)');
    expect(text.stdout).toContain('this change on the cut: line 8:24 layer last channels: 64 → 8');
    rmSync(root, { recursive: true, force: true });
  });

  test('a drop within max_drop_bits passes; a larger one fails although the minimum holds', () => {
    // left-right capacity of this pyramid is min(last width, C(8 + 1, 2) = 36) at the base
    const policy = POLICY.replace('min_rank: 16', 'min_rank: 4');
    const { root, base } = repo({ 'policies/pairs.yaml': policy, 'configs/a.yaml': config(64) });
    write(root, 'configs/a.yaml', config(16)); // 36 → 16: a drop of 1.17 bits
    expect(json(root, '--base', base).code).toBe(0);
    write(root, 'configs/a.yaml', config(8)); // 36 → 8: 2.17 > 2 bits (36 > 8·2^2), minimum 4 still met
    const { code, doc } = json(root, '--base', base);
    expect(code).toBe(1);
    expect(doc.results[0].requirements[0]).toMatchObject({ verdict: 'pass', drop_fails: true, change_bits: -2.169925 });
    // within 2 bits of 36 needs ⌈36 / 4⌉ = 9: the last conv's 8 channels → 9
    expect(doc.results[0].requirements[0].fix).toEqual([
      { layer: 'last', field: 'channels', line: 8, column: 24, from: 8, to: 9, added_parameters: '9', verdict: 'pass' },
    ]);
  });

  test('a pull request cannot loosen its own gate: the base policy judges, with a notice', () => {
    const { root, base } = repo({ 'policies/pairs.yaml': POLICY, 'configs/a.yaml': config(64) });
    write(root, 'configs/a.yaml', config(8));
    write(root, 'policies/pairs.yaml', POLICY.replace('min_rank: 16', 'min_rank: 4').replace('max_drop_bits: 2', 'max_drop_bits: 9'));
    const { code, doc } = json(root, '--base', base);
    expect(code).toBe(1);
    expect(doc.notices).toEqual([{ file: 'policies/pairs.yaml', line: 4, message: expect.stringContaining('base revision') }]);
    expect(doc.results[0].requirements[0].required.rank).toBe('16');
    const head = json(root, '--base', base, '--policy-from', 'head');
    expect(head.code).toBe(0);
  });

  test('new and deleted configs; --changed checks only what differs', () => {
    const { root, base } = repo({ 'policies/pairs.yaml': POLICY, 'configs/a.yaml': config(64), 'configs/b.yaml': config(64) });
    write(root, 'configs/c.yaml', config(64));
    rmSync(join(root, 'configs/b.yaml'));
    const { doc } = json(root, '--base', base);
    const states = Object.fromEntries(doc.results.map((r: { file: string; comparison: string }) => [r.file, r.comparison]));
    expect(states).toEqual({ 'configs/a.yaml': 'compared', 'configs/b.yaml': 'deleted', 'configs/c.yaml': 'new' });
    const changed = json(root, '--base', base, '--changed');
    expect(changed.doc.results.map((r: { file: string }) => r.file)).toEqual(['configs/b.yaml', 'configs/c.yaml']);
  });

  test('--changed includes every config governed by a changed policy', () => {
    const { root, base } = repo({ 'policies/pairs.yaml': POLICY, 'configs/a.yaml': config(64) });
    write(root, 'policies/pairs.yaml', POLICY.replace('min_rank: 16', 'min_rank: 32'));
    const { doc } = json(root, '--base', base, '--changed');
    expect(doc.results.map((r: { file: string }) => r.file)).toEqual(['configs/a.yaml']);
  });

  test('an unknown base revision is a usage error with the full-history hint', () => {
    const { root } = repo({ 'policies/pairs.yaml': POLICY, 'configs/a.yaml': config(64) });
    const r = runCli(['check', '--policy', 'policies', '--base', 'no-such-branch'], root);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('full history');
  });
});

describe('check --staged', () => {
  test('the staged version is judged, not the working tree', () => {
    const { root } = repo({ 'policies/pairs.yaml': POLICY, 'configs/a.yaml': config(64) });
    write(root, 'configs/a.yaml', config(8));
    git(root, 'add', 'configs/a.yaml');
    write(root, 'configs/a.yaml', config(64)); // unstaged edit back to the wide version
    const staged = json(root, '--staged');
    expect(staged.code).toBe(1);
    expect(staged.doc.results[0].requirements[0].upper.rank).toBe('8');
    git(root, 'add', 'configs/a.yaml');
    expect(json(root, '--staged').code).toBe(0);
  });

  test('nothing staged: nothing checked, exit 0', () => {
    const { root } = repo({ 'policies/pairs.yaml': POLICY, 'configs/a.yaml': config(8) });
    const r = json(root, '--staged');
    expect(r.code).toBe(0);
    expect(r.doc.results).toEqual([]);
  });
});
