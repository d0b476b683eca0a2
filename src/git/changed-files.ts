/**
 * Which files differ from a base commit: in the work tree (a local run), at HEAD (a pull request
 * in CI) or in the index (a pre-commit hook). Output is read with `-z` so that names with spaces,
 * quotes, newlines or non-ASCII letters arrive exactly as git stores them, and renames are off so
 * that every entry is one path with one of three statuses the checker understands.
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

const DIFF_OPTIONS = ['--name-status', '-z', '--no-renames', '--no-color', '--no-ext-diff'];

/** Files that differ between `base` and the work tree (default), HEAD, or the index. */
export function changedFiles(repo: Repo, base: string, options: { against?: ChangedAgainst } = {}): ChangedFile[] {
  checkRevision(base);
  const against = options.against ?? 'worktree';
  switch (against) {
    case 'worktree': {
      const files = diff(repo, 'worktree', [requireCommit(repo, base)]);
      return addUntracked(files, untrackedFiles(repo));
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
  return diff(repo, 'index', [resolveCommit(repo, 'HEAD') ?? emptyTree(repo)]);
}

/** `ids` are full hex ids (never user spelling), followed by `--` so no path can be taken for one. */
function diff(repo: Repo, side: 'worktree' | 'index' | 'trees', ids: readonly string[]): ChangedFile[] {
  const args = ['diff', ...(side === 'index' ? ['--cached'] : []), ...DIFF_OPTIONS, ...ids, '--'];
  const files = parseNameStatus(runGitOk(repo.root, args).toString('utf8'));
  return [...files].map(([path, status]) => ({ path, status })).sort(byPath);
}

/** `--name-status -z` output as path → status; a path listed twice with different letters counts as modified. */
export function parseNameStatus(out: string): Map<string, ChangedFile['status']> {
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
      // Not produced with --no-renames; kept so a future option cannot misalign the fields.
      const from = fields[i++];
      const to = fields[i++];
      if (letter === 'R') add(from, 'D');
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
