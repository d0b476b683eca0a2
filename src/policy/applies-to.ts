/**
 * Which configs a policy governs: `applies_to` globs, relative to the repository root, matched
 * against config paths relative to the same root. Matching is the same on every platform (forward
 * slashes; a Windows path is normalised first, and backslashes in patterns stay glob escapes),
 * and dot files and directories match like any other, since configs often sit in `.ci/`. A pattern
 * starting with `!` excludes what it matches from the others.
 */
import { posix } from 'node:path';
import picomatch from 'picomatch';
import type { Policy } from './policy.js';
import { MAX_PATTERN_LENGTH } from './policy-limits.js';

/** Why a pattern cannot be a repository-relative glob, or undefined when it can. */
export function appliesToProblem(pattern: string): string | undefined {
  const body = pattern.startsWith('!') ? pattern.slice(1) : pattern;
  if (body === '') return `the pattern '${pattern}' is empty`;
  if (pattern.length > MAX_PATTERN_LENGTH) {
    return `the pattern is ${pattern.length} characters long; applies_to patterns may have at most ${MAX_PATTERN_LENGTH}`;
  }
  if (/^[/\\]/.test(body) || /^[A-Za-z]:/.test(body)) {
    return `the pattern '${pattern}' is absolute; applies_to patterns are relative to the repository root, e.g. 'examples/*.yaml'`;
  }
  if (body.split(/[/\\]/).includes('..')) {
    return `the pattern '${pattern}' has a '..' segment; applies_to patterns may not leave the repository root`;
  }
  try {
    picomatch.makeRe(body, MATCH_OPTIONS);
  } catch (e) {
    return `the pattern '${pattern}' is not a glob the matcher accepts: ${(e as Error).message}`;
  }
  return undefined;
}

const MATCH_OPTIONS = { dot: true, windows: false } as const;

interface Matcher {
  readonly include: (path: string) => boolean;
  readonly exclude: (path: string) => boolean;
}

const matchers = new WeakMap<readonly string[], Matcher>();

function matcherFor(patterns: readonly string[]): Matcher {
  const hit = matchers.get(patterns);
  if (hit) return hit;
  // `windows: false` explicitly: the library otherwise follows the host platform, and a policy
  // must select the same configs on a developer's laptop as in CI.
  const options = MATCH_OPTIONS;
  const positive = patterns.filter((p) => !p.startsWith('!'));
  const negative = patterns.filter((p) => p.startsWith('!')).map((p) => p.slice(1));
  const compile = (list: string[]) => (list.length === 0 ? () => false : picomatch(list, options));
  const made = { include: compile(positive), exclude: compile(negative) };
  matchers.set(patterns, made);
  return made;
}

export function policyApplies(policy: Policy, configPathRelativeToRoot: string): boolean {
  const path = normaliseConfigPath(configPathRelativeToRoot);
  if (path === undefined) return false;
  const m = matcherFor(policy.appliesTo);
  return m.include(path) && !m.exclude(path);
}

/** `examples\a.yaml` and `./examples/a.yaml` → `examples/a.yaml`; undefined outside the root. */
export function normaliseConfigPath(path: string): string | undefined {
  const slashed = path.replace(/\\/g, '/');
  if (slashed === '' || slashed.startsWith('/') || /^[A-Za-z]:/.test(slashed)) return undefined;
  const normal = posix.normalize(slashed).replace(/^(\.\/)+/, '');
  if (normal === '.' || normal === '..' || normal.startsWith('../')) return undefined;
  return normal;
}

/**
 * Whether some file below the root-relative directory `dir` could match one of `patterns` (the
 * exclusions aside): used to tell a user that a directory the check cannot enter (a symbolic
 * link, a directory git ignores) may hold configs a policy asks for. Conservative: a pattern the
 * test cannot take apart (braces, extglobs) could match anywhere.
 */
export function couldMatchBelow(patterns: readonly string[], dir: string): boolean {
  const dirSegments = dir.replace(/\/+$/, '').split('/');
  return patterns.some((pattern) => !pattern.startsWith('!') && patternReachesBelow(pattern, dirSegments));
}

function patternReachesBelow(pattern: string, dirSegments: readonly string[]): boolean {
  const scan = picomatch.scan(pattern.replace(/^(\.\/)+/, ''));
  const base = scan.base === '' ? [] : scan.base.split('/');
  for (let i = 0; i < Math.min(base.length, dirSegments.length); i++) if (base[i] !== dirSegments[i]) return false;
  if (dirSegments.length < base.length) return true;
  if (!scan.isGlob) return false;
  if (scan.isBrace || scan.isExtglob || scan.glob.includes('**')) return true;
  const globSegments = scan.glob.split('/');
  // A file below `dir` has at least one more segment than `dir`; a pattern without ** has a fixed depth.
  if (base.length + globSegments.length < dirSegments.length + 1) return false;
  const options = { dot: true, windows: false };
  for (let j = 0; base.length + j < dirSegments.length; j++) {
    if (!picomatch(globSegments[j]!, options)(dirSegments[base.length + j]!)) return false;
  }
  return true;
}
