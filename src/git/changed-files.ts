/**
 * Which files differ from a base commit: in the work tree (a local run), at HEAD (a pull request
 * in CI) or in the index (a pre-commit hook). Output is read with `-z` so that names with spaces,
 * quotes, newlines or non-ASCII letters arrive exactly as git stores them. Every entry is one path
 * with one of three statuses the checker understands; git's rename detection pairs a deleted path
 * with the added path it became, so that a moved config can be compared with its old self.
 */
import { GitError } from './git-error.js';
import { checkRevision } from './git-input.js';
import { emptyTree, requireCommit, resolveCommit, type Repo } from './repo.js';
import { runGitOk } from './run-git.js';

export interface ChangedFile {
  /** Root-relative, forward slashes. */
  readonly path: string;
  readonly status: 'A' | 'M' | 'D';
}

export type ChangedAgainst = 'worktree' | 'head' | 'staged';

export interface Changes {
  readonly files: readonly ChangedFile[];
  /** Old path → new path, for the deletions and additions git's rename detection paired up. */
  readonly renames: ReadonlyMap<string, string>;
}

// -M turns on rename detection whatever the user's diff.renames says; the pairs' paths are still
// listed as a deletion and an addition in `files`.
const DIFF_OPTIONS = ['--name-status', '-z', '-M', '--no-color', '--no-ext-diff'];

/** Files that differ between `base` and the work tree (default), HEAD, or the index. */
export function changedFiles(repo: Repo, base: string, options: { against?: ChangedAgainst } = {}): ChangedFile[] {
  return [...changesSince(repo, base, options).files];
}

/**
 * The changed files and the renames among them, from one diff. Against the work tree, untracked
 * files count as added; a move that git does not track yet (`mv` without `git add`) therefore
 * shows as a deletion and an addition, not as a rename.
 */
export function changesSince(repo: Repo, base: string, options: { against?: ChangedAgainst } = {}): Changes {
  checkRevision(base);
  const against = options.against ?? 'worktree';
  switch (against) {
    case 'worktree': {
      const changes = diff(repo, 'worktree', [requireCommit(repo, base)]);
      return { files: addUntracked(changes.files, untrackedFiles(repo)), renames: changes.renames };
    }
    case 'head':
      return diff(repo, 'trees', [requireCommit(repo, base), requireCommit(repo, 'HEAD')]);
    case 'staged':
      return diff(repo, 'index', [requireCommit(repo, base)]);
    default:
      throw new GitError(`unknown comparison '${String(against)}': use 'worktree', 'head' or 'staged'`, '');
  }
}

/** What the next commit would change; before the first commit everything staged is added. */
export function stagedFiles(repo: Repo): ChangedFile[] {
  return [...stagedChanges(repo).files];
}

/** stagedFiles with the renames among them. */
export function stagedChanges(repo: Repo): Changes {
  return diff(repo, 'index', [resolveCommit(repo, 'HEAD') ?? emptyTree(repo)]);
}

/** `ids` are full hex ids (never user spelling), followed by `--` so no path can be taken for one. */
function diff(repo: Repo, side: 'worktree' | 'index' | 'trees', ids: readonly string[]): Changes {
  const args = ['diff', ...(side === 'index' ? ['--cached'] : []), ...DIFF_OPTIONS, ...ids, '--'];
  const renames = new Map<string, string>();
  const files = parseNameStatus(runGitOk(repo.root, args).toString('utf8'), renames);
  return { files: [...files].map(([path, status]) => ({ path, status })).sort(byPath), renames };
}

/**
 * `--name-status -z` output as path → status; a path listed twice with different letters counts
 * as modified. Renames are recorded in `renames` (old → new) when it is given.
 */
export function parseNameStatus(out: string, renames?: Map<string, string>): Map<string, ChangedFile['status']> {
  const fields = out.split('\0');
  if (fields.at(-1) === '') fields.pop();
  const files = new Map<string, ChangedFile['status']>();
  const add = (path: string | undefined, status: ChangedFile['status']): void => {
    if (path === undefined || path === '') return;
    const seen = files.get(path);
    files.set(path, seen === undefined || seen === status ? status : 'M');
  };
  for (let i = 0; i < fields.length; ) {
    const code = fields[i++] ?? '';
    const letter = code.charAt(0);
    if (letter === 'R' || letter === 'C') {
      const from = fields[i++];
      const to = fields[i++];
      if (letter === 'R') {
        add(from, 'D');
        if (from !== undefined && to !== undefined) renames?.set(from, to);
      }
      add(to, 'A');
    } else {
      add(fields[i++], letter === 'A' ? 'A' : letter === 'D' ? 'D' : 'M');
    }
  }
  return files;
}

function untrackedFiles(repo: Repo): string[] {
  const out = runGitOk(repo.root, ['ls-files', '--others', '--exclude-standard', '-z', '--full-name']).toString('utf8');
  // A nested repository shows up as `dir/`: it is not a file of this one.
  return out.split('\0').filter((p) => p !== '' && !p.endsWith('/'));
}

function addUntracked(tracked: readonly ChangedFile[], untracked: readonly string[]): ChangedFile[] {
  const files = new Map(tracked.map((f) => [f.path, f.status]));
  for (const path of untracked) {
    // Removed from the index (`git rm --cached`) but still on disk: the file is there, maybe edited.
    files.set(path, files.get(path) === 'D' ? 'M' : (files.get(path) ?? 'A'));
  }
  return [...files].map(([path, status]) => ({ path, status })).sort(byPath);
}

function byPath(a: ChangedFile, b: ChangedFile): number {
  return a.path < b.path ? -1 : a.path > b.path ? 1 : 0;
}
