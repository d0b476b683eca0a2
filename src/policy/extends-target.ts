/**
 * Finds and reads the file an `extends` names. The path is relative to the extending file's
 * directory and must stay inside the repository root. It is resolved by its spelling alone (`..`
 * folded, links never resolved) and handed to a reader: the working tree by default, which refuses
 * symbolic links anywhere on the path, or a stand-in such as the base revision's git tree. A pull
 * request therefore can neither make CI read files elsewhere on the machine (`/etc/passwd`, a
 * linked home directory) nor swap the file a base policy extends for another through a link.
 */
import { isAbsolute, join, normalize, relative, resolve, sep } from 'node:path';
import { dirname } from 'node:path';
import type { RefusalCode } from '../files/file-read.js';
import { readWorkTree } from '../files/work-tree.js';

export type ExtendsTarget =
  | {
      readonly ok: true;
      /** The target as diagnostics and `chain` name it: relative to the working directory when the extending file's path was. */
      readonly display: string;
      /** The absolute path the cycle check compares (spelling resolved, links never followed). */
      readonly real: string;
      readonly text: string;
    }
  | { readonly ok: false; readonly code: string; readonly message: string };

/**
 * Reads a file given by its absolute path below the repository root. Throwing means it cannot be
 * read: an error whose `code` is ENOENT means it does not exist, a ReadRefusedError says why the
 * file is not read (a symbolic link, a directory, too large).
 */
export type ReadFile = (path: string) => string;

export class ReadRefusedError extends Error {
  override readonly name = 'ReadRefusedError';
  constructor(
    message: string,
    readonly reason: RefusalCode,
  ) {
    super(message);
  }
}

export function resolveExtendsTarget(value: string, fromFile: string, repoRoot: string, readFile: ReadFile | undefined): ExtendsTarget {
  const display = isAbsolute(value) ? normalize(value) : join(dirname(fromFile), value);
  const root = resolve(repoRoot);
  const target = resolve(dirname(resolve(fromFile)), value);
  if (!inside(target, root)) {
    return {
      ok: false,
      code: 'policy/extends-outside-root',
      message: `extends '${value}' points outside the repository root ${root}; a policy may only extend policies inside the repository`,
    };
  }
  try {
    return { ok: true, display, real: target, text: (readFile ?? workTreeReader(root))(target) };
  } catch (err) {
    if (isNotFound(err)) return { ok: false, code: 'policy/extends-missing', message: `extends '${value}': there is no file ${target}` };
    if (err instanceof ReadRefusedError) {
      const code = err.reason === 'too-large' ? 'policy/too-large' : err.reason === 'symlink' ? 'policy/extends-symlink' : 'policy/extends-unreadable';
      return { ok: false, code, message: `extends '${value}': ${err.message}` };
    }
    const reason = err instanceof Error ? err.message : String(err);
    return { ok: false, code: 'policy/extends-unreadable', message: `extends '${value}': cannot read ${target}: ${reason}` };
  }
}

/** Reads files of the working tree below `root`, refusing links (see files/work-tree.ts). */
export function workTreeReader(root: string): ReadFile {
  return (path) => {
    const rel = relative(root, path).split(sep).join('/');
    const read = readWorkTree(root, rel);
    if (read.kind === 'file') return read.text;
    if (read.kind === 'absent') throw Object.assign(new Error(`${path} does not exist`), { code: 'ENOENT' });
    throw new ReadRefusedError(read.message, read.code);
  };
}

export function inside(path: string, root: string): boolean {
  const rel = relative(root, path);
  return rel === '' || (rel !== '..' && !rel.startsWith(`..${sep}`) && !isAbsolute(rel));
}

function isNotFound(err: unknown): boolean {
  return typeof err === 'object' && err !== null && (err as { code?: unknown }).code === 'ENOENT';
}
