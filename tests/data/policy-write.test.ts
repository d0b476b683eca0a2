/**
 * Minimums written into policy files: the result validates against the shipped JSON Schema (with
 * an independent validator) and loads with the policy loader; an existing file keeps its comments
 * and layout, a minimum never lowers what the policy already requires (its own or inherited), and
 * a file is written whole or not at all, never through a symbolic link.
 */
import { chmodSync, existsSync, readdirSync, readFileSync, statSync, symlinkSync } from 'node:fs';
import { join } from 'node:path';
import { Ajv } from 'ajv';
import { parse } from 'yaml';
import { afterEach, describe, expect, test } from 'vitest';
import { loadPolicyFile } from '../../src/policy/load-policy.js';
import { openPolicyTarget, writePolicy } from '../../src/data/policy-target.js';
import { writeMinimums, type Minimum } from '../../src/data/policy-update.js';
import { UnsafeTargetError, writeFileAtomic } from '../../src/data/write-atomic.js';
import { tempRepo, type TempRepo } from '../policy/helpers.js';

const schema = JSON.parse(readFileSync(new URL('../../schema/policy.schema.json', import.meta.url), 'utf8')) as object;
const validate = new Ajv({ allErrors: true, strict: false }).compile(schema);
const FRESH = { id: 'measured', description: 'Minimums measured from a sample.', header: ['Written by a test.'] };

let repo: TempRepo | undefined;
afterEach(() => repo?.remove());

function valid(text: string): void {
  const ok = validate(parse(text));
  expect(validate.errors ?? []).toEqual([]);
  expect(ok).toBe(true);
}

function minimum(partition: string, minRank: bigint): Minimum {
  return { partition, minRank, evidence: [`Measured for ${partition}.`, 'Review before committing.'] };
}

function write(target: string, minimums: Minimum[]) {
  const opened = openPolicyTarget(repo!.path(target), repo!.root, true);
  if (!opened.ok) throw new Error(JSON.stringify(opened.diagnostics));
  return writePolicy(opened.target, FRESH, minimums, repo!.root);
}

function loaded(target: string) {
  const r = loadPolicyFile(repo!.path(target), { repoRoot: repo!.root });
  if (!r.ok) throw new Error(JSON.stringify(r.diagnostics));
  return new Map(r.policy.requirements.map((q) => [q.partition, q.minRank]));
}

describe('a new policy', () => {
  test('validates against the schema, loads, and carries the evidence above each minimum', () => {
    repo = tempRepo();
    const w = write('policies/digits.yaml', [minimum('left-right', 84n), minimum('block:0-8,0-2', 4n), minimum('interleaved', 1n << 70n), minimum('top-bottom', 3n << 60n)]);
    expect(w.created).toBe(true);
    expect(w.changes.map((c) => c.action)).toEqual(['added', 'added', 'added', 'added']);
    const text = readFileSync(repo.path('policies/digits.yaml'), 'utf8');
    valid(text);
    expect(loaded('policies/digits.yaml')).toEqual(
      new Map([
        ['left-right', 84n],
        ['block:0-8,0-2', 4n],
        ['interleaved', 1n << 70n],
        ['top-bottom', 3n << 60n],
      ]),
    );
    expect(text).toContain('  # Measured for left-right. Review before committing.\n  - {partition: left-right, min_rank: 84}\n');
    expect(text).toContain('min_rank: 2^70');
    expect(text).toContain(`min_rank: "${(3n << 60n).toString()}"`);
    expect(text.startsWith('# Written by a test.\nid: measured\n')).toBe(true);
  });
});

test('with no minimum to add, no file is created', () => {
  repo = tempRepo();
  expect(write('none.yaml', [])).toEqual({ file: repo.path('none.yaml'), written: false, created: false, changes: [] });
  expect(existsSync(repo.path('none.yaml'))).toBe(false);
});

describe('an existing policy', () => {
  const BASE = readFileSync(new URL('../../policies/org-base.yaml', import.meta.url), 'utf8');
  const SCANS = readFileSync(new URL('../../policies/paired-organ-scans.yaml', import.meta.url), 'utf8');

  test('keeps a higher minimum, raises a lower one (its old justification goes), appends a new one, and leaves the rest as it was', () => {
    repo = tempRepo();
    repo.write('policies/org-base.yaml', BASE);
    repo.write('policies/paired-organ-scans.yaml', SCANS);
    const w = write('policies/paired-organ-scans.yaml', [minimum('organ-pair', 32n), minimum('upper-pole', 40n), minimum('checkerboard', 9n)]);
    expect(w.changes).toEqual([
      { partition: 'organ-pair', action: 'kept', minRank: 32n, previous: 64n },
      { partition: 'upper-pole', action: 'raised', minRank: 40n, previous: 16n },
      { partition: 'checkerboard', action: 'added', minRank: 9n },
    ]);
    const text = readFileSync(repo.path('policies/paired-organ-scans.yaml'), 'utf8');
    valid(text);
    expect(loaded('policies/paired-organ-scans.yaml')).toEqual(new Map([['organ-pair', 64n], ['upper-pole', 40n], ['checkerboard', 9n]]));
    const before = SCANS.split('\n');
    const after = text.split('\n');
    const requireAt = before.indexOf('require:');
    expect(after.slice(0, requireAt + 5)).toEqual(before.slice(0, requireAt + 5));
    expect(text).not.toContain('16 is half the bits');
    expect(text).toContain('  # Measured for upper-pole. Review before committing.\n  - {partition: upper-pole, min_rank: 40}\n');
    expect(text.endsWith('  # Measured for checkerboard. Review before committing.\n  - {partition: checkerboard, min_rank: 9}\n')).toBe(true);
  });

  test('raising the first requirement replaces the comment that the sequence holds for it', () => {
    repo = tempRepo();
    repo.write('policies/org-base.yaml', BASE);
    repo.write('policies/paired-organ-scans.yaml', SCANS);
    write('policies/paired-organ-scans.yaml', [minimum('organ-pair', 65n)]);
    const text = readFileSync(repo.path('policies/paired-organ-scans.yaml'), 'utf8');
    expect(text).not.toContain('64 = 2^6');
    expect(text).toContain('require:\n  # Measured for organ-pair. Review before committing.\n  - {partition: organ-pair, min_rank: 65}\n');
    valid(text);
  });

  test('an inherited minimum counts: a lower one is kept, a higher one is added to the child', () => {
    repo = tempRepo();
    repo.write('p/base.yaml', 'id: base\ndescription: Base.\nrequire:\n  - {partition: left-right, min_bits: 6}\n');
    repo.write('p/child.yaml', 'id: child\ndescription: Child.\nextends: ./base.yaml\n');
    expect(write('p/child.yaml', [minimum('left-right', 64n)]).changes[0]!.action).toBe('kept');
    expect(readFileSync(repo.path('p/child.yaml'), 'utf8')).toBe('id: child\ndescription: Child.\nextends: ./base.yaml\n');
    expect(write('p/child.yaml', [minimum('left-right', 65n)]).changes[0]).toEqual({ partition: 'left-right', action: 'raised', minRank: 65n, previous: 64n });
    expect(loaded('p/child.yaml').get('left-right')).toBe(65n);
  });

  test('a requirement written with spaces, or with min_bits, is the one updated', () => {
    repo = tempRepo();
    const text = 'id: p\ndescription: P.\nrequire:\n  - partition: "block:0-4, 0-8"\n    min_bits: 2\n    unproven: fail\n';
    repo.write('p.yaml', text);
    write('p.yaml', [minimum('block:0-4,0-8', 5n)]);
    const out = readFileSync(repo.path('p.yaml'), 'utf8');
    valid(out);
    expect(out).toContain('unproven: fail');
    expect(out).not.toContain('min_bits');
    expect(loaded('p.yaml')).toEqual(new Map([['block:0-4, 0-8', 5n]]));
  });

  test('`require: []` in flow style becomes a block list', () => {
    const { text } = writeMinimums({ text: 'id: p\ndescription: P.\nrequire: []\n', effective: new Map() }, FRESH, [minimum('left-right', 3n)]);
    expect(text).toBe('id: p\ndescription: P.\nrequire:\n  # Measured for left-right. Review before committing.\n  - {partition: left-right, min_rank: 3}\n');
  });
});

describe('writing whole, never through a link', () => {
  test('a symbolic link as the target is refused and left alone', () => {
    repo = tempRepo();
    const real = repo.write('real.yaml', 'id: real\ndescription: Real.\n');
    symlinkSync(real, repo.path('link.yaml'));
    expect(() => writeFileAtomic(repo!.path('link.yaml'), 'id: x\n')).toThrow(UnsafeTargetError);
    const opened = openPolicyTarget(repo.path('link.yaml'), repo.root, true);
    expect(opened.ok ? 'opened' : opened.diagnostics.map((d) => d.code)).toEqual(['policy/symlink']);
    expect(readFileSync(real, 'utf8')).toBe('id: real\ndescription: Real.\n');
  });

  test('the text is renamed into place, leaving no temporary file; the mode of an existing file is kept', () => {
    repo = tempRepo();
    writeFileAtomic(repo.path('a.yaml'), 'one\n');
    chmodSync(repo.path('a.yaml'), 0o600);
    writeFileAtomic(repo.path('a.yaml'), 'two\n');
    expect(readFileSync(repo.path('a.yaml'), 'utf8')).toBe('two\n');
    expect(statSync(repo.path('a.yaml')).mode & 0o777).toBe(0o600);
    expect(readdirSync(repo.root)).toEqual(['a.yaml']);
    expect(existsSync(join(repo.root, '.a.yaml.tmp'))).toBe(false);
  });
});
