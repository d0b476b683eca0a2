/**
 * The `configs` input narrows a run to part of the repository (a monorepo whose models live in a
 * few directories): its globs pick YAML files of the workspace, which the check then takes as its
 * explicit list. Globs match the way a policy's applies_to does — root-relative, forward slashes,
 * dot directories included, the same on every runner — so one pattern means the same in both.
 */
import picomatch from 'picomatch';
import { listYamlFiles } from '../check/repo-files.js';

/** Root-relative paths of the workspace's YAML files that the globs select, sorted. */
export function selectConfigs(root: string, globs: readonly string[]): string[] {
  const options = { dot: true, windows: false };
  // A leading './' is how people often write a relative path; the matcher would not see it as one.
  const clean = (g: string): string => g.replace(/^(\.\/)+/, '');
  const positive = globs.filter((g) => !g.startsWith('!')).map(clean);
  const negative = globs.filter((g) => g.startsWith('!')).map((g) => clean(g.slice(1)));
  if (positive.length === 0) return [];
  const include = picomatch(positive, options);
  const exclude = negative.length > 0 ? picomatch(negative, options) : () => false;
  return listYamlFiles(root).filter((path) => include(path) && !exclude(path));
}
