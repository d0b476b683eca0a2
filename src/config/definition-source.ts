/**
 * Where a config's architecture definition is read from. A config names it by a path relative to
 * the config's own directory that must stay inside the repository — the rule of a policy's
 * `extends` —, resolved by its spelling alone (`..` folded, links never resolved), and the file
 * is read by a `DefinitionSource`: the working tree without following links (the default), the
 * index, or a revision's git tree. A check reads the base side's definitions from the base
 * revision and the head side's from the head, and hands the judging side's version along for the
 * parameter declarations (see DEVELOPERS.md, "Architecture definitions").
 */
import { dirname, posix, relative, resolve, sep } from 'node:path';
import type { FileRead } from '../files/file-read.js';
import { findRepoRoot, toRootRelative } from '../files/repo-root.js';
import { readWorkTree } from '../files/work-tree.js';

export interface DefinitionSource {
  /** The definition at a root-relative path, on the side being loaded. */
  read(rel: string): FileRead;
  /**
   * The version whose parameter declarations (types and ranges) judge a config's values, when it
   * may differ from `read`'s: the base revision's in a check.
   */
  judging?(rel: string): FileRead;
  /** How diagnostics name a root-relative file. */
  display(rel: string): string;
}

export type DefinitionPath = { readonly ok: true; readonly rel: string } | { readonly ok: false; readonly code: string; readonly message: string };

/** `written` as the config gives it, relative to the config at root-relative `configRel`. */
export function resolveDefinitionPath(written: string, configRel: string): DefinitionPath {
  if (written.startsWith('/') || /^[A-Za-z]:/.test(written) || written.includes('\\')) {
    return {
      ok: false,
      code: 'config/architecture-outside-root',
      message: `architecture '${written}' is not a path relative to the config; write it from the config's directory with forward slashes (e.g. ../arch/residual.yaml), inside the repository`,
    };
  }
  const rel = posix.normalize(posix.join(posix.dirname(configRel), written));
  if (rel === '..' || rel.startsWith('../') || rel === '.' || rel === '') {
    return {
      ok: false,
      code: 'config/architecture-outside-root',
      message: `architecture '${written}' points outside the repository root; a config may only use definitions inside the repository`,
    };
  }
  return { ok: true, rel };
}

/** The working tree below `root`, links refused; files named relative to `cwd` in messages. */
export function workTreeDefinitions(root: string, cwd: string = process.cwd()): DefinitionSource {
  return {
    read: (rel) => readWorkTree(root, rel),
    display: (rel) => relative(cwd, resolve(root, rel)).split(sep).join('/') || rel,
  };
}

/** The repository around a config file on disk and the config's root-relative path in it. */
export function repositoryOf(file: string): { readonly root: string; readonly configRel: string } {
  const root = findRepoRoot(dirname(resolve(file)));
  return { root, configRel: toRootRelative(root, file) };
}
