/**
 * Reading a file's text as it is at a commit or in the index, to compare a pull request's configs
 * with the base branch and to check exactly what is about to be committed. The entry is looked up
 * first (`ls-tree` / `ls-files`, exact path match) and the blob is then read by id with
 * `cat-file`, so "the path is absent" is a clean `null` found without parsing error messages, and
 * directories, submodules, symlinks, conflicts and oversized files are reported as such.
 */
import { GitError } from './git-error.js';
import { checkRootRelativePath } from './git-input.js';
import { requireCommit, type Repo } from './repo.js';
import { MAX_FILE_BYTES, runGitOk } from './run-git.js';

interface Entry {
  readonly mode: string;
  readonly type: string;
  readonly id: string;
  readonly size?: number;
  /** `ls-tree -l` could not find the object to measure it: missing from the object store. */
  readonly missing?: boolean;
}

/** Contents of `rootRelativePath` at commit `rev`; null when the path does not exist there. */
export function readAtRevision(repo: Repo, rev: string, rootRelativePath: string): string | null {
  const path = checkRootRelativePath(rootRelativePath);
  const commit = requireCommit(repo, rev);
  // -l adds the blob size, so an oversized file is refused before any of it is read.
  const out = runGitOk(repo.root, ['ls-tree', '-l', '-z', '--full-tree', commit, '--', path]).toString('utf8');
  const entry = findEntry(out, path, parseTreeLine);
  if (entry === undefined) return null;
  return readEntry(repo, entry, `'${path}' at ${rev}`);
}

/** Contents of `rootRelativePath` in the index (what the next commit holds); null if not staged. */
export function readStaged(repo: Repo, rootRelativePath: string): string | null {
  const path = checkRootRelativePath(rootRelativePath);
  const out = runGitOk(repo.root, ['ls-files', '--stage', '-z', '--full-name', '--', path]).toString('utf8');
  const entries = out
    .split('\0')
    .map((record) => parseIndexLine(record))
    .filter((e): e is Entry & { path: string; stage: string } => e !== undefined && e.path === path);
  if (entries.length === 0) return null;
  const entry = entries[0];
  if (entries.length > 1 || entry === undefined || entry.stage !== '0') {
    throw new GitError(`'${path}' has unresolved merge conflicts in the index; resolve them and stage the result`, '');
  }
  return readEntry(repo, entry, `staged '${path}'`);
}

function readEntry(repo: Repo, entry: Entry, what: string): string {
  if (entry.type === 'tree') throw new GitError(`${what} is a directory, not a file`, '');
  if (entry.mode === '160000' || entry.type === 'commit') throw new GitError(`${what} is a submodule, not a file`, '');
  // A link's blob is its target path; following it inside a commit is not supported.
  if (entry.mode === '120000') throw new GitError(`${what} is a symbolic link; point the check at the file it links to`, '');
  if (entry.missing) throw new GitError(`${what} (object ${entry.id.slice(0, 12)}) is missing from this clone's object store`, '');
  const tooLarge = (): GitError =>
    new GitError(`${what} is larger than ${MAX_FILE_BYTES / (1024 * 1024)} MiB; refusing to read it`, '');
  if (entry.size !== undefined && entry.size > MAX_FILE_BYTES) throw tooLarge();
  const blob = runGitOk(repo.root, ['cat-file', 'blob', entry.id], { maxBuffer: MAX_FILE_BYTES + 1, tooLarge });
  if (blob.length > MAX_FILE_BYTES) throw tooLarge();
  // Decoded the way the work-tree reader decodes files, so the same bytes give the same text.
  return blob.toString('utf8');
}

function findEntry<E extends Entry & { path: string }>(
  out: string,
  path: string,
  parse: (record: string) => E | undefined,
): E | undefined {
  for (const record of out.split('\0')) {
    const entry = parse(record);
    if (entry?.path === path) return entry;
  }
  return undefined;
}

/** `<mode> SP <type> SP <id> SP+ <size>TAB<path>` (size is `-` for trees and submodules, `BAD` for a missing object). */
function parseTreeLine(record: string): (Entry & { path: string }) | undefined {
  const m = /^(\d{6}) (\w+) ([0-9a-f]+) +(\d+|-|BAD)\t([\s\S]*)$/.exec(record);
  if (!m) return undefined;
  const [, mode = '', type = '', id = '', size = '-', path = ''] = m;
  if (size === 'BAD') return { mode, type, id, path, missing: true };
  return { mode, type, id, path, ...(size === '-' ? {} : { size: Number(size) }) };
}

/** `<mode> SP <id> SP <stage>TAB<path>`. */
function parseIndexLine(record: string): (Entry & { path: string; stage: string }) | undefined {
  const m = /^(\d{6}) ([0-9a-f]+) (\d)\t([\s\S]*)$/.exec(record);
  if (!m) return undefined;
  const [, mode = '', id = '', stage = '', path = ''] = m;
  return { mode, type: mode === '160000' ? 'commit' : 'blob', id, stage, path };
}
