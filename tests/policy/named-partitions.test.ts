/**
 * The `partitions` section: specs built from each built-in kind, and the errors for names and
 * bodies that cannot become a partition.
 */
import { describe, expect, test } from 'vitest';
import { BUILTIN_KINDS } from '../../src/partition/partition.js';
import { codesOf, HEAD, policyOf } from './helpers.js';

const partitions = (lines: string) => `${HEAD}partitions:\n${lines}`;

describe('named partitions', () => {
  test('every built-in kind can be named; argument kinds become resolver specs', () => {
    const p = policyOf(
      partitions(
        '  a: {kind: start-end}\n  b: {kind: left-right}\n  c: {kind: top-bottom}\n  d: {kind: interleaved}\n  e: {kind: checkerboard}\n  f: {kind: block, rows: [0, 2], cols: [1, 3]}\n  g: {kind: block, range: [4, 9]}\n  h: {kind: positions, positions: [3, 0, 3]}\n',
      ),
    );
    expect([...p.partitions].map(([name, x]) => `${name}=${x.spec}`)).toEqual([
      'a=start-end',
      'b=left-right',
      'c=top-bottom',
      'd=interleaved',
      'e=checkerboard',
      'f=block:0-2,1-3',
      'g=block:4-9',
      'h=positions:3,0,3',
    ]);
  });

  test.each(BUILTIN_KINDS.map((k) => [k]))('a name may not shadow the built-in kind %s', (kind) => {
    expect(codesOf(partitions(`  ${kind}: {kind: left-right}\n`))).toEqual(['policy/partition-shadows-builtin@4:3']);
  });

  test('names follow the id spelling', () => {
    expect(codesOf(partitions('  Organ Pair: {kind: left-right}\n  -x: {kind: left-right}\n'))).toEqual([
      'policy/invalid-partition-name@4:3',
      'policy/invalid-partition-name@5:3',
    ]);
  });

  test('a name defined twice in one file', () => {
    expect(codesOf(partitions('  pair: {kind: left-right}\n  pair: {kind: top-bottom}\n'))).toEqual(['policy/duplicate-partition@5:3']);
    // Elsewhere a repeated key stays a plain duplicate key.
    expect(codesOf(partitions('  pair: {kind: left-right, kind: top-bottom}\n'))).toEqual(['policy/duplicate-key@4:28']);
  });

  test('block bodies need rows and cols, or range, with non-empty half-open ranges', () => {
    expect(
      codesOf(
        partitions(
          '  a: {kind: block, rows: [8, 24]}\n  b: {kind: block}\n  c: {kind: block, rows: [0, 2], cols: [0, 2], range: [0, 2]}\n  d: {kind: block, rows: [8, 8], cols: [0, 2]}\n  e: {kind: block, range: [5, 1]}\n  f: {kind: block, range: [0, 2], positions: [1]}\n  g: {kind: block, range: [0, 2, 4]}\n  h: {kind: block, range: [-1, 2]}\n',
        ),
      ),
    ).toEqual([
      'policy/invalid-partition@4:6',
      'policy/invalid-partition@5:6',
      'policy/invalid-partition@6:6',
      'policy/invalid-partition@7:26',
      'policy/invalid-partition@8:27',
      'policy/invalid-partition@9:35',
      'policy/invalid-length@10:27',
      'policy/invalid-number@11:28',
    ]);
  });

  test('positions bodies need a non-empty list of non-negative integers', () => {
    expect(
      codesOf(partitions('  a: {kind: positions}\n  b: {kind: positions, positions: []}\n  c: {kind: positions, positions: [1, -2]}\n  d: {kind: positions, positions: [1.5]}\n  e: {kind: positions, positions: [1], rows: [0, 1]}\n')),
    ).toEqual(['policy/invalid-partition@4:6', 'policy/invalid-length@5:35', 'policy/invalid-number@6:39', 'policy/invalid-number@7:36', 'policy/invalid-partition@8:40']);
  });

  test('argument-free kinds take no fields; unknown kinds and fields are the schema’s', () => {
    expect(codesOf(partitions('  a: {kind: left-right, rows: [0, 2]}\n  b: {kind: left-rigth}\n  c: {kind: block, rowz: [0, 1]}\n  d: left-right\n'))).toEqual([
      'policy/invalid-partition@4:25',
      'policy/invalid-value@5:13',
      // The misspelt rows, and the block that still lacks rows and cols.
      'policy/invalid-partition@6:6',
      'policy/unknown-field@6:20',
      'policy/type@7:6',
    ]);
  });

  test('a requirement on a partition whose definition is broken reports the definition only', () => {
    expect(codesOf(partitions('  roi: {kind: block, rows: [8, 24]}\nrequire:\n  - {partition: roi, min_rank: 4}\n'))).toEqual(['policy/invalid-partition@4:8']);
  });
});
