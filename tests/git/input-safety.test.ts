/**
 * Untrusted revisions and paths: a revision that looks like an option is refused everywhere, paths
 * that leave the root or use another spelling are refused, file names that look like options are
 * read as names, and a missing git (or one planted in the repository) gives a GitError.
 */
import { chmodSync, existsSync, mkdirSync, realpathSync } from 'node:fs';
import { delimiter, isAbsolute, join } from 'node:path';
import { afterAll, afterEach, describe, expect, test } from 'vitest';
import {
  changedFiles,
  ensureCommit,
  GitError,
  isShallow,
  mergeBase,
  openRepo,
  readAtRevision,
  readStaged,
  resolveCommit,
  stagedFiles,
  type Repo,
} from '../../src/git/git.js';
import { makeRepo, removeTempDirs, tempDir } from './git-fixture.js';

afterAll(removeTempDirs);

const t = makeRepo({ 'models/a.yaml': 'a\n', '-n.yaml': 'dash\n', '--output=out.txt': 'looks like an option\n' });
t.commitAll('first');
const repo: Repo = { root: t.dir };

describe('revisions', () => {
  const optionLike = ['-h', '--output=/tmp/rankfloor-should-not-exist', '--all', '-'];

  test.each(optionLike)('%s is refused by every function that takes a revision', (rev) => {
    const calls: Array<() => unknown> = [
      () => resolveCommit(repo, rev),
      () => readAtRevision(repo, rev, 'models/a.yaml'),
      () => changedFiles(repo, rev),
      () => changedFiles(repo, rev, { against: 'head' }),
      () => changedFiles(repo, rev, { against: 'staged' }),
      () => mergeBase(repo, 'HEAD', rev),
      () => mergeBase(repo, rev, 'HEAD'),
      () => ensureCommit(repo, rev),
    ];
    for (const call of calls) expect(call).toThrow(/must not start with '-'/);
    expect(existsSync('/tmp/rankfloor-should-not-exist')).toBe(false);
  });

  test('empty revisions and control characters are refused', () => {
    expect(() => resolveCommit(repo, '')).toThrow(GitError);
    expect(() => resolveCommit(repo, 'HEAD\n--all')).toThrow(/control characters/);
    expect(() => resolveCommit(repo, 'HEAD\u0000')).toThrow(/control characters/);
  });
});

describe('paths', () => {
  const refused: Array<[string, RegExp]> = [
    ['/etc/passwd', /absolute/],
    ['C:/configs/a.yaml', /absolute/],
    ['../outside.yaml', /'\.\.' segment/],
    ['models/../models/a.yaml', /'\.\.' segment/],
    ['models\\a.yaml', /forward slashes/],
    ['./models/a.yaml', /'\.' segment/],
    ['models//a.yaml', /'\.' segment/],
    ['models/', /'\.' segment/],
    ['', /empty/],
  ];

  test.each(refused)('%j is refused', (path, why) => {
    expect(() => readAtRevision(repo, 'HEAD', path)).toThrow(why);
    expect(() => readStaged(repo, path)).toThrow(why);
    expect(() => readAtRevision(repo, 'HEAD', path)).toThrow(GitError);
  });

  test('names that look like options are read as names, with no side effects', () => {
    expect(readAtRevision(repo, 'HEAD', '-n.yaml')).toBe('dash\n');
    expect(readStaged(repo, '-n.yaml')).toBe('dash\n');
    expect(readAtRevision(repo, 'HEAD', '--output=out.txt')).toBe('looks like an option\n');
    expect(readStaged(repo, '--output=out.txt')).toBe('looks like an option\n');
    expect(existsSync(join(t.dir, 'out.txt'))).toBe(false);
    t.write('-n.yaml', 'changed\n');
    t.write('--cached', 'untracked\n');
    expect(changedFiles(repo, 'HEAD')).toEqual([
      { path: '--cached', status: 'A' },
      { path: '-n.yaml', status: 'M' },
    ]);
  });
});

describe('openRepo', () => {
  test('finds the top of the work tree from a subfolder', () => {
    expect(openRepo(join(t.dir, 'models'))).toEqual({ root: realpathSync(t.dir) });
  });

  test('undefined outside a repository, inside .git, and for a missing directory', () => {
    expect(openRepo(tempDir())).toBeUndefined();
    expect(openRepo(join(t.dir, '.git'))).toBeUndefined();
    expect(openRepo(join(t.dir, 'no such dir'))).toBeUndefined();
  });
});

describe('git missing from PATH', () => {
  const savedPath = process.env['PATH'];
  afterEach(() => {
    process.env['PATH'] = savedPath;
  });

  test('every call that needs git throws a GitError that says so; openRepo gives undefined', () => {
    process.env['PATH'] = tempDir();
    expect(openRepo(t.dir)).toBeUndefined();
    const calls: Array<() => unknown> = [
      () => resolveCommit(repo, 'HEAD'),
      () => isShallow(repo),
      () => readAtRevision(repo, 'HEAD', 'models/a.yaml'),
      () => readStaged(repo, 'models/a.yaml'),
      () => changedFiles(repo, 'HEAD'),
      () => stagedFiles(repo),
      () => ensureCommit(repo, 'HEAD'),
    ];
    for (const call of calls) expect(call).toThrow(/git was not found on PATH/);
  });

  test.skipIf(process.platform === 'win32')('a git inside the repository is not run through a relative PATH entry', () => {
    const planted = join(t.dir, 'bin');
    mkdirSync(planted, { recursive: true });
    t.write('bin/git', `#!/bin/sh\ntouch '${join(t.dir, 'planted-git-ran')}'\n`);
    chmodSync(join(planted, 'git'), 0o755);
    const realGit = (savedPath ?? '').split(delimiter).find((dir) => isAbsolute(dir) && existsSync(join(dir, 'git')));
    if (realGit === undefined) throw new Error('git is not on PATH');
    // A relative entry first: a plain spawn of `git` in the repository root would run bin/git.
    process.env['PATH'] = ['bin', realGit].join(delimiter);
    expect(resolveCommit(repo, 'HEAD')).toMatch(/^[0-9a-f]{40}$/);
    expect(existsSync(join(t.dir, 'planted-git-ran'))).toBe(false);
    process.env['PATH'] = 'bin';
    expect(() => resolveCommit(repo, 'HEAD')).toThrow(/git was not found on PATH/);
    expect(existsSync(join(t.dir, 'planted-git-ran'))).toBe(false);
  });
});
