/**
 * Which configs a policy governs: glob semantics over repository-relative paths, the same on
 * every platform, and the checks that keep patterns inside the repository.
 */
import { describe, expect, test } from 'vitest';
import { appliesToProblem, couldMatchBelow, normaliseConfigPath } from '../../src/policy/applies-to.js';
import { policyApplies } from '../../src/policy/load-policy.js';
import { HEAD, policyOf } from './helpers.js';

const governing = (...patterns: string[]) => policyOf(`${HEAD}applies_to: ${JSON.stringify(patterns)}\n`);

describe('policyApplies', () => {
  test('a single * stays inside its directory', () => {
    const p = governing('examples/*.yaml');
    expect(['examples/a.yaml', 'examples/sub/a.yaml', 'a.yaml', 'examples/a.yml', 'other/examples/a.yaml'].map((f) => policyApplies(p, f))).toEqual([
      true,
      false,
      false,
      false,
      false,
    ]);
  });

  test('** crosses directories, including the root and dot directories', () => {
    const p = governing('**/*.yaml');
    expect(['a.yaml', 'x/y/z/a.yaml', '.ci/train.yaml', 'x/.hidden.yaml', 'a.json'].map((f) => policyApplies(p, f))).toEqual([true, true, true, true, false]);
  });

  test('dot files match a plain *', () => {
    expect(policyApplies(governing('configs/*'), 'configs/.base.yaml')).toBe(true);
  });

  test('Windows-style and ./-prefixed paths are normalised first', () => {
    const p = governing('examples/renal-*.yaml');
    expect(['examples\\renal-1.yaml', '.\\examples\\renal-1.yaml', './examples/renal-1.yaml', 'examples/./renal-1.yaml', 'x/../examples/renal-1.yaml'].map((f) => policyApplies(p, f))).toEqual([
      true,
      true,
      true,
      true,
      true,
    ]);
  });

  test('paths outside the root never match, whatever the pattern', () => {
    const p = governing('**');
    expect(['../x.yaml', '/abs/x.yaml', 'C:\\repo\\x.yaml', '..', '', 'a/../../x.yaml'].map((f) => policyApplies(p, f))).toEqual([false, false, false, false, false, false]);
    expect(policyApplies(p, 'x.yaml')).toBe(true);
  });

  test('! patterns exclude from the others; any positive pattern includes', () => {
    const p = governing('examples/*.yaml', 'legacy/*.yaml', '!examples/*-old.yaml');
    expect(['examples/a.yaml', 'examples/a-old.yaml', 'legacy/b.yaml', 'legacy/b-old.yaml'].map((f) => policyApplies(p, f))).toEqual([true, false, true, true]);
    // Only exclusions: nothing is included.
    expect(policyApplies(governing('!examples/*.yaml'), 'other.yaml')).toBe(false);
  });

  test('matching is case-sensitive and the same on every host', () => {
    const p = governing('Examples/*.yaml');
    expect([policyApplies(p, 'Examples/a.yaml'), policyApplies(p, 'examples/a.yaml'), policyApplies(p, 'Examples\\a.yaml')]).toEqual([true, false, true]);
  });

  test('a policy with no applies_to governs nothing', () => {
    expect(policyApplies(policyOf(HEAD), 'examples/a.yaml')).toBe(false);
  });

  test('braces and character classes are globs too', () => {
    const p = governing('examples/{renal,gait}-[0-9].yaml');
    expect(['examples/renal-1.yaml', 'examples/gait-9.yaml', 'examples/weave-1.yaml', 'examples/renal-10.yaml'].map((f) => policyApplies(p, f))).toEqual([true, true, false, false]);
  });
});

describe('pattern and path checks', () => {
  test('appliesToProblem', () => {
    expect(['examples/*.yaml', '**', '!x/*.yaml', '..x/a.yaml', 'a/..b'].map(appliesToProblem)).toEqual([undefined, undefined, undefined, undefined, undefined]);
    expect(['/x', '\\x', 'C:/x', 'c:x', '../x', 'a/../b', 'a\\..\\b', '..', '!../x', '!'].map((p) => appliesToProblem(p) !== undefined)).toEqual(
      Array(10).fill(true),
    );
  });

  test('normaliseConfigPath', () => {
    expect(['a\\b.yaml', './a/b.yaml', 'a//b.yaml', 'a/b/', '.', '../a', 'D:/a'].map(normaliseConfigPath)).toEqual(['a/b.yaml', 'a/b.yaml', 'a/b.yaml', 'a/b/', undefined, undefined, undefined]);
  });
});

describe('couldMatchBelow: can a file below a directory be selected?', () => {
  const below = (patterns: string[], dirs: string[]) => dirs.map((d) => couldMatchBelow(patterns, d));
  test('a static base prefix: only directories on the way to it or under it', () => {
    expect(below(['examples/renal-*.yaml'], ['examples', 'examples/sub', 'other', 'ex'])).toEqual([true, false, false, false]);
    expect(below(['models/vision/*.yaml'], ['models', 'models/vision', 'models/audio', 'models/vision/old'])).toEqual([true, true, false, false]);
  });

  test('** reaches every depth; a fixed-depth glob only its own', () => {
    expect(below(['**/*.yaml'], ['node_modules', 'a/b/c', '.ci'])).toEqual([true, true, true]);
    expect(below(['configs/**'], ['configs', 'configs/x/y', 'other'])).toEqual([true, true, false]);
    expect(below(['configs/*/net.yaml'], ['configs', 'configs/a', 'configs/a/b'])).toEqual([true, true, false]);
    expect(below(['*.yaml'], ['build', 'dist'])).toEqual([false, false]);
  });

  test('exclusions are not taken into account, braces and extglobs count as "anywhere"', () => {
    expect(below(['!configs/**'], ['configs'])).toEqual([false]);
    expect(below(['{a,b}/*.yaml'], ['c'])).toEqual([true]);
    expect(below(['a/file.yaml'], ['a', 'a/file.yaml', 'b'])).toEqual([true, false, false]);
  });
});
