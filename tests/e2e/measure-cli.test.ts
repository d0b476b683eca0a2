/**
 * End-to-end runs of `rankfloor measure` and `rankfloor ratchet` through the built binary: the
 * JSON document, the policy written (and loaded back by `check`), exit codes, and bad input
 * reported at its place with nothing written.
 */
import { copyFileSync, existsSync, mkdirSync, readFileSync, symlinkSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, describe, expect, test } from 'vitest';
import { tempDir } from '../data/helpers.js';
import { REPO, runCli } from './run-cli.js';

const dir = tempDir('rankfloor-measure-e2e-');
afterAll(() => dir.remove());
mkdirSync(join(dir.path, '.git'));

/** A copied pair (positions 0 and 3) beside two independent positions, each value 0 or 9, 40 rows. */
function pairCsv(name: string): string {
  const rows = ['p0,p1,p2,p3'];
  for (let i = 0; i < 40; i++) {
    const a = i % 2;
    const b = Math.floor(i / 2) % 2;
    const c = Math.floor(i / 4) % 2;
    rows.push([a, b, c, a].map((v) => v * 9).join(','));
  }
  const path = join(dir.path, name);
  writeFileSync(path, rows.join('\n') + '\n');
  return path;
}

const measure = (...args: string[]) => runCli(['measure', ...args, '--root', dir.path], dir.path);

describe('rankfloor measure', () => {
  test('JSON: per partition the bits, spread, saturation, sample size and recommended minimum', () => {
    const csv = pairCsv('pair.csv');
    const r = measure(csv, '--partition', 'start-end', '--partition', 'positions:0,3', '--batch', '8', '--format', 'json');
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const doc = JSON.parse(r.stdout);
    expect(Object.keys(doc)).toEqual(['version', 'data', 'method', 'partitions', 'policy']);
    expect(doc.data).toMatchObject({ file: csv, format: 'csv', samples: 40, shape: [4], kind: 'values', channels: 1, range: [0, 9], classes: null });
    expect(doc.method).toEqual({ feature_map: 'cos-sin', weighting: 'none', samples: 40, batches: 5, batch_size: [8, 8], epsilon: 0.05 });
    const [split, together] = doc.partitions;
    expect(Object.keys(split)).toEqual([
      'partition', 'description', 'bits', 'spread', 'saturated', 'saturation', 'ceiling_bits', 'half_batch_bits', 'epsilon_rank', 'samples', 'class', 'recommended', 'reason',
    ]);
    expect(split.partition).toBe('start-end');
    expect(split.samples).toBe(40);
    expect(split.ceiling_bits).toBe(3);
    // Across start-end each batch holds the copied pair (about 1 bit) and whatever dependency
    // between positions 1 and 2 a random batch of 8 happens to have: between 0.5 and 2 bits (two
    // binary positions a side). With the pair on one side (positions:0,3) only that chance part is left.
    expect(split.bits).toBeGreaterThan(0.5);
    expect(split.bits).toBeLessThanOrEqual(2);
    expect(together.bits).toBeLessThan(split.bits - 0.5);
    expect(split.saturated).toBe(false);
    expect(doc.policy).toBeNull();
  });

  test('--write creates a policy that validates, loads, and is used by check', () => {
    const csv = pairCsv('pair-write.csv');
    const policy = join(dir.path, 'policies', 'pairs.yaml');
    const r = measure(csv, '--partition', 'start-end', '--batch', '20', '--policy', policy, '--write', '--format', 'json');
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const doc = JSON.parse(r.stdout);
    const recommended: string = doc.partitions[0].recommended;
    expect(Number(recommended)).toBeGreaterThanOrEqual(2);
    expect(doc.policy).toEqual({ file: policy, written: true, created: true, changes: [{ partition: 'start-end', action: 'added', min_rank: recommended, previous: null }] });
    const text = readFileSync(policy, 'utf8');
    expect(text).toContain(`- {partition: start-end, min_rank: ${recommended}}`);
    expect(text).toContain('bootstrap standard error over 2 batches of 20');
    const config = join(dir.path, 'seq.yaml');
    writeFileSync(config, 'model:\n  input: {shape: [4], features: 2}\n  layers:\n    - recurrent: {hidden: 8}\n');
    const check = runCli(['check', '--policy', policy, config, '--root', dir.path, '--format', 'json'], dir.path);
    expect(check.stderr).toBe('');
    expect(JSON.parse(check.stdout).results[0].requirements[0].partition).toBe('start-end');
  });

  test('text report: the table, the sampling facts and the cautions', () => {
    const r = measure(pairCsv('pair-text.csv'), '--partition', 'start-end', '--batch', '20');
    expect(r.code).toBe(0);
    expect(r.stdout).toContain('40 samples (csv, dated ');
    expect(r.stdout).toContain('measured in 2 batches of 20 (no batch can show more than 4.3 bits)');
    expect(r.stdout).toMatch(/\npartition +measured bits +ε-rank +recommended minimum\nstart-end +1\.\d\d ± 0\.\d\d +\d +min_rank \d \(1\.\d\d bits\)\n/);
    expect(r.stdout).toContain('a recommended minimum is a necessary\ncondition only');
  });

  test('bad data: file:line:col, exit 2, nothing written, nothing on standard output', () => {
    const csv = join(dir.path, 'bad.csv');
    writeFileSync(csv, '1,2,3\n4,5,6\n7,x,9\n');
    const policy = join(dir.path, 'never.yaml');
    const r = measure(csv, '--policy', policy, '--write');
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr).toBe(`${csv}:3:3: error: column 2 holds 'x', which is not a finite number [data/not-a-number]\n`);
    expect(existsSync(policy)).toBe(false);
  });

  test('an existing policy is left as it was when the data is bad', () => {
    const policy = join(dir.path, 'kept.yaml');
    const before = 'id: kept\ndescription: Kept.\nrequire:\n  - {partition: start-end, min_rank: 2}\n';
    writeFileSync(policy, before);
    const jsonl = join(dir.path, 'bad.jsonl');
    writeFileSync(jsonl, '["a", "b"]\n["a"]\n');
    const r = measure(jsonl, '--policy', policy, '--write');
    expect(r.code).toBe(2);
    expect(r.stderr).toContain(`${jsonl}:2:1: error: this sequence has 1 tokens; the first has 2`);
    expect(readFileSync(policy, 'utf8')).toBe(before);
  });

  test("a policy's named partition that does not fit the data is reported at the policy's line", () => {
    const policy = join(dir.path, 'wide.yaml');
    writeFileSync(policy, 'id: wide\ndescription: Wide.\npartitions:\n  head: {kind: block, range: [0, 9]}\n');
    const r = measure(pairCsv('pair-wide.csv'), '--policy', policy);
    expect(r.code).toBe(2);
    expect(r.stderr.split('\n')[0]).toBe(`${policy}:4:3: error: the policy's partition 'head' does not fit the data of shape [4]: partition 'block:0-9': the ranges must be non-empty and lie inside the input shape [4] [data/partition-shape]`);
  });

  test('a policy target that is a symbolic link is refused before anything is measured', () => {
    const real = join(dir.path, 'real.yaml');
    writeFileSync(real, 'id: real\ndescription: Real.\n');
    const link = join(dir.path, 'link.yaml');
    symlinkSync(real, link);
    const r = measure(pairCsv('pair-link.csv'), '--policy', link, '--write');
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('[policy/symlink]');
    expect(readFileSync(real, 'utf8')).toBe('id: real\ndescription: Real.\n');
  });

  test('usage errors exit 2', () => {
    expect(measure(pairCsv('pair-usage.csv'), '--write').code).toBe(2);
    expect(measure(pairCsv('pair-usage2.csv'), '--epsilon', '2').stderr).toContain('--epsilon must be a number between 0 and 1');
    expect(measure(pairCsv('pair-usage3.csv'), '--partition', 'left-right').stderr).toContain("partition 'left-right' needs a 2D input");
  });
});

describe('rankfloor ratchet', () => {
  test("a blessed config's proven lower bounds less a margin; the config passes the policy it wrote", () => {
    // Configs are read only inside the repository root: the blessed config and its trimmed copy live there.
    const config = join(dir.path, 'renal-pair-net.yaml');
    const trimmedConfig = join(dir.path, 'renal-pair-net-trimmed.yaml');
    copyFileSync(join(REPO, 'examples', 'renal-pair-net.yaml'), config);
    copyFileSync(join(REPO, 'examples', 'renal-pair-net-trimmed.yaml'), trimmedConfig);
    const policy = join(dir.path, 'ratchet', 'renal.yaml');
    const r = runCli(['ratchet', config, '--margin', '1', '--policy', policy, '--write', '--format', 'json', '--root', dir.path], dir.path);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const doc = JSON.parse(r.stdout);
    const bounds = JSON.parse(runCli(['bounds', config, '--format', 'json']).stdout);
    expect(doc.partitions.map((p: { partition: string }) => p.partition)).toEqual(bounds.partitions.map((p: { partition: string }) => p.partition));
    doc.partitions.forEach((p: { lower: { rank: string }; minimum: string }, i: number) => {
      // ⌈lower / 2⌉, from the lower bound `bounds` reports (never the upper one).
      expect(p.lower.rank).toBe(bounds.partitions[i].lower.rank);
      expect(BigInt(p.minimum)).toBe((BigInt(p.lower.rank) + 1n) / 2n);
    });
    const text = readFileSync(policy, 'utf8');
    expect(text).toContain('surrogate: tree\n');
    expect(text).toContain('- {partition: left-right, min_rank: 128}');
    const check = runCli(['check', '--policy', policy, config, '--root', dir.path], dir.path);
    expect(check.code).toBe(0);
    expect(check.stdout).toContain('0 failing, 0 unproven');
    const trimmed = runCli(['check', '--policy', policy, trimmedConfig, '--root', dir.path], dir.path);
    expect(trimmed.code).toBe(1);
  });

  test('a surrogate other than the policy\'s is refused', () => {
    const policy = join(dir.path, 'tree-policy.yaml');
    writeFileSync(policy, 'id: t\ndescription: T.\nsurrogate: tree\n');
    const r = runCli(['ratchet', join(REPO, 'examples', 'renal-pair-net.yaml'), '--policy', policy, '--surrogate', 'overlap', '--root', dir.path], dir.path);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('under the tree surrogate');
  });
});
