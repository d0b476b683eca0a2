/**
 * Finds and reads the file an `extends` names. The path is relative to the extending file's
 * directory and must stay inside the repository root, judged after `..` and symbolic links are
 * resolved: a policy comes from the repository under review, and a pull request must not make CI
 * read (and echo in messages) files elsewhere on the machine, such as `/etc/passwd` or a
 * symlinked home directory.
 */
import { readFileSync, realpathSync, statSync } from 'node:fs';
import { dirname, isAbsolute, join, normalize, relative, resolve, sep } from 'node:path';
import { MAX_DOCUMENT_BYTES } from '../config/limits.js';

export type ExtendsTarget =
  | {
      readonly ok: true;
      /** The target as diagnostics and `chain` name it: relative to the working directory when the extending file's path was. */
      readonly display: string;
      /** The absolute path the cycle check compares (symlinks resolved when the file exists on disk). */
      readonly real: string;
      readonly text: string;
    }
  | { readonly ok: false; readonly code: string; readonly message: string };

/** Reads a file; throwing means it cannot be read (an error with code ENOENT: it does not exist). */
export type ReadFile = (path: string) => string;

/**
 * `readFile`, when given, stands in for the file system (tests, editors with unsaved buffers): a
 * target then need not exist on disk, and a path that does not is checked without resolving links.
 */
export function resolveExtendsTarget(value: string, fromFile: string, repoRoot: string, readFile: ReadFile | undefined): ExtendsTarget {
  const display = isAbsolute(value) ? normalize(value) : join(dirname(fromFile), value);
  const fromDir = dirname(resolve(fromFile));
  const lexical = resolve(realpathOrSelf(fromDir), value);
  const root = realpathOrSelf(resolve(repoRoot));
  const outside = (why: string): ExtendsTarget => ({
    ok: false,
    code: 'policy/extends-outside-root',
    message: `extends '${value}' ${why} the repository root ${root}; a policy may only extend policies inside the repository`,
  });
  let real: string;
  try {
    real = realpathSync(lexical);
  } catch {
    if (!inside(lexical, root)) return outside('points outside');
    if (!readFile) return missing(value, lexical);
    real = lexical;
  }
  if (!inside(real, root)) return outside(inside(lexical, root) ? 'leads, through a symbolic link, outside' : 'points outside');
  // A stand-in reader gets the path below the root as the caller spelt it, which it can map to
  // its own store (a git revision, say) even when the root itself is reached through a link.
  const readPath = readFile ? join(resolve(repoRoot), relative(root, real)) : real;
  try {
    return { ok: true, display, real, text: (readFile ?? readPolicyFromDisk)(readPath) };
  } catch (err) {
    if (isNotFound(err)) return missing(value, real);
    if (err instanceof TooLargeError) return { ok: false, code: 'policy/too-large', message: `extends '${value}': ${err.message}` };
    const reason = err instanceof Error ? err.message : String(err);
    return { ok: false, code: 'policy/extends-unreadable', message: `extends '${value}': cannot read ${real}: ${reason}` };
  }
}

export class TooLargeError extends Error {
  override readonly name = 'TooLargeError';
}

/** Reads a policy file from disk, refusing files over the size cap before reading them. */
export function readPolicyFromDisk(path: string): string {
  const size = statSync(path).size;
  if (size > MAX_DOCUMENT_BYTES) {
    throw new TooLargeError(`the policy file is ${size} bytes; files larger than ${MAX_DOCUMENT_BYTES} bytes (4 MiB) are refused`);
  }
  return readFileSync(path, 'utf8');
}

/** The real path of an existing file or directory, else the path itself. */
export function realpathOrSelf(path: string): string {
  try {
    return realpathSync(path);
  } catch {
    return path;
  }
}

function missing(value: string, path: string): ExtendsTarget {
  return { ok: false, code: 'policy/extends-missing', message: `extends '${value}': there is no file ${path}` };
}

function inside(path: string, root: string): boolean {
  const rel = relative(root, path);
  return rel === '' || (rel !== '..' && !rel.startsWith(`..${sep}`) && !isAbsolute(rel));
}

function isNotFound(err: unknown): boolean {
  return typeof err === 'object' && err !== null && (err as { code?: unknown }).code === 'ENOENT';
}
