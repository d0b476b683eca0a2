/**
 * Reading files at a commit and from the index: exact contents for names with spaces and
 * non-ASCII letters, null for absent paths, GitError for unknown revisions and for entries that
 * are not readable files, the staged version winning over the work tree, and the size cap.
 */
import { symlinkSync, unlinkSync } from 'node:fs';
import { afterAll, describe, expect, test } from 'vitest';
import { GitError, openRepo, readAtRevision, readStaged, resolveCommit, type Repo } from '../../src/git/git.js';
import { conflictedRepo, makeRepo, repoOf as open, removeTempDirs, type TempRepo } from './git-fixture.js';

afterAll(removeTempDirs);

const MiB = 1024 * 1024;

describe('readAtRevision', () => {
  const t = makeRepo({
    'configs/base model.yaml': 'layers: 1\n',
    'configs/ünï côdé/模型.yaml': '名前: ü\n',
    'top.yaml': 'top: true\n',
    'crlf.yaml': '\uFEFFa: 1\r\nb: 2\r\n',
    'a*.yaml': 'star\n',
    'ab.yaml': 'plain\n',
  });
  const first = t.commitAll('first');
  t.write('configs/base model.yaml', 'layers: 2\n');
  t.git('rm', '-q', 'top.yaml');
  const second = t.commitAll('second');
  const repo = open(t);

  test('returns the contents at each revision, byte for byte', () => {
    expect(readAtRevision(repo, first, 'configs/base model.yaml')).toBe('layers: 1\n');
    expect(readAtRevision(repo, second, 'configs/base model.yaml')).toBe('layers: 2\n');
    expect(readAtRevision(repo, 'main~1', 'configs/base model.yaml')).toBe('layers: 1\n');
    expect(readAtRevision(repo, 'HEAD', 'configs/ünï côdé/模型.yaml')).toBe('名前: ü\n');
    expect(readAtRevision(repo, 'main', 'crlf.yaml')).toBe('\uFEFFa: 1\r\nb: 2\r\n');
  });

  test('glob characters in a path are literal', () => {
    expect(readAtRevision(repo, 'HEAD', 'a*.yaml')).toBe('star\n');
    expect(readAtRevision(repo, 'HEAD', 'a?.yaml')).toBeNull();
  });

  test('an absent path is null, at the revision where it is absent', () => {
    expect(readAtRevision(repo, first, 'top.yaml')).toBe('top: true\n');
    expect(readAtRevision(repo, second, 'top.yaml')).toBeNull();
    expect(readAtRevision(repo, second, 'configs/missing.yaml')).toBeNull();
    // A file cannot have children.
    expect(readAtRevision(repo, second, 'configs/base model.yaml/inner.yaml')).toBeNull();
  });

  test('an unknown revision throws and resolveCommit gives undefined', () => {
    expect(() => readAtRevision(repo, 'no-such-branch', 'top.yaml')).toThrow(GitError);
    expect(() => readAtRevision(repo, 'no-such-branch', 'top.yaml')).toThrow(/unknown git revision 'no-such-branch'/);
    expect(resolveCommit(repo, 'no-such-branch')).toBeUndefined();
    expect(resolveCommit(repo, 'main')).toBe(second);
    expect(resolveCommit(repo, 'HEAD~1')).toBe(first);
    expect(resolveCommit(repo, first.slice(0, 12))).toBe(first);
  });

  test('revisions that are not one commit resolve to undefined', () => {
    expect(resolveCommit(repo, `${first}..${second}`)).toBeUndefined();
    expect(resolveCommit(repo, '^HEAD')).toBeUndefined();
    expect(resolveCommit(repo, t.git('rev-parse', 'HEAD^{tree}'))).toBeUndefined();
    expect(resolveCommit(repo, 'f'.repeat(40))).toBeUndefined();
  });

  test('a directory is not read as a file', () => {
    expect(() => readAtRevision(repo, 'HEAD', 'configs')).toThrow(/'configs' at HEAD is a directory/);
  });
});

describe('readStaged', () => {
  test('the staged content wins over the committed and the work-tree content', () => {
    const t = makeRepo({ 'net/model one.yaml': 'v: 1\n' });
    t.commitAll('first');
    t.write('net/model one.yaml', 'v: 2\n');
    t.git('add', 'net/model one.yaml');
    t.write('net/model one.yaml', 'v: 3\n');
    expect(readStaged(open(t), 'net/model one.yaml')).toBe('v: 2\n');
  });

  test('a file that is only in the work tree is null; a newly staged one is read', () => {
    const t = makeRepo({ 'kept.yaml': 'k\n' });
    t.commitAll('first');
    t.write('untracked.yaml', 'u\n');
    t.write('ñew/staged.yaml', 's\n');
    t.git('add', 'ñew/staged.yaml');
    t.git('rm', '-q', '--cached', 'kept.yaml');
    const repo = open(t);
    expect(readStaged(repo, 'untracked.yaml')).toBeNull();
    expect(readStaged(repo, 'ñew/staged.yaml')).toBe('s\n');
    expect(readStaged(repo, 'kept.yaml')).toBeNull();
    expect(readStaged(repo, 'ñew')).toBeNull();
  });

  test('a file deleted from the work tree but still in the index is read from the index', () => {
    const t = makeRepo({ 'w.yaml': 'one\n' });
    t.commitAll('c');
    unlinkSync(`${t.dir}/w.yaml`);
    expect(readStaged(open(t), 'w.yaml')).toBe('one\n');
  });

  test('works before the first commit', () => {
    const t = makeRepo({ 'first.yaml': 'f\n' });
    t.git('add', 'first.yaml');
    expect(readStaged(open(t), 'first.yaml')).toBe('f\n');
  });

  test('an unresolved merge conflict is an error, not one side of it', () => {
    const t = conflictedRepo();
    expect(() => readStaged(open(t), 'm.yaml')).toThrow(/unresolved merge conflicts/);
  });
});

describe('entries that are not plain files', () => {
  test.skipIf(process.platform === 'win32')('a symbolic link is refused at a revision and in the index', () => {
    const t = makeRepo({ 'real.yaml': 'r\n' });
    symlinkSync('real.yaml', `${t.dir}/link.yaml`);
    t.commitAll('with link');
    const repo = open(t);
    expect(() => readAtRevision(repo, 'HEAD', 'link.yaml')).toThrow(/is a symbolic link/);
    expect(() => readStaged(repo, 'link.yaml')).toThrow(/is a symbolic link/);
    expect(readAtRevision(repo, 'HEAD', 'real.yaml')).toBe('r\n');
  });
});

describe('size cap', () => {
  const t = makeRepo({ 'exact.yaml': 'x'.repeat(4 * MiB), 'big.yaml': 'x'.repeat(4 * MiB + 1) });
  t.commitAll('sizes');
  const repo = open(t);

  test('4 MiB is read; one byte more is refused at a revision', () => {
    expect(readAtRevision(repo, 'HEAD', 'exact.yaml')).toHaveLength(4 * MiB);
    expect(() => readAtRevision(repo, 'HEAD', 'big.yaml')).toThrow(/'big.yaml' at HEAD is larger than 4 MiB/);
  });

  test('and in the index, where the size is only known while reading', () => {
    expect(readStaged(repo, 'exact.yaml')).toHaveLength(4 * MiB);
    expect(() => readStaged(repo, 'big.yaml')).toThrow(/staged 'big.yaml' is larger than 4 MiB/);
  });
});
