/**
 * `extends`: how settings, partitions and requirements merge over several levels, and the
 * errors at the extends value (cycles, escapes from the repository root, missing targets).
 */
import { symlinkSync } from 'node:fs';
import { join, relative } from 'node:path';
import { afterEach, beforeEach, describe, expect, test } from 'vitest';
import { loadPolicyFile, loadPolicyText } from '../../src/policy/load-policy.js';
import { failed, range, tempRepo, where, type TempRepo } from './helpers.js';

let repo: TempRepo;
beforeEach(() => {
  repo = tempRepo();
});
afterEach(() => repo.remove());

const ORG = `id: org
description: Organisation defaults.
surrogate: overlap
unproven: fail
max_drop_bits: 3
model_path: /training/model
applies_to: ["org/*.yaml"]
partitions:
  pair: {kind: left-right}
  shared: {kind: top-bottom}
require:
  - {partition: pair, min_rank: 8, unproven: fail}
  - {partition: checkerboard, min_rank: 16, max_drop_bits: 1}
  - {partition: left-right, min_rank: 4}
`;

const MID = `id: mid
description: A department.
extends: ../org.yaml
unproven: warn
applies_to: ["mid/**/*.yaml"]
partitions:
  shared: {kind: block, rows: [0, 4], cols: [0, 4]}
require:
  - {partition: checkerboard, min_rank: 32}
  - {partition: shared, min_rank: 2}
`;

const LEAF = `id: leaf
description: A team.
extends: ../mid.yaml
surrogate: tree
partitions:
  mine: {kind: positions, positions: [1, 2]}
require:
  - {partition: left-right, min_bits: 3}
  - {partition: mine, min_rank: 5}
`;

describe('three levels: override, inherit, merge', () => {
  test('settings are the nearest file’s; requirements keep their place and their file', () => {
    repo.write('org.yaml', ORG);
    repo.write('dept/mid.yaml', MID);
    const leafFile = repo.write('dept/team/leaf.yaml', LEAF);
    const r = loadPolicyFile(leafFile, { repoRoot: repo.root });
    if (!r.ok) throw new Error(r.diagnostics.map(where).join('\n'));
    const p = r.policy;
    const org = join(repo.root, 'org.yaml');
    const mid = join(repo.root, 'dept/mid.yaml');
    expect([p.id, p.description, p.file]).toEqual(['leaf', 'A team.', leafFile]);
    expect(p.chain).toEqual([leafFile, mid, org]);
    expect([p.surrogate, p.modelPath, p.appliesTo, p.unproven, p.maxDropBits]).toEqual(['tree', '/training/model', ['mid/**/*.yaml'], 'warn', 3]);
    expect([...p.partitions.values()].map((x) => [x.name, x.spec, x.file])).toEqual([
      ['pair', 'left-right', org],
      // Redefined by the middle policy: its definition, in the parent's place.
      ['shared', 'block:0-4,0-4', mid],
      ['mine', 'positions:1,2', leafFile],
    ]);
    expect(p.requirements.map((x) => [x.partition, x.minRank, x.written, x.unproven, x.maxDropBits, x.file, range(x.span)])).toEqual([
      // Inherited from the root with its own `unproven`.
      ['pair', 8n, 'min_rank: 8', 'fail', 3, org, '12:5-12:51'],
      // Replaced by the middle file (the root's max_drop_bits: 1 went with it).
      ['checkerboard', 32n, 'min_rank: 32', 'warn', 3, mid, '9:5-9:44'],
      // Replaced by the leaf, in the root's place.
      ['left-right', 8n, 'min_bits: 3', 'warn', 3, leafFile, '8:5-8:41'],
      ['shared', 2n, 'min_rank: 2', 'warn', 3, mid, '10:5-10:37'],
      ['mine', 5n, 'min_rank: 5', 'warn', 3, leafFile, '9:5-9:35'],
    ]);
  });

  test('relative policy paths stay relative in file, chain and requirements', () => {
    repo.write('org.yaml', ORG);
    repo.write('dept/mid.yaml', MID);
    repo.write('dept/team/leaf.yaml', LEAF);
    const cwd = process.cwd();
    const rel = relative(cwd, repo.path('dept/team/leaf.yaml'));
    const r = loadPolicyFile(rel, { repoRoot: repo.root });
    if (!r.ok) throw new Error(r.diagnostics.map(where).join('\n'));
    expect(r.policy.chain).toEqual([rel, join(rel, '../../mid.yaml'), join(rel, '../../../org.yaml')]);
    expect(r.policy.requirements[0]!.file).toBe(join(rel, '../../../org.yaml'));
  });

  test('a parent’s named partition is visible to the child’s requirements; a sibling’s is not', () => {
    repo.write('org.yaml', ORG);
    const ok = loadPolicyText('id: c\ndescription: d\nextends: org.yaml\nrequire:\n  - {partition: pair, min_rank: 2}\n', repo.path('c.yaml'), { repoRoot: repo.root });
    expect(ok.ok).toBe(true);
    const bad = loadPolicyText('id: c\ndescription: d\nextends: org.yaml\nrequire:\n  - {partition: mine, min_rank: 2}\n', repo.path('c.yaml'), { repoRoot: repo.root });
    expect(failed(bad).map(where)).toEqual(['policy/unknown-partition@5:17']);
  });

  test('absent applies_to and settings are inherited; the child can set applies_to to nothing', () => {
    repo.write('org.yaml', ORG);
    const inherit = loadPolicyText('id: c\ndescription: d\nextends: ./org.yaml\n', repo.path('c.yaml'), { repoRoot: repo.root });
    const none = loadPolicyText('id: c\ndescription: d\nextends: ./org.yaml\napplies_to: []\n', repo.path('c.yaml'), { repoRoot: repo.root });
    if (!inherit.ok || !none.ok) throw new Error('expected both to load');
    expect([inherit.policy.appliesTo, inherit.policy.surrogate, inherit.policy.unproven]).toEqual([['org/*.yaml'], 'overlap', 'fail']);
    expect(none.policy.appliesTo).toEqual([]);
  });

  test('an injected reader serves the extends targets', () => {
    const files = new Map([[join('/virtual/repo', 'org.yaml'), ORG]]);
    const readFile = (path: string) => {
      const text = files.get(path);
      if (text === undefined) throw Object.assign(new Error(`ENOENT: ${path}`), { code: 'ENOENT' });
      return text;
    };
    const r = loadPolicyText('id: c\ndescription: d\nextends: org.yaml\n', '/virtual/repo/c.yaml', { repoRoot: '/virtual/repo' }, readFile);
    if (!r.ok) throw new Error(r.diagnostics.map(where).join('\n'));
    expect(r.policy.chain).toEqual(['/virtual/repo/c.yaml', '/virtual/repo/org.yaml']);
    const missing = loadPolicyText('id: c\ndescription: d\nextends: nope.yaml\n', '/virtual/repo/c.yaml', { repoRoot: '/virtual/repo' }, readFile);
    expect(failed(missing).map(where)).toEqual(['policy/extends-missing@3:10']);
  });
});

test('an injected reader gets paths below the root as given, also when the root is a link', () => {
  repo.write('real/org.yaml', ORG);
  symlinkSync(repo.path('real'), repo.path('alias'));
  const asked: string[] = [];
  const readFile = (path: string) => {
    asked.push(path);
    return ORG;
  };
  const r = loadPolicyText('id: c\ndescription: d\nextends: org.yaml\n', repo.path('alias/c.yaml'), { repoRoot: repo.path('alias') }, readFile);
  expect(r.ok).toBe(true);
  expect(asked).toEqual([repo.path('alias/org.yaml')]);
});

describe('extends errors, at the extends value', () => {
  test('a cycle a → b → a is reported where it closes, and the start fails with it', () => {
    const a = repo.write('a.yaml', 'id: a\ndescription: d\nextends: b.yaml\n');
    const b = repo.write('b.yaml', 'id: b\ndescription: d\nextends: ./a.yaml\n');
    const ds = failed(loadPolicyFile(a, { repoRoot: repo.root }));
    expect(ds.map((d) => [d.file, where(d)])).toEqual([
      [a, 'policy/extends-failed@3:10'],
      [b, 'policy/extends-cycle@3:10'],
    ]);
    expect(ds[1]!.message).toContain(`${a} → ${b} → ${a}`);
  });

  test('a policy that extends itself, by its name or by a detour', () => {
    const a = repo.write('a.yaml', 'id: a\ndescription: d\nextends: a.yaml\n');
    expect(failed(loadPolicyFile(a, { repoRoot: repo.root })).map(where)).toEqual(['policy/extends-cycle@3:10']);
    const detour = `../${relative(join(repo.root, '..'), repo.path('sub'))}/../b.yaml`;
    const b = repo.write('b.yaml', `id: b\ndescription: d\nextends: ${detour}\n`);
    expect(failed(loadPolicyFile(b, { repoRoot: repo.root })).map(where)).toEqual(['policy/extends-cycle@3:10']);
  });

  test('a target that does not exist', () => {
    const a = repo.write('a.yaml', 'id: a\ndescription: d\nextends: ./base.yaml\n');
    expect(failed(loadPolicyFile(a, { repoRoot: repo.root })).map(where)).toEqual(['policy/extends-missing@3:10']);
    const dir = repo.write('d.yaml', 'id: d\ndescription: d\nextends: ./sub\n');
    repo.write('sub/x.yaml', 'id: x\ndescription: d\n');
    expect(failed(loadPolicyFile(dir, { repoRoot: repo.root })).map(where)).toEqual(['policy/extends-unreadable@3:10']);
  });

  test('targets outside the repository root (by .., by an absolute path); a symbolic link on the way is never followed', () => {
    const outside = tempRepo('rankfloor-outside-');
    try {
      outside.write('outside.yaml', 'id: o\ndescription: d\n');
      const nested = repo.write('policies/team/a.yaml', 'id: a\ndescription: d\nextends: ../../../outside.yaml\n');
      expect(failed(loadPolicyFile(nested, { repoRoot: repo.root })).map(where)).toEqual(['policy/extends-outside-root@3:10']);
      // Does not exist either, but the escape is what matters.
      const dotdot = repo.write('policies/b.yaml', 'id: b\ndescription: d\nextends: ../../outside.yaml\n');
      expect(failed(loadPolicyFile(dotdot, { repoRoot: repo.root })).map(where)).toEqual(['policy/extends-outside-root@3:10']);
      const absolute = repo.write('c.yaml', `id: c\ndescription: d\nextends: ${outside.path('outside.yaml')}\n`);
      expect(failed(loadPolicyFile(absolute, { repoRoot: repo.root })).map(where)).toEqual(['policy/extends-outside-root@3:10']);
      symlinkSync(outside.root, repo.path('linked'));
      const viaLink = repo.write('d.yaml', 'id: d\ndescription: d\nextends: linked/outside.yaml\n');
      expect(failed(loadPolicyFile(viaLink, { repoRoot: repo.root })).map(where)).toEqual(['policy/extends-symlink@3:10']);
      // A link to a file inside the repository is refused too: it could swap one policy for another.
      repo.write('lax.yaml', 'id: lax\ndescription: d\n');
      symlinkSync(repo.path('lax.yaml'), repo.path('org.yaml'));
      const viaFileLink = repo.write('e.yaml', 'id: e\ndescription: d\nextends: org.yaml\n');
      const ds = failed(loadPolicyFile(viaFileLink, { repoRoot: repo.root }));
      expect(ds.map(where)).toEqual(['policy/extends-symlink@3:10']);
      expect(ds[0]!.message).toBe("extends 'org.yaml': org.yaml is a symbolic link; links are never followed (they could lead outside the repository), point the check at the file itself");
    } finally {
      outside.remove();
    }
  });

  test('an absolute path inside the root is fine', () => {
    repo.write('org.yaml', ORG);
    const a = repo.write('sub/a.yaml', `id: a\ndescription: d\nextends: ${repo.path('org.yaml')}\n`);
    const r = loadPolicyFile(a, { repoRoot: repo.root });
    expect(r.ok && r.policy.chain).toEqual([a, repo.path('org.yaml')]);
  });

  test('a parent with problems: its own diagnostics, in its file, and a failure at the child’s extends', () => {
    const base = repo.write('base.yaml', 'id: base\ndescription: d\nsurogate: tree\n');
    const child = repo.write('child.yaml', 'id: child\ndescription: d\nextends: base.yaml\nunproven: maybe\n');
    const ds = failed(loadPolicyFile(child, { repoRoot: repo.root }));
    expect(ds.map((d) => [d.file, where(d)])).toEqual([
      [child, 'policy/extends-failed@3:10'],
      [child, 'policy/invalid-value@4:11'],
      [base, 'policy/unknown-field@3:1'],
    ]);
  });

  test('a chain longer than 32 files', () => {
    for (let i = 0; i < 40; i++) repo.write(`p${i}.yaml`, `id: p${i}\ndescription: d\nextends: p${i + 1}.yaml\n`);
    repo.write('p40.yaml', 'id: p40\ndescription: d\n');
    const ds = failed(loadPolicyFile(repo.path('p0.yaml'), { repoRoot: repo.root }));
    expect(ds.filter((d) => d.code === 'policy/extends-too-deep').map((d) => [d.file, where(d)])).toEqual([[repo.path('p31.yaml'), 'policy/extends-too-deep@3:10']]);
    expect(ds.filter((d) => d.code === 'policy/extends-failed')).toHaveLength(31);
  });
});
