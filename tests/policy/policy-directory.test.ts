/**
 * Loading a directory of policies: which files count, their order, and how a failing file or a
 * repeated id affects the others.
 */
import { readdirSync, symlinkSync } from 'node:fs';
import { join } from 'node:path';
import { afterEach, beforeEach, describe, expect, test } from 'vitest';
import { loadPolicyDirectory } from '../../src/policy/load-policy.js';
import { tempRepo, where, type TempRepo } from './helpers.js';

let repo: TempRepo;
beforeEach(() => {
  repo = tempRepo();
});
afterEach(() => repo.remove());

const policy = (id: string, extra = '') => `id: ${id}\ndescription: d\n${extra}`;

describe('loadPolicyDirectory', () => {
  test('every *.yaml and *.yml directly in the directory, sorted by name', () => {
    repo.write('policies/b.yml', policy('b'));
    repo.write('policies/a.yaml', policy('a'));
    repo.write('policies/C.yaml', policy('c'));
    repo.write('policies/notes.md', 'not a policy');
    repo.write('policies/x.yaml.bak', 'id: [');
    repo.write('policies/nested/d.yaml', policy('d'));
    const r = loadPolicyDirectory(repo.path('policies'), { repoRoot: repo.root });
    expect(r.diagnostics).toEqual([]);
    expect(r.policies.map((p) => [p.id, p.file])).toEqual([
      ['c', join(repo.path('policies'), 'C.yaml')],
      ['a', join(repo.path('policies'), 'a.yaml')],
      ['b', join(repo.path('policies'), 'b.yml')],
    ]);
  });

  test('a failing file gives diagnostics and the others still load', () => {
    repo.write('policies/a.yaml', policy('a'));
    repo.write('policies/b.yaml', 'id: b\ndescription: d\nunproven: maybe\n');
    repo.write('policies/c.yaml', policy('c'));
    const r = loadPolicyDirectory(repo.path('policies'), { repoRoot: repo.root });
    expect(r.policies.map((p) => p.id)).toEqual(['a', 'c']);
    expect(r.diagnostics.map((d) => [d.file, where(d)])).toEqual([[repo.path('policies/b.yaml'), 'policy/invalid-value@3:11']]);
  });

  test('two policies with the same id: an error at the second', () => {
    repo.write('policies/a.yaml', policy('same'));
    repo.write('policies/b.yaml', `# the copy\n${policy('same')}`);
    const r = loadPolicyDirectory(repo.path('policies'), { repoRoot: repo.root });
    expect(r.policies.map((p) => p.file)).toEqual([repo.path('policies/a.yaml')]);
    expect(r.diagnostics.map((d) => [d.file, where(d)])).toEqual([[repo.path('policies/b.yaml'), 'policy/duplicate-id@2:5']]);
  });

  test('a broken parent shared by two children is reported once, each child fails at its extends', () => {
    repo.write('base/org.yaml', 'id: org\ndescription: d\nsurogate: tree\n');
    repo.write('policies/a.yaml', policy('a', 'extends: ../base/org.yaml\n'));
    repo.write('policies/b.yaml', policy('b', 'extends: ../base/org.yaml\n'));
    const r = loadPolicyDirectory(repo.path('policies'), { repoRoot: repo.root });
    expect(r.policies).toEqual([]);
    const org = join(repo.path('policies'), '../base/org.yaml');
    expect(r.diagnostics.map((d) => [d.file, where(d)])).toEqual([
      [repo.path('policies/a.yaml'), 'policy/extends-failed@3:10'],
      [org, 'policy/unknown-field@3:1'],
      [repo.path('policies/b.yaml'), 'policy/extends-failed@3:10'],
    ]);
  });

  test('a base policy in the same directory loads by itself and governs nothing', () => {
    repo.write('policies/org-base.yaml', policy('org-base', 'unproven: fail\n'));
    repo.write('policies/team.yaml', policy('team', 'extends: ./org-base.yaml\napplies_to: ["x/*.yaml"]\n'));
    const r = loadPolicyDirectory(repo.path('policies'), { repoRoot: repo.root });
    expect(r.policies.map((p) => [p.id, p.unproven, p.appliesTo])).toEqual([
      ['org-base', 'fail', []],
      ['team', 'fail', ['x/*.yaml']],
    ]);
  });

  test('a symbolic link, to a policy file or to the directory, is an error at the link and never followed', () => {
    repo.write('shared/a.yaml', policy('a'));
    repo.write('policies/b.yaml', policy('b'));
    symlinkSync(repo.path('shared/a.yaml'), repo.path('policies/a.yaml'));
    const r = loadPolicyDirectory(repo.path('policies'), { repoRoot: repo.root });
    expect(r.policies.map((p) => p.id)).toEqual(['b']);
    expect(r.diagnostics.map((d) => [d.file, where(d)])).toEqual([[repo.path('policies/a.yaml'), 'policy/symlink']]);
    symlinkSync(repo.path('shared'), repo.path('linked'));
    const linked = loadPolicyDirectory(repo.path('linked'), { repoRoot: repo.root });
    expect([linked.policies, linked.diagnostics.map((d) => [d.file, where(d)])]).toEqual([[], [[repo.path('linked'), 'policy/symlink']]]);
  });

  test('a directory that cannot be read', () => {
    const r = loadPolicyDirectory(repo.path('nope'), { repoRoot: repo.root });
    expect([r.policies, r.diagnostics.map((d) => [d.file, where(d)])]).toEqual([[], [[repo.path('nope'), 'policy/unreadable']]]);
  });

  test('the policies shipped with the demo load', () => {
    const r = loadPolicyDirectory(join(process.cwd(), 'policies'), { repoRoot: process.cwd() });
    expect(r.diagnostics).toEqual([]);
    const files = readdirSync('policies').filter((n) => /\.ya?ml$/.test(n));
    expect(files.length).toBeGreaterThan(0);
    expect(r.policies.map((p) => p.file)).toEqual(files.sort().map((n) => join(process.cwd(), 'policies', n)));
  });
});
