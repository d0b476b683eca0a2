/**
 * Changed-file lists in the three comparisons (work tree, HEAD, index) and for a commit about to
 * be made, with additions, edits, deletions, untracked and ignored files, and names with spaces
 * and non-ASCII letters; plus merge bases between branches.
 */
import { mkdirSync, rmSync, symlinkSync, unlinkSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, describe, expect, test } from 'vitest';
import { changedFiles, GitError, mergeBase, openRepo, stagedFiles, type Repo } from '../../src/git/git.js';
import { git, makeRepo, repoOf as open, removeTempDirs, type TempRepo } from './git-fixture.js';

afterAll(removeTempDirs);

describe('changedFiles', () => {
  const t = makeRepo({
    '.gitignore': 'ignored/\n',
    'models/a.yaml': 'a: 1\n',
    'models/b c.yaml': 'b: 1\n',
    'models/ü/d.yaml': 'd: 1\n',
    'old.yaml': 'old\n',
  });
  const first = t.commitAll('first');
  t.write('models/a.yaml', 'a: 2\n');
  t.git('rm', '-q', 'old.yaml');
  t.write('models/new one.yaml', 'n\n');
  t.commitAll('second');
  // Uncommitted state on top of `second`:
  t.write('models/b c.yaml', 'b: 2\n'); // edited, not staged
  t.write('models/ü/d.yaml', 'd: 2\n'); // edited and staged
  t.git('add', 'models/ü/d.yaml');
  unlinkSync(join(t.dir, 'models/a.yaml')); // deleted, not staged
  t.write('staged-new.yaml', 's\n'); // new and staged
  t.git('add', 'staged-new.yaml');
  t.write('drafts/ünï côde.yaml', 'u\n'); // untracked
  t.write('ignored/x.yaml', 'i\n'); // ignored
  const repo = open(t);

  test('head: commits only, whatever the work tree holds', () => {
    expect(changedFiles(repo, first, { against: 'head' })).toEqual([
      { path: 'models/a.yaml', status: 'M' },
      { path: 'models/new one.yaml', status: 'A' },
      { path: 'old.yaml', status: 'D' },
    ]);
    expect(changedFiles(repo, 'HEAD', { against: 'head' })).toEqual([]);
  });

  test('worktree (the default): tracked changes plus untracked files, not ignored ones', () => {
    expect(changedFiles(repo, 'HEAD')).toEqual([
      { path: 'drafts/ünï côde.yaml', status: 'A' },
      { path: 'models/a.yaml', status: 'D' },
      { path: 'models/b c.yaml', status: 'M' },
      { path: 'models/ü/d.yaml', status: 'M' },
      { path: 'staged-new.yaml', status: 'A' },
    ]);
    expect(changedFiles(repo, first, { against: 'worktree' })).toEqual([
      { path: 'drafts/ünï côde.yaml', status: 'A' },
      { path: 'models/a.yaml', status: 'D' },
      { path: 'models/b c.yaml', status: 'M' },
      { path: 'models/new one.yaml', status: 'A' },
      { path: 'models/ü/d.yaml', status: 'M' },
      { path: 'old.yaml', status: 'D' },
      { path: 'staged-new.yaml', status: 'A' },
    ]);
  });

  test('staged: the index against the base', () => {
    expect(changedFiles(repo, 'HEAD', { against: 'staged' })).toEqual([
      { path: 'models/ü/d.yaml', status: 'M' },
      { path: 'staged-new.yaml', status: 'A' },
    ]);
    expect(changedFiles(repo, first, { against: 'staged' })).toEqual([
      { path: 'models/a.yaml', status: 'M' },
      { path: 'models/new one.yaml', status: 'A' },
      { path: 'models/ü/d.yaml', status: 'M' },
      { path: 'old.yaml', status: 'D' },
      { path: 'staged-new.yaml', status: 'A' },
    ]);
  });

  test('stagedFiles is the index against HEAD', () => {
    expect(stagedFiles(repo)).toEqual([
      { path: 'models/ü/d.yaml', status: 'M' },
      { path: 'staged-new.yaml', status: 'A' },
    ]);
  });

  test('an unknown base is a GitError', () => {
    for (const against of ['worktree', 'head', 'staged'] as const) {
      expect(() => changedFiles(repo, 'no-such-base', { against })).toThrow(/unknown git revision 'no-such-base'/);
    }
  });
});

describe('changedFiles edge cases', () => {
  test('a file removed from the index but still on disk is modified, not deleted', () => {
    const t = makeRepo({ 'keep.yaml': 'k\n' });
    t.commitAll('first');
    t.git('rm', '-q', '--cached', 'keep.yaml');
    const repo = open(t);
    expect(changedFiles(repo, 'HEAD')).toEqual([{ path: 'keep.yaml', status: 'M' }]);
    expect(changedFiles(repo, 'HEAD', { against: 'staged' })).toEqual([{ path: 'keep.yaml', status: 'D' }]);
  });

  test('a nested repository is not an untracked file', () => {
    const t = makeRepo({ 'a.yaml': 'a\n' });
    t.commitAll('first');
    const nested = join(t.dir, 'vendor/other');
    mkdirSync(nested, { recursive: true });
    git(nested, 'init', '-q', '-b', 'main');
    writeFileSync(join(nested, 'inner.yaml'), 'i\n');
    t.write('loose.yaml', 'l\n');
    expect(changedFiles(open(t), 'HEAD')).toEqual([{ path: 'loose.yaml', status: 'A' }]);
  });

  test.skipIf(process.platform === 'win32')('a type change (file to symlink) counts as modified', () => {
    const t = makeRepo({ 'target.yaml': 't\n', 'x.yaml': 'x\n' });
    t.commitAll('first');
    rmSync(join(t.dir, 'x.yaml'));
    symlinkSync('target.yaml', join(t.dir, 'x.yaml'));
    t.git('add', 'x.yaml');
    const repo = open(t);
    expect(t.git('diff', '--cached', '--name-status')).toBe('T\tx.yaml');
    expect(stagedFiles(repo)).toEqual([{ path: 'x.yaml', status: 'M' }]);
  });

  test('before the first commit, everything staged is added', () => {
    const t = makeRepo({ 'one.yaml': '1\n', 'dir/twö.yaml': '2\n', 'not-staged.yaml': '3\n' });
    t.git('add', 'one.yaml', 'dir/twö.yaml');
    const repo = open(t);
    expect(stagedFiles(repo)).toEqual([
      { path: 'dir/twö.yaml', status: 'A' },
      { path: 'one.yaml', status: 'A' },
    ]);
    expect(() => changedFiles(repo, 'HEAD', { against: 'staged' })).toThrow(GitError);
  });

  test('a name with a newline and quotes arrives intact', () => {
    const t = makeRepo({ 'plain.yaml': 'p\n' });
    t.commitAll('first');
    const odd = process.platform === 'win32' ? 'odd "name".yaml' : 'odd\n"name".yaml';
    t.write(odd, 'o\n');
    expect(changedFiles(open(t), 'HEAD')).toEqual([{ path: odd, status: 'A' }]);
  });
});

describe('mergeBase', () => {
  const t = makeRepo({ 'f.yaml': '1\n' });
  const fork = t.commitAll('fork point');
  t.git('checkout', '-q', '-b', 'feature');
  t.write('f.yaml', 'feature\n');
  const feature = t.commitAll('feature');
  t.git('checkout', '-q', 'main');
  t.write('g.yaml', 'main\n');
  t.commitAll('main moves on');
  t.git('checkout', '-q', '--orphan', 'unrelated');
  t.write('u.yaml', 'u\n');
  t.commitAll('no shared history');
  const repo = open(t);

  test('finds the fork point of two branches', () => {
    expect(mergeBase(repo, 'main', 'feature')).toBe(fork);
    expect(mergeBase(repo, 'feature', feature)).toBe(feature);
  });

  test('undefined without shared history; unknown revisions throw', () => {
    expect(mergeBase(repo, 'main', 'unrelated')).toBeUndefined();
    expect(() => mergeBase(repo, 'main', 'nope')).toThrow(/unknown git revision 'nope'/);
  });
});
