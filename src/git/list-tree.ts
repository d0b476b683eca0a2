/**
 * Which files a directory holds at a commit, so that a policy directory or the configs governed
 * by a policy can be read as they were on the base branch — including files the pull request
 * deleted, which the working tree no longer shows.
 */
import { checkRootRelativePath } from './git-input.js';
import { requireCommit, type Repo } from './repo.js';
import { runGitOk } from './run-git.js';

/** Root-relative paths of the blobs below `dir` ('' for the whole tree) at `rev`, sorted. */
export function listFilesAtRevision(repo: Repo, rev: string, dir: string): string[] {
  const commit = requireCommit(repo, rev);
  const args = ['ls-tree', '-r', '-z', '--name-only', '--full-tree', commit];
  if (dir !== '' && dir !== '.') args.push('--', checkRootRelativePath(dir.replace(/\/+$/, '')));
  const out = runGitOk(repo.root, args).toString('utf8');
  return out
    .split('\0')
    .filter((p) => p.length > 0)
    .sort();
}
