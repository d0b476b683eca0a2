/**
 * The hostile inputs of the command line, through the built binary: a one-line config of
 * thousands of bad layers prints a bounded report, a billion-position input and a deep width-1
 * recurrence under `check` end as positioned errors or correct results, never "internal error".
 */
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, test } from 'vitest';
import { runCli } from './run-cli.js';

const dir = mkdtempSync(join(tmpdir(), 'rankfloor-hostile-'));
function file(name: string, text: string): string {
  const path = join(dir, name);
  writeFileSync(path, text);
  return path;
}

describe('hostile inputs through the CLI', () => {
  test('a 260 KB one-line config with 7,500 bad layers: 51 diagnostics in a few kilobytes, exit 2', () => {
    const layers = Array.from({ length: 7_500 }, () => '{conv: {channels: -1, kernal: 3}}').join(', ');
    const config = file('flood.yaml', `model: {input: {shape: [16], features: 2}, layers: [${layers}]}\n`);
    const r = runCli(['bounds', config]);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr.length).toBeLessThan(51 * 480);
    expect(r.stderr.match(/\]\n/g)).toHaveLength(51);
    expect(r.stderr).toContain('and 14,950 more problems in this file');
  });

  test('a billion positions: the loader refuses it at the shape', () => {
    const config = file('big.yaml', 'model:\n  input: {shape: [1000000000], features: 2}\n  layers:\n    - conv: {channels: 4}\n    - pool: {global: true}\n');
    const r = runCli(['bounds', config]);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain(`${config}:2:18: error: model.input.shape has 1,000,000,000 positions`);
  });

  test('check: a recurrent layer of width 1 and depth 3 over 64 steps fails its policy with rank 1', () => {
    const config = file('rec.yaml', 'model:\n  input: {shape: [64], features: 2}\n  layers:\n    - recurrent: {hidden: 1, depth: 3}\n');
    const policy = file('policy.yaml', 'id: p\ndescription: Test.\napplies_to: ["*.yaml"]\nrequire:\n  - {partition: start-end, min_rank: 2}\n');
    const r = runCli(['check', '--policy', policy, config], dir);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(1);
    expect(r.stdout).toContain('allows  exactly 1 (0.00 bits) — provably short by 1.00 bits');
  });
});
