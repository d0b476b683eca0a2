/**
 * `check --base`, `--changed` and `--staged` through the built CLI in temporary git repositories:
 * base and head bounds per requirement, the drop limit, attribution of the changed line on the
 * minimal cut, policies judged from the base, new and deleted configs, and the staged version.
 */
import { spawnSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
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

/**
 * A depth-2 recurrent net whose M is its width: start-end is bounded by R·C(R + T/2 − 1, T/2) above
 * (degree) and C(R + T/2 − 1, T/2) below (Levine, Sharir, Ziv, Shashua): a gap of log2 R bits.
 */
const rac = (steps: number, hidden: number, representation = ''): string =>
  `model:\n  input: {shape: [${steps}]${representation}}\n  layers:\n    - recurrent: {hidden: ${hidden}, depth: 2, name: memory}\n    - dense: {units: 1}\n`;

const MEMORY = (unproven: string): string => `id: memory
description: start-end memory
applies_to: ["configs/*.yaml"]
max_drop_bits: 1
unproven: ${unproven}
require:
  - {partition: start-end, min_rank: 16}
`;

describe('check --base: a drop is proven only by the lower bound of the base', () => {
  // Base T = 128, R = 4: between C(67, 64) = 47,905 (15.55 bits) and 4× that, 191,620 (17.55 bits).
  // Head T = 100: between C(53, 50) = 23,426 and 4× that, 93,704 (16.52 bits). The upper bound
  // falls by 1.03 bits, more than the 1 allowed, but the base is only proven to reach 15.55 bits,
  // less than 1 bit above the head's ceiling: the capacity may have dropped. (Binomials checked
  // with Python's math.comb.)
  test('only the ceilings moved, counted as a warning: "may have dropped", exit 0', () => {
    const { root, base } = repo({ 'policies/memory.yaml': MEMORY('warn'), 'configs/a.yaml': rac(128, 4) });
    write(root, 'configs/a.yaml', rac(100, 4));
    const { code, doc } = json(root, '--base', base);
    expect(code).toBe(0);
    const q = doc.results[0].requirements[0];
    expect([q.base.lower.rank, q.base.upper.rank, q.lower.rank, q.upper.rank]).toEqual(['47905', '191620', '23426', '93704']);
    expect(q).toMatchObject({ verdict: 'pass', drop: 'possible', drop_fails: false, fix: [] });
    expect(doc.results[0].verdict).toBe('pass');
    const text = runCli(['check', '--policy', 'policies', '--base', base], root).stdout;
    expect(text).toContain('DROP?     start-end');
    expect(text).toContain('may have dropped: the upper bound fell by 1.03 bits, more than max_drop_bits = 1');
    expect(text).toContain('counted as a warning (unproven: warn)');
    expect(text).toContain('(0 failing, 1 unproven, 0 passing)');
    const sarif = join(root, 'out.sarif');
    const junit = join(root, 'out.xml');
    runCli(['check', '--policy', 'policies', '--base', base, '--sarif', sarif, '--junit', junit], root);
    const results = JSON.parse(readFileSync(sarif, 'utf8')).runs[0].results;
    expect(results.map((r: { ruleId: string; level: string }) => `${r.ruleId} ${r.level}`)).toEqual(['rankfloor/capacity-may-have-dropped warning']);
    expect(readFileSync(junit, 'utf8')).toContain('may have dropped more than max_drop_bits against the base (counted as a warning by the policy)"/>');
    rmSync(root, { recursive: true, force: true });
  });

  test('only the ceilings moved, counted as failing: exit 1, and the fix offered is one that proves it, with its rule', () => {
    const { root, base } = repo({ 'policies/memory.yaml': MEMORY('fail'), 'configs/a.yaml': rac(128, 4) });
    write(root, 'configs/a.yaml', rac(100, 4));
    const { code, doc } = json(root, '--base', base);
    expect(code).toBe(1);
    const q = doc.results[0].requirements[0];
    expect(q).toMatchObject({ verdict: 'pass', drop: 'possible', drop_fails: true });
    // No drop of more than 1 bit is proven once the head's lower bound reaches ⌈191,620 / 2⌉ =
    // 95,810: with 5 hidden units (and so M = 5), C(54, 50) = 316,251 does.
    expect(q.fix).toEqual([
      { layer: 'memory', field: 'hidden', line: 4, column: 27, from: 4, to: 5, added_parameters: expect.any(String), verdict: 'pass', rule: 'published depth-2 recurrent' },
    ]);
    const text = runCli(['check', '--policy', 'policies', '--base', base], root);
    expect(text.stdout).toContain('DROP?     start-end');
    expect(text.stdout).toContain('counted as failing (unproven: fail)');
    expect(text.stdout).toContain('then proven by published depth-2 recurrent');
    rmSync(root, { recursive: true, force: true });
  });

  test('counted as failing with no change that proves it: no fix, and the report says what would settle it', () => {
    // M fixed at 4: more hidden units do not raise the published bound C(min(M, R) + T/2 − 1, T/2).
    const m = ', representation: 4';
    const { root, base } = repo({ 'policies/memory.yaml': MEMORY('fail'), 'configs/a.yaml': rac(128, 4, m) });
    write(root, 'configs/a.yaml', rac(100, 4, m));
    const { code, doc } = json(root, '--base', base);
    expect(code).toBe(1);
    expect(doc.results[0].requirements[0]).toMatchObject({ drop: 'possible', drop_fails: true, fix: [] });
    const text = runCli(['check', '--policy', 'policies', '--base', base], root).stdout;
    expect(text).toContain('not disproven: the head may keep the base\'s capacity');
    expect(text).not.toContain('fix (smallest change');
    rmSync(root, { recursive: true, force: true });
  });
});

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
    expect(q.base.upper).toMatchObject({ rank: '36', log2: 5.169925 });
    expect(q.upper).toMatchObject({ rank: '8', log2: 3 });
    // Both sides exact, so the drop is proven: the head's 8 is below the base's proven 36 / 2^2.
    expect([q.base.lower.rank, q.lower.rank, q.drop]).toEqual(['36', '8', 'proven']);
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
      { layer: 'last', field: 'channels', line: 8, column: 24, from: 8, to: 9, added_parameters: '9', verdict: 'pass', rule: 'top-window span' },
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
