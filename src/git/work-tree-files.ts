/**
 * The working tree's files as git sees them: what is tracked or could be added (not ignored), and,
 * separately, what the ignore rules keep out of the repository, with ignored directories listed
 * once (`build/`) instead of file by file. Git never descends into a symbolic link, so a linked
 * directory shows up as one entry.
 */
import type { Repo } from './repo.js';
import { runGitOk } from './run-git.js';

export interface WorkTreeListing {
  /** Tracked files and untracked files that are not ignored, root-relative; a nested repository ends in '/'. */
  readonly files: readonly string[];
  /** Ignored files, and ignored directories (ending in '/'). */
  readonly ignored: readonly string[];
}

export function listWorkTreeFiles(repo: Repo): WorkTreeListing {
  const list = (args: readonly string[]): string[] =>
    runGitOk(repo.root, ['ls-files', '-z', '--full-name', ...args])
      .toString('utf8')
      .split('\0')
      .filter((p) => p !== '');
  const files = [...new Set(list(['--cached', '--others', '--exclude-standard']))].sort();
  const ignored = list(['--others', '--ignored', '--exclude-standard', '--directory']).sort();
  return { files, ignored };
}
