/**
 * One revision's files, listed once and read in batches: exact contents, "absent" only for paths
 * that are not there, refusals for links, directories, conflicts, oversized files and objects
 * missing from the store (a missing base version must never pass for a new file), and a fixed
 * number of git processes however many files are read. Also the rename pairs of a diff.
 */
import { renameSync, symlinkSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, describe, expect, test, vi } from 'vitest';
import { changesSince, readAtRevision, RevisionFiles, stagedChanges } from '../../src/git/git.js';
import { conflictedRepo, makeRepo, repoOf, removeTempDirs } from './git-fixture.js';

const spawned = vi.hoisted(() => ({ git: [] as string[][] }));
vi.mock('node:child_process', async (importOriginal) => {
  const real = await importOriginal<typeof import('node:child_process')>();
  const spawnSync = ((cmd: string, args: string[], options: object) => {
    spawned.git.push(args);
    return real.spawnSync(cmd, args, options);
  }) as typeof real.spawnSync;
  return { ...real, default: { ...real, spawnSync }, spawnSync };
});

afterAll(removeTempDirs);

const MiB = 1024 * 1024;

/** Moves the loose object of `path` at HEAD out of the store, as a damaged or partial clone has it. */
function dropObject(dir: string, id: string): void {
  renameSync(join(dir, '.git', 'objects', id.slice(0, 2), id.slice(2)), join(dir, `${id}.removed`));
}

describe('RevisionFiles at a commit', () => {
  const t = makeRepo({ 'configs/base model.yaml': 'a: 1\n', 'configs/ünï/模型.yaml': 'b: 2\n', 'big.yaml': 'x'.repeat(4 * MiB + 1) });
  symlinkSync('../big.yaml', join(t.dir, 'configs/link.yaml'));
  const commit = t.commitAll('first');
  const repo = repoOf(t);
  const files = RevisionFiles.atCommit(repo, commit);

  test('lists every entry and reads exact contents', () => {
    expect(files.paths()).toEqual(['big.yaml', 'configs/base model.yaml', 'configs/link.yaml', 'configs/ünï/模型.yaml']);
    expect(files.read('configs/base model.yaml')).toEqual({ kind: 'file', text: 'a: 1\n' });
    expect(files.read('configs/ünï/模型.yaml')).toEqual({ kind: 'file', text: 'b: 2\n' });
    expect(files.isDirectory('configs/ünï')).toBe(true);
  });

  test('absent, directory, symbolic link and oversized are told apart', () => {
    expect(files.read('configs/missing.yaml')).toEqual({ kind: 'absent' });
    expect(files.read('configs')).toMatchObject({ kind: 'refused', code: 'directory' });
    expect(files.read('configs/link.yaml')).toMatchObject({ kind: 'refused', code: 'symlink' });
    expect(files.read('big.yaml')).toMatchObject({ kind: 'refused', code: 'too-large', message: `big.yaml at ${commit.slice(0, 12)} is ${4 * MiB + 1} bytes; files larger than ${4 * MiB} bytes (4 MiB) are refused` });
  });
});

test('an object missing from the store is a refusal, never "absent"', () => {
  const t = makeRepo({ 'configs/a.yaml': 'a: 1\n', 'configs/b.yaml': 'b: 1\n' });
  const commit = t.commitAll('first');
  const id = t.git('rev-parse', `${commit}:configs/a.yaml`);
  dropObject(t.dir, id);
  const files = RevisionFiles.atCommit(repoOf(t), commit);
  expect(files.read('configs/a.yaml')).toEqual({
    kind: 'refused',
    code: 'missing-object',
    message: `configs/a.yaml at ${commit.slice(0, 12)} (object ${id.slice(0, 12)}) is missing from this clone's object store, so it cannot be compared; fetch the missing history (a full clone) and run again`,
  });
  expect(files.read('configs/b.yaml')).toEqual({ kind: 'file', text: 'b: 1\n' });
  // The single-file reader used to take the missing object for an absent path.
  expect(() => readAtRevision(repoOf(t), commit, 'configs/a.yaml')).toThrow(/is missing from this clone's object store/);
});

test('the index: staged contents and unresolved conflicts', () => {
  const t = conflictedRepo({ 'n.yaml': 'n\n' });
  t.write('n.yaml', 'staged\n');
  t.git('add', 'n.yaml');
  const index = RevisionFiles.inIndex(repoOf(t));
  expect(index.read('m.yaml')).toMatchObject({ kind: 'refused', code: 'conflict' });
  expect(index.read('n.yaml')).toEqual({ kind: 'file', text: 'staged\n' });
});

test('reading 300 files costs a listing and one batch: three git processes', () => {
  const files: Record<string, string> = {};
  for (let i = 0; i < 300; i++) files[`configs/c${i}.yaml`] = `i: ${i}\n`;
  const t = makeRepo(files);
  const commit = t.commitAll('many');
  const repo = repoOf(t);
  spawned.git.length = 0;
  const at = RevisionFiles.atCommit(repo, commit);
  at.prefetch(at.paths());
  const texts = new Map(at.paths().map((p) => [p, at.read(p)]));
  expect(texts.size).toBe(300);
  expect(texts.get('configs/c299.yaml')).toEqual({ kind: 'file', text: 'i: 299\n' });
  expect(spawned.git.map((a) => a.slice(2, 4).join(' '))).toEqual(['ls-tree -r', 'cat-file --batch-check', 'cat-file --batch']);
});

describe('renames', () => {
  test('a moved and edited config is paired with its old path, committed or staged', () => {
    const t = makeRepo({ 'configs/a.yaml': 'model:\n  input: {shape: [8]}\n  layers:\n    - conv: {channels: 64}\n    - pool: {global: true}\n' });
    const base = t.commitAll('base');
    t.git('mv', 'configs/a.yaml', 'configs/b.yml');
    t.write('configs/b.yml', 'model:\n  input: {shape: [8]}\n  layers:\n    - conv: {channels: 8}\n    - pool: {global: true}\n');
    t.git('add', 'configs/b.yml');
    const repo = repoOf(t);
    expect([...stagedChanges(repo).renames]).toEqual([['configs/a.yaml', 'configs/b.yml']]);
    t.commitAll('move');
    const changes = changesSince(repo, base, { against: 'head' });
    expect(changes.files).toEqual([
      { path: 'configs/a.yaml', status: 'D' },
      { path: 'configs/b.yml', status: 'A' },
    ]);
    expect([...changes.renames]).toEqual([['configs/a.yaml', 'configs/b.yml']]);
    expect([...changesSince(repo, base).renames]).toEqual([['configs/a.yaml', 'configs/b.yml']]);
  });
});
