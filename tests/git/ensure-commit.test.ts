/**
 * Fetching a missing base commit into a shallow clone, the way a CI checkout of depth 1 needs it,
 * against local `file://` remotes only: a remote that serves the commit, one that refuses, one
 * that does not have it, a clone without origin, and the promise to fetch at most once.
 */
import { chmodSync, existsSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, describe, expect, test } from 'vitest';
import { ensureCommit, isShallow, openRepo, readAtRevision, resolveCommit, type Repo } from '../../src/git/git.js';
import { git, makeRepo, removeTempDirs, tempDir, type TempRepo } from './git-fixture.js';

afterAll(removeTempDirs);

const HINT = /fetch-depth: 0/;

function open(dir: string): Repo {
  const repo = openRepo(dir);
  if (repo === undefined) throw new Error(`expected ${dir} to be a repository`);
  return repo;
}

/** A remote with three commits; returns it and the commit ids, oldest first. */
function remoteWithHistory(config: Record<string, string> = {}): { remote: TempRepo; commits: string[] } {
  const remote = makeRepo();
  for (const [key, value] of Object.entries(config)) remote.git('config', key, value);
  const commits = [1, 2, 3].map((n) => {
    remote.write('models/m.yaml', `version: ${n}\n`);
    return remote.commitAll(`commit ${n}`);
  });
  return { remote, commits };
}

/** `git clone --depth=1`; file:// makes the depth apply to a local remote. */
function shallowClone(remote: TempRepo, config: Record<string, string> = {}): string {
  const dir = join(tempDir(), 'clone');
  git(remote.dir, 'clone', '-q', '--depth=1', `file://${remote.dir}`, dir);
  for (const [key, value] of Object.entries(config)) git(dir, 'config', key, value);
  return dir;
}

describe('isShallow', () => {
  test('true for a depth-1 clone, false for the repository it was cloned from', () => {
    const { remote } = remoteWithHistory();
    expect(isShallow(open(shallowClone(remote)))).toBe(true);
    expect(isShallow(open(remote.dir))).toBe(false);
  });
});

describe('ensureCommit', () => {
  test('fetches a missing commit into a shallow clone', () => {
    const { remote, commits } = remoteWithHistory({ 'uploadpack.allowReachableSHA1InWant': 'true' });
    const first = commits[0] ?? '';
    const repo = open(shallowClone(remote));
    expect(resolveCommit(repo, first)).toBeUndefined();
    expect(ensureCommit(repo, first)).toEqual({ ok: true });
    expect(resolveCommit(repo, first)).toBe(first);
    expect(readAtRevision(repo, first, 'models/m.yaml')).toBe('version: 1\n');
    expect(isShallow(repo)).toBe(true);
  });

  test('the old protocol needs the remote to allow unadvertised commits, and says so when it does not', () => {
    // Protocol v0 is where uploadpack.allow*SHA1InWant is enforced, so it stands in for a strict server.
    const allowing = remoteWithHistory({ 'uploadpack.allowReachableSHA1InWant': 'true' });
    const allowed = open(shallowClone(allowing.remote, { 'protocol.version': '0' }));
    expect(ensureCommit(allowed, allowing.commits[0] ?? '')).toEqual({ ok: true });

    const refusing = remoteWithHistory();
    const refused = open(shallowClone(refusing.remote, { 'protocol.version': '0' }));
    const result = ensureCommit(refused, refusing.commits[0] ?? '');
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.message).toMatch(/is not in this shallow clone, and fetching it from origin failed/);
    expect(result.message).toMatch(/not allow request for unadvertised object/);
    expect(result.message).toMatch(HINT);
  });

  test('a commit the remote does not have is reported with the hint', () => {
    const { remote } = remoteWithHistory();
    const elsewhere = makeRepo({ 'x.yaml': 'x\n' }).commitAll('not in the remote');
    const result = ensureCommit(open(shallowClone(remote)), elsewhere);
    expect(result).toMatchObject({ ok: false, message: expect.stringMatching(HINT) });
  });

  test('a commit already present needs no remote at all', () => {
    const t = makeRepo({ 'a.yaml': 'a\n' });
    const head = t.commitAll('only');
    expect(ensureCommit(open(t.dir), head)).toEqual({ ok: true });
    expect(ensureCommit(open(t.dir), 'main')).toEqual({ ok: true });
  });

  test('without a remote named origin, or for a name rather than an id, nothing is fetched', () => {
    const t = makeRepo({ 'a.yaml': 'a\n' });
    t.commitAll('only');
    const repo = open(t.dir);
    const missing = '0123456789abcdef0123456789abcdef01234567';
    expect(ensureCommit(repo, missing)).toMatchObject({ ok: false, message: expect.stringMatching(/no remote named origin/) });
    const { remote } = remoteWithHistory();
    const clone = open(shallowClone(remote));
    const byName = ensureCommit(clone, 'origin/some-branch');
    expect(byName).toMatchObject({ ok: false, message: expect.stringMatching(/only a full commit id can be fetched/) });
    expect(byName).toMatchObject({ message: expect.stringMatching(HINT) });
  });

  test('a full clone that lacks a commit fetches it and stays a full clone', () => {
    const { remote } = remoteWithHistory();
    const dir = join(tempDir(), 'full');
    git(remote.dir, 'clone', '-q', `file://${remote.dir}`, dir);
    remote.write('models/m.yaml', 'version: 4\n');
    const later = remote.commitAll('commit 4');
    const repo = open(dir);
    expect(ensureCommit(repo, later)).toEqual({ ok: true });
    expect(readAtRevision(repo, later, 'models/m.yaml')).toBe('version: 4\n');
    expect(isShallow(repo)).toBe(false);
  });

  test.skipIf(process.platform === 'win32')('fetches at most once per commit, and never for a present one', () => {
    const { remote, commits } = remoteWithHistory();
    const dir = shallowClone(remote);
    // Count connections to the remote by wrapping the program git starts on its side.
    const counter = join(tempDir(), 'fetches.log');
    const wrapper = join(tempDir(), 'counting-upload-pack');
    writeFileSync(wrapper, `#!/bin/sh\necho fetch >> '${counter}'\nexec git upload-pack "$@"\n`);
    chmodSync(wrapper, 0o755);
    git(dir, 'config', 'remote.origin.uploadpack', wrapper);
    const fetches = (): number => (existsSync(counter) ? readFileSync(counter, 'utf8').split('\n').filter(Boolean).length : 0);

    const repo = open(dir);
    expect(ensureCommit(repo, commits[2] ?? '')).toEqual({ ok: true });
    expect(fetches()).toBe(0);

    const absent = 'ab'.repeat(20);
    const once = ensureCommit(repo, absent);
    expect(once.ok).toBe(false);
    expect(fetches()).toBe(1);
    expect(ensureCommit(repo, absent)).toEqual(once);
    expect(fetches()).toBe(1);

    expect(ensureCommit(repo, commits[0] ?? '')).toEqual({ ok: true });
    expect(fetches()).toBe(2);
  });
});
