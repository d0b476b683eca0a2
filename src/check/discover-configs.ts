/**
 * Which files of the working tree the check looks at when no config is named: every file that a
 * policy's applies_to (or the Action's `configs` globs) selects, found without skipping any
 * directory by its name. A selected file that cannot be checked is not dropped silently: a
 * symbolic link is an input error at the link, and anything else (not YAML, ignored by git, a
 * nested repository, a linked directory the check will not enter) is reported as skipped, with
 * the reason. In a git repository the listing is git's own (two processes); elsewhere the
 * directories that could hold a selected file are walked, links not followed.
 */
import { readdirSync, statSync } from 'node:fs';
import { join } from 'node:path';
import type { Repo } from '../git/repo.js';
import { listWorkTreeFiles } from '../git/work-tree-files.js';
import { inspectWorkTree } from '../files/work-tree.js';

export interface SkippedPath {
  /** Root-relative; a directory ends in '/'. */
  readonly path: string;
  readonly reason: string;
}

/** What the policies (or the request) ask for. */
export interface Selector {
  readonly matches: (path: string) => boolean;
  /** Some file below this root-relative directory could be selected. */
  readonly couldMatchBelow: (dir: string) => boolean;
}

export interface Discovered {
  /** Selected regular YAML files, sorted. */
  readonly files: readonly string[];
  /** Selected paths that are symbolic links or lie behind one: input errors. */
  readonly links: readonly { readonly path: string; readonly link: string }[];
  readonly skipped: readonly SkippedPath[];
}

export const YAML_FILE = /\.ya?ml$/i;

export function discoverConfigs(root: string, repo: Repo | undefined, selector: Selector): Discovered {
  const files: string[] = [];
  const links: { path: string; link: string }[] = [];
  const skipped: SkippedPath[] = [];
  const consider = (path: string): void => {
    if (path.endsWith('/')) {
      if (selector.couldMatchBelow(path)) skipped.push({ path, reason: 'a nested repository or submodule; its files belong to another repository' });
      return;
    }
    const selected = selector.matches(path);
    // Only a selected path, or a linked directory that could hold one, is worth a look on disk.
    if (!selected && !selector.couldMatchBelow(path)) return;
    const entry = inspectWorkTree(root, path);
    switch (entry.kind) {
      case 'file':
        if (!selected) return;
        if (YAML_FILE.test(path)) files.push(path);
        else skipped.push({ path, reason: 'not a YAML file (.yaml or .yml)' });
        return;
      case 'symlink':
        if (selected) links.push({ path, link: entry.link });
        else if (entry.link === path && leadsToDirectory(root, path)) {
          skipped.push({ path: `${path}/`, reason: 'a symbolic link to a directory; links are not followed, so configs behind it are not checked' });
        }
        return;
      case 'directory':
        skipped.push({ path: `${path}/`, reason: 'a nested repository or submodule; its files belong to another repository' });
        return;
      case 'special':
        if (selected) skipped.push({ path, reason: 'not a regular file' });
        return;
      case 'absent':
        return;
    }
  };
  if (repo) {
    const listing = listWorkTreeFiles(repo);
    for (const path of listing.files) consider(path);
    for (const path of listing.ignored) {
      if (path.endsWith('/') ? selector.couldMatchBelow(path) : selector.matches(path)) {
        skipped.push({ path, reason: path.endsWith('/') ? 'a directory ignored by git; its files are not part of the repository' : 'ignored by git; not part of the repository' });
      }
    }
  } else {
    walk(root, '', selector, consider);
  }
  const byPath = (a: { path: string }, b: { path: string }): number => (a.path < b.path ? -1 : a.path > b.path ? 1 : 0);
  return { files: files.sort(), links: links.sort(byPath), skipped: skipped.sort(byPath) };
}

function walk(root: string, dir: string, selector: Selector, consider: (path: string) => void): void {
  let entries;
  try {
    entries = readdirSync(dir === '' ? root : join(root, dir), { withFileTypes: true });
  } catch {
    return;
  }
  for (const e of entries.sort((a, b) => (a.name < b.name ? -1 : a.name > b.name ? 1 : 0))) {
    const path = dir === '' ? e.name : `${dir}/${e.name}`;
    if (e.isDirectory()) {
      if (selector.couldMatchBelow(path)) walk(root, path, selector, consider);
    } else consider(path);
  }
}

// The link is not followed for reading; its target's type only decides whether to mention it.
function leadsToDirectory(root: string, path: string): boolean {
  try {
    return statSync(join(root, path)).isDirectory();
  } catch {
    return false;
  }
}
