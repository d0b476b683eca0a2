/**
 * Where the repository is. The root is the nearest ancestor of the working directory that holds
 * `.git` (found by looking, never by running git); outside a repository it is the working
 * directory. Paths given to policies and definitions use forward slashes and are relative to the root.
 */
import { existsSync } from 'node:fs';
import { dirname, join, relative, resolve, sep } from 'node:path';

export function findRepoRoot(start: string): string {
  let dir = resolve(start);
  for (;;) {
    if (existsSync(join(dir, '.git'))) return dir;
    const up = dirname(dir);
    if (up === dir) return resolve(start);
    dir = up;
  }
}

export function toRootRelative(root: string, path: string): string {
  return relative(root, resolve(path)).split(sep).join('/');
}
