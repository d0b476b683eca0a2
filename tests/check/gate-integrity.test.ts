/**
 * The ways a pull request could pass a gate it should fail, each staged in a throw-away repository
 * and run through the built CLI: a base policy's extends target or the whole policy directory
 * swapped for a link to a laxer file, a governed config renamed and shrunk, moved out of
 * applies_to, given another extension or deleted, a config under a directory a scan used to skip
 * by name, a config that is a link to a secret, and a base version missing from the object store.
 */
import { mkdirSync, readFileSync, renameSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, describe, expect, test } from 'vitest';
import { runCli } from '../e2e/run-cli.js';
import { makeRepo, removeTempDirs, tempDir, type TempRepo } from '../git/git-fixture.js';
import { pyramid } from './pyramid.js';

afterAll(removeTempDirs);

// The base's gate: a pair policy that inherits a 1-bit drop limit from the organisation base.
const ORG = 'id: org-base\ndescription: Organisation defaults.\nmax_drop_bits: 1\napplies_to: []\n';
const LAX = 'id: org-base\ndescription: Nothing to see.\napplies_to: []\n';
const PAIRS = `id: pairs
description: left/right coupling
extends: ./org-base.yaml
applies_to: ["configs/**/*.yaml"]
require:
  - {partition: left-right, min_rank: 4}
`;

const config = (lastWidth: number): string => pyramid(lastWidth);

/**
 * Base commit: the gate, a laxer copy of the organisation base elsewhere in the tree, one config.
 * Shrinking `last` from 64 to 8 channels drops left-right from C(8 + 1, 2) = 36 to 8 (2.17 bits,
 * derived here as in tests/check/compare.test.ts): within the minimum of 4, beyond the 1-bit limit.
 */
function gate(extra: Record<string, string> = {}): { repo: TempRepo; base: string } {
  const repo = makeRepo({ 'policies/org-base.yaml': ORG, 'policies/pairs.yaml': PAIRS, 'lax/org-base.yaml': LAX, 'configs/a.yaml': config(64), ...extra });
  return { repo, base: repo.commitAll('base') };
}

function check(repo: TempRepo, ...args: string[]) {
  const r = runCli(['check', '--policy', 'policies', '--format', 'json', ...args], repo.dir);
  return { ...r, doc: r.stdout ? JSON.parse(r.stdout) : undefined };
}

function codes(doc: { errors: { message: string }[] }, stderr: string): string[] {
  return [...stderr.matchAll(/\[([a-z]+\/[a-z-]+)\]$/gm)].map((m) => m[1]!).sort();
}

describe('everything that judges comes from the base tree', () => {
  test('a head that replaces the extends target by a link to a laxer file: the base limit still holds, and the link is an error', () => {
    const { repo, base } = gate();
    repo.write('configs/a.yaml', config(8));
    rmSync(join(repo.dir, 'policies/org-base.yaml'));
    symlinkSync('../lax/org-base.yaml', join(repo.dir, 'policies/org-base.yaml'));
    repo.commitAll('shrink, and point org-base at the lax copy');
    const r = check(repo, '--base', base);
    expect(r.code).toBe(2);
    expect(r.doc.results[0].requirements[0]).toMatchObject({ max_drop_bits: 1, drop_fails: true, change_bits: -2.169925 });
    expect(r.doc.results[0].verdict).toBe('fail');
    expect(r.doc.errors).toEqual([{ file: 'policies/org-base.yaml', line: null, column: null, message: expect.stringMatching(/^policies\/org-base\.yaml is a symbolic link; links are never followed/) }]);
    expect(codes(r.doc, r.stderr)).toEqual(['policy/symlink']);
  });

  test('a head that replaces the policy directory by a link to a laxer one', () => {
    const { repo, base } = gate({ 'lax/pairs.yaml': PAIRS });
    repo.write('configs/a.yaml', config(8));
    rmSync(join(repo.dir, 'policies'), { recursive: true });
    symlinkSync('lax', join(repo.dir, 'policies'));
    repo.commitAll('shrink, and swap the policy directory');
    const r = check(repo, '--base', base);
    expect(r.code).toBe(2);
    expect(r.doc.results.map((x: { verdict: string }) => x.verdict)).toEqual(['fail']);
    expect(r.doc.results[0].requirements[0]).toMatchObject({ max_drop_bits: 1, drop_fails: true });
    expect(r.doc.errors.map((e: { file: string }) => e.file)).toContain('policies');
  });

  test('an edited extends target outside the policy directory is noticed and not used', () => {
    const { repo, base } = gate({ 'policies/pairs.yaml': PAIRS.replace('./org-base.yaml', '../shared/org.yaml'), 'shared/org.yaml': ORG });
    repo.write('configs/a.yaml', config(8));
    repo.write('shared/org.yaml', ORG.replace('max_drop_bits: 1', 'max_drop_bits: 9'));
    repo.commitAll('shrink, and relax the shared base');
    const r = check(repo, '--base', base);
    expect(r.code).toBe(1);
    expect(r.doc.results[0].requirements[0]).toMatchObject({ max_drop_bits: 1, drop_fails: true });
    expect(r.doc.notices).toEqual([{ file: 'shared/org.yaml', line: 3, message: expect.stringContaining("judged with the base revision's version") }]);
  });

  test('a policy only the head has is used; a policy path that exists nowhere is an input error', () => {
    const { repo, base } = gate();
    repo.write('policies/strict.yaml', 'id: strict\ndescription: new\napplies_to: ["configs/**/*.yaml"]\nrequire:\n  - {partition: left-right, min_rank: 1000}\n');
    repo.commitAll('a new, stricter policy');
    const r = check(repo, '--base', base);
    expect(r.code).toBe(1);
    expect(r.doc.results.map((x: { policy: string; verdict: string }) => `${x.policy}:${x.verdict}`)).toEqual(['pairs:pass', 'strict:fail']);
    const none = runCli(['check', '--policy', 'nowhere', '--base', base], repo.dir);
    expect(none.code).toBe(2);
    expect(none.stderr).toContain('--policy nowhere: no such file or directory at the base revision or in the working tree');
  });
});

describe('nothing governed escapes', () => {
  test('git mv plus a shrink is compared with the base version and fails', () => {
    const { repo, base } = gate();
    repo.git('mv', 'configs/a.yaml', 'configs/b.yaml');
    repo.write('configs/b.yaml', config(8));
    repo.commitAll('rename and shrink');
    const r = check(repo, '--base', base);
    expect(r.code).toBe(1);
    expect(r.doc.results).toHaveLength(1);
    expect(r.doc.results[0]).toMatchObject({ file: 'configs/b.yaml', comparison: 'compared', renamed_from: 'configs/a.yaml', verdict: 'fail' });
    expect(r.doc.results[0].requirements[0]).toMatchObject({ drop_fails: true, change_bits: -2.169925 });
  });

  test('moved out of applies_to, renamed to another extension, deleted: a warning by default, a failure with removal: fail', () => {
    // Different contents, so that git's rename detection pairs each file with its own new path.
    const { repo, base } = gate({ 'configs/b.yaml': config(48), 'configs/c.yaml': config(32) });
    mkdirSync(join(repo.dir, 'experiments'));
    repo.git('mv', 'configs/a.yaml', 'experiments/a.yaml');
    repo.git('mv', 'configs/b.yaml', 'configs/b.json');
    repo.git('rm', '-q', 'configs/c.yaml');
    repo.commitAll('move, rename, delete');
    const r = check(repo, '--base', base);
    expect(r.code).toBe(0);
    expect(r.doc.results.map((x: Record<string, string>) => [x['file'], x['comparison'], x['moved_to'], x['verdict']])).toEqual([
      ['configs/a.yaml', 'moved-out', 'experiments/a.yaml', 'warn'],
      ['configs/b.yaml', 'moved-out', 'configs/b.json', 'warn'],
      ['configs/c.yaml', 'deleted', undefined, 'warn'],
    ]);
    expect(r.doc.results[0].moved_why).toBe('outside the applies_to of policy pairs');
    expect(r.doc.results[1].moved_why).toBe('not a YAML file (.yaml or .yml)');
    const sarif = join(repo.dir, 'out.sarif');
    runCli(['check', '--policy', 'policies', '--base', base, '--sarif', sarif], repo.dir);
    const log = JSON.parse(readFileSync(sarif, 'utf8'));
    expect(log.runs[0].results.map((x: { ruleId: string; level: string; locations: { physicalLocation: { artifactLocation: { uri: string } } }[] }) => [x.ruleId, x.level, x.locations[0]!.physicalLocation.artifactLocation.uri])).toEqual([
      ['rankfloor/config-removed', 'warning', 'configs/b.json'],
      ['rankfloor/config-removed', 'warning', 'configs/c.yaml'],
      ['rankfloor/config-removed', 'warning', 'experiments/a.yaml'],
    ]);

    repo.write('policies/pairs.yaml', `${PAIRS}removal: fail\n`);
    repo.git('mv', 'experiments/a.yaml', 'configs/a.yaml');
    const strictBase = repo.commitAll('back, and removals fail from now on');
    repo.git('mv', 'configs/a.yaml', 'configs/a.yml');
    repo.commitAll('to .yml, which the pattern does not match');
    const strict = check(repo, '--base', strictBase);
    expect(strict.code).toBe(1);
    expect(strict.doc.results.filter((x: { verdict: string }) => x.verdict === 'fail').map((x: { file: string; moved_to: string }) => [x.file, x.moved_to])).toEqual([['configs/a.yaml', 'configs/a.yml']]);
  });

  test('no directory is skipped by name: configs under build/, dist/ and node_modules/ are checked', () => {
    const { repo, base } = gate({ 'configs/build/x.yaml': config(64), 'configs/dist/y.yaml': config(64) });
    for (const f of ['configs/build/x.yaml', 'configs/dist/y.yaml', 'configs/node_modules/z.yaml']) repo.write(f, config(8));
    repo.commitAll('shrink the hidden ones, add one more');
    const r = check(repo, '--base', base);
    expect(r.code).toBe(1);
    expect(r.doc.results.map((x: { file: string; comparison: string; verdict: string }) => `${x.file}:${x.comparison}:${x.verdict}`)).toEqual([
      'configs/a.yaml:compared:pass',
      'configs/build/x.yaml:compared:fail',
      'configs/dist/y.yaml:compared:fail',
      'configs/node_modules/z.yaml:new:pass',
    ]);
    // Without a base, every one of them is found in the working tree. A minimum of 16 fails the
    // shrunk pyramids (min(8, 36) = 8 < 16, derived here) and passes the wide one (36).
    repo.write('policies/pairs.yaml', PAIRS.replace('min_rank: 4', 'min_rank: 16'));
    const plain = check(repo);
    expect(plain.doc.results.map((x: { file: string; verdict: string }) => `${x.file}:${x.verdict}`)).toEqual([
      'configs/a.yaml:pass',
      'configs/build/x.yaml:fail',
      'configs/dist/y.yaml:fail',
      'configs/node_modules/z.yaml:fail',
    ]);
  });

  test('selected files that are not checked are reported with the reason', () => {
    const { repo, base } = gate({ '.gitignore': 'configs/scratch/\n' });
    repo.write('configs/notes.txt', 'not a config\n');
    repo.write('configs/scratch/tmp.yaml', config(8));
    symlinkSync(join(repo.dir, 'lax'), join(repo.dir, 'configs/linked'));
    const r = check(repo, '--base', base);
    expect(r.doc.skipped).toEqual([
      { path: 'configs/linked/', reason: 'a symbolic link to a directory; links are not followed, so configs behind it are not checked' },
      { path: 'configs/scratch/', reason: 'a directory ignored by git; its files are not part of the repository' },
    ]);
    repo.write('policies/pairs.yaml', PAIRS.replace('configs/**/*.yaml', 'configs/**'));
    repo.commitAll('every file under configs/');
    const all = check(repo, '--base', 'HEAD');
    expect(all.doc.skipped).toContainEqual({ path: 'configs/notes.txt', reason: 'not a YAML file (.yaml or .yml)' });
  });
});

describe('links and the object store', () => {
  test('a config that is a link to a secret is an input error, and the secret is never printed', () => {
    const { repo, base } = gate();
    repo.git('config', 'http.extraheader', 'AUTHORIZATION: basic c2VjcmV0LXRva2Vu');
    symlinkSync('../.git/config', join(repo.dir, 'configs/leak.yaml'));
    symlinkSync('/proc/self/environ', join(repo.dir, 'configs/env.yaml'));
    repo.commitAll('links');
    for (const args of [['--base', base], []]) {
      const r = check(repo, ...args);
      expect(r.code).toBe(2);
      expect(r.doc.errors.map((e: { file: string }) => e.file)).toEqual(['configs/env.yaml', 'configs/leak.yaml']);
      expect(r.stdout + r.stderr).not.toContain('c2VjcmV0');
      expect(r.stdout + r.stderr).not.toContain('PATH=');
      expect(codes(r.doc, r.stderr)).toEqual(['config/symlink', 'config/symlink']);
    }
  });

  test('an excerpt quotes the version that was read: the base policy, never a file behind the link of the head', () => {
    const { repo, base } = gate({ 'policies/pairs.yaml': PAIRS.replace('applies_to', 'surogate: tree\napplies_to') });
    const outside = tempDir('rankfloor-secret-');
    writeFileSync(join(outside, 'secret.txt'), 'line one\nline two\nline three\nTOKEN=hunter2\n');
    rmSync(join(repo.dir, 'policies/pairs.yaml'));
    symlinkSync(join(outside, 'secret.txt'), join(repo.dir, 'policies/pairs.yaml'));
    repo.commitAll('link the broken policy to a secret');
    const r = runCli(['check', '--policy', 'policies', '--base', base], repo.dir);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('policies/pairs.yaml:4:1: error:');
    expect(r.stderr).toContain(' 4 | surogate: tree');
    expect(r.stderr).not.toContain('hunter2');
  });

  test('a base version missing from the object store is an error, not a new config', () => {
    const { repo, base } = gate();
    repo.write('configs/a.yaml', config(8));
    repo.commitAll('shrink');
    const id = repo.git('rev-parse', `${base}:configs/a.yaml`);
    renameSync(join(repo.dir, '.git/objects', id.slice(0, 2), id.slice(2)), join(repo.dir, 'moved-object'));
    const r = check(repo, '--base', base);
    expect(r.code).toBe(2);
    expect(r.doc.results).toEqual([]);
    expect(r.doc.errors).toEqual([{ file: 'configs/a.yaml', line: null, column: null, message: expect.stringContaining("is missing from this clone's object store") }]);
    expect(codes(r.doc, r.stderr)).toEqual(['git/missing-object']);
  });
});
