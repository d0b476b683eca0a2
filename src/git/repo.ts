/**
 * Finding the repository and naming commits in it. A Repo is just its work-tree root, every git
 * command runs there, and revisions are turned into full commit ids before anything else sees
 * them, so later commands get a hex id and never a user-spelled revision.
 */
import { resolve } from 'node:path';
import { GitError } from './git-error.js';
import { checkRevision } from './git-input.js';
import { findGit, gitFailure, runGit, runGitOk } from './run-git.js';

export interface Repo {
  /** Absolute path of the top of the work tree. */
  readonly root: string;
}

const FULL_ID = /^(?:[0-9a-f]{40}|[0-9a-f]{64})$/;

/** The repository whose work tree contains `cwd`; undefined outside one or when git is missing. */
export function openRepo(cwd: string): Repo | undefined {
  if (findGit() === undefined) return undefined;
  const dir = resolve(cwd);
  let r;
  try {
    r = runGit(dir, ['rev-parse', '--show-toplevel']);
  } catch (err) {
    if (err instanceof GitError && /no such directory/.test(err.message)) return undefined;
    throw err;
  }
  if (r.status === 0) {
    // Only the final newline is git's; a directory name may itself end in spaces.
    const top = r.stdout.toString('utf8').replace(/\r?\n$/, '');
    return top === '' ? undefined : { root: resolve(top) };
  }
  // Bare repositories and the inside of `.git` have no work tree to check. Anything else (for
  // example git refusing a repository owned by another user) must not pass for "not a repo".
  if (/not a git repository|must be run in a work tree/i.test(r.stderr)) return undefined;
  throw gitFailure(['rev-parse', '--show-toplevel'], r);
}

/** Full commit id of `rev`, or undefined if it names no commit present in this clone. */
export function resolveCommit(repo: Repo, rev: string): string | undefined {
  checkRevision(rev);
  const args = ['rev-parse', '--verify', '--quiet', `${rev}^{commit}`];
  const r = runGit(repo.root, args);
  if (r.status === 1) return undefined;
  if (r.status !== 0) throw gitFailure(args, r);
  // `--verify` still echoes `^<id>` for `^REV`, which is a negation and not a commit.
  const id = r.stdout.toString('utf8').trim();
  return FULL_ID.test(id) ? id : undefined;
}

/** Like resolveCommit, but an unknown revision is an error worth telling the user about. */
export function requireCommit(repo: Repo, rev: string): string {
  const id = resolveCommit(repo, rev);
  if (id === undefined) throw new GitError(`unknown git revision '${rev}': no such commit in this clone`, '');
  return id;
}

export function isShallow(repo: Repo): boolean {
  return runGitOk(repo.root, ['rev-parse', '--is-shallow-repository']).toString('utf8').trim() === 'true';
}

/**
 * Best common ancestor of two revisions; undefined when they share no history (which in a
 * shallow clone may only mean the history was cut off). Unknown revisions throw.
 */
export function mergeBase(repo: Repo, a: string, b: string): string | undefined {
  const args = ['merge-base', requireCommit(repo, a), requireCommit(repo, b)];
  const r = runGit(repo.root, args);
  if (r.status === 1) return undefined;
  if (r.status !== 0) throw gitFailure(args, r);
  const id = r.stdout.toString('utf8').trim();
  return FULL_ID.test(id) ? id : undefined;
}

/** The empty tree's id in this repository's hash (sha1 or sha256). */
export function emptyTree(repo: Repo): string {
  const r = runGit(repo.root, ['rev-parse', '--show-object-format']);
  const format = r.status === 0 ? r.stdout.toString('utf8').trim() : 'sha1';
  return format === 'sha256'
    ? '6ef19b41225c5369f1c104d45d8d85efa9b057b53b14b4b9b939dd74decc5321'
    : '4b825dc642cb6eb9a060e54bf8d69288fbee4904';
}
