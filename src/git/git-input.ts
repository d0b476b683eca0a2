/**
 * Checks on the strings that callers hand to git. Revisions and paths can come from a pull
 * request, a CI variable or a policy file, so they are untrusted: a revision must not be able to
 * pose as an option, and a path must name a file inside the repository in the one spelling git
 * stores (root-relative, forward slashes) so that exact matches against git's listings work.
 */
import { GitError } from './git-error.js';

// Control characters are never part of a useful revision, and a NUL would make the argument
// vector itself invalid (Node throws a TypeError rather than a GitError).
const CONTROL = /[\u0000-\u001f\u007f]/;

export function checkRevision(rev: string): string {
  if (rev === '') throw new GitError('a git revision must not be empty', '');
  if (rev.startsWith('-')) throw new GitError(`refusing the git revision '${rev}': a revision must not start with '-'`, '');
  if (CONTROL.test(rev)) throw new GitError(`refusing the git revision ${JSON.stringify(rev)}: it contains control characters`, '');
  return rev;
}

export function checkRootRelativePath(path: string): string {
  const refuse = (why: string): never => {
    throw new GitError(`refusing the path ${JSON.stringify(path)}: ${why}`, '');
  };
  if (path === '') refuse('it is empty');
  if (path.includes('\u0000')) refuse('it contains a NUL character');
  if (path.includes('\\')) refuse('use forward slashes, relative to the repository root');
  if (path.startsWith('/') || /^[A-Za-z]:/.test(path)) refuse('it is absolute; give it relative to the repository root');
  for (const segment of path.split('/')) {
    if (segment === '..') refuse("it has a '..' segment");
    // git stores neither `.` nor empty segments, so such a spelling could never match; worse,
    // `REV:./x` means "relative to the current directory" to git.
    if (segment === '.' || segment === '') refuse("it has an empty or '.' segment");
  }
  return path;
}
