/**
 * Where the repository is and which of its files a policy governs. The root is the nearest
 * ancestor of the working directory that holds `.git` (found by looking, never by running git);
 * outside a repository it is the working directory. Paths given to policies use forward slashes
 * and are relative to the root.
 */
import { existsSync, readdirSync } from 'node:fs';
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

const SKIP = new Set(['.git', 'node_modules', 'build', 'dist']);

/** Every YAML file below the root, root-relative, sorted. */
export function listYamlFiles(root: string): string[] {
  const out: string[] = [];
  const walk = (dir: string): void => {
    for (const entry of readdirSync(dir, { withFileTypes: true }).sort((a, b) => a.name.localeCompare(b.name))) {
      if (entry.isDirectory()) {
        if (!SKIP.has(entry.name)) walk(join(dir, entry.name));
      } else if (entry.isFile() && /\.ya?ml$/i.test(entry.name)) {
        out.push(toRootRelative(root, join(dir, entry.name)));
      }
    }
  };
  walk(root);
  return out.sort();
}
