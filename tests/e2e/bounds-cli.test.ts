/**
 * End-to-end runs of `rankfloor bounds` through the built binary: the JSON document's shape and
 * values, exit codes, and error messages with file:line:col.
 */
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, test } from 'vitest';
import { runCli } from './run-cli.js';

function tempConfig(text: string): string {
  const dir = mkdtempSync(join(tmpdir(), 'rankfloor-e2e-'));
  const file = join(dir, 'model.yaml');
  writeFileSync(file, text);
  return file;
}

describe('rankfloor bounds', () => {
  test('JSON: one document with exact ranks, status and the cut', () => {
    // 4×4 grid, 2×2 pooling, M = 2, two conv layers of 2 channels, locally connected:
    // checkerboard rank 16 and left-right rank 2 (exact generic ranks, measured here mod a prime;
    // Levine et al., "Deep learning and quantum entanglement", ICLR 2018: min-cut is attained).
    const file = tempConfig(`model:
  input: {shape: [4, 4], features: 2}
  weight_sharing: false
  layers:
    - conv: {channels: 2}
    - pool: {window: 2}
    - conv: {channels: 2, name: top}
    - pool: {window: 2}
`);
    const r = runCli(['bounds', file, '--partition', 'checkerboard', '--partition', 'left-right', '--format', 'json']);
    expect(r.code).toBe(0);
    expect(r.stderr).toBe('');
    const doc = JSON.parse(r.stdout);
    expect(Object.keys(doc)).toEqual(['file', 'surrogate', 'partitions']);
    expect(doc.surrogate).toBe('tree');
    expect(doc.partitions.map((p: { partition: string }) => p.partition)).toEqual(['checkerboard', 'left-right']);
    const [cb, lr] = doc.partitions;
    expect(Object.keys(cb)).toEqual(['partition', 'upper', 'lower', 'status', 'cut']);
    expect(cb.upper).toEqual({ rank: '16', log2: 4, method: 'min-cut' });
    expect(cb.lower).toMatchObject({ rank: '16', log2: 4 });
    expect(cb.status).toBe('exact');
    // the four level-1 copy tensors carry the 2 channels of the first conv (layer 0, line 5)
    expect(cb.cut).toEqual([{ layer: 0, line: 5, dim: 2, count: 4 }]);
    expect(lr.upper.rank).toBe('2');
    expect(lr.status).toBe('exact');
  });

  test('default partitions follow the input shape; the overlap surrogate is named', () => {
    const file = tempConfig('model:\n  input: {shape: [8], features: 2}\n  layers:\n    - conv: {channels: 2, kernel: 3}\n    - pool: {window: 2}\n');
    const r = runCli(['bounds', file, '--surrogate', 'overlap', '--format', 'json']);
    expect(r.code).toBe(0);
    const doc = JSON.parse(r.stdout);
    expect(doc.surrogate).toBe('overlap');
    expect(doc.partitions.map((p: { partition: string }) => p.partition)).toEqual(['start-end', 'interleaved']);
  });

  test('text output names the surrogate and the bottleneck layer', () => {
    const r = runCli(['bounds', 'examples/renal-pair-net-trimmed.yaml', '--partition', 'left-right']);
    expect(r.code).toBe(0);
    expect(r.stdout).toContain('surrogate: tree');
    expect(r.stdout).toMatch(/left-right\s+4\.00\s+16\s+4\.00\s+exact\s+layer 8 \(line 17\): 1 × 16/);
  });

  test('a schema error: exit 2, file:line:col on stderr, nothing on stdout', () => {
    const file = tempConfig('model:\n  input: {shape: [8], features: 2}\n  layers:\n    - conv: {chanels: 4}\n');
    const r = runCli(['bounds', file, '--format', 'json']);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr).toContain(`${file}:4:14: error:`);
    expect(r.stderr).toContain("did you mean 'channels'");
    expect(r.stderr).not.toMatch(/\n\s+at /);
  });

  test('a window wider than the grid it reaches: exit 2 with the window position', () => {
    const file = tempConfig('model:\n  input: {shape: [6], channels: 2}\n  layers:\n    - conv: {channels: 2}\n    - pool: {window: 8}\n');
    const r = runCli(['bounds', file]);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain(`${file}:5:22: error:`);
    expect(r.stderr).toContain('config/window-does-not-fit');
  });

  test('malformed YAML: exit 2 with its position', () => {
    const file = tempConfig('model:\n  input: {shape: [8], features: 2\n  layers: []\n');
    const r = runCli(['bounds', file]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(new RegExp(`${file.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}:\\d+:\\d+: error:`));
  });

  test('usage errors exit 2: unknown option, unknown partition, bad surrogate, missing file', () => {
    expect(runCli(['bounds', 'examples/gait-sequence.yaml', '--bogus']).code).toBe(2);
    const p = runCli(['bounds', 'examples/gait-sequence.yaml', '--partition', 'left-right']);
    expect(p.code).toBe(2);
    expect(p.stderr).toContain('needs a 2D input');
    const q = runCli(['bounds', 'examples/gait-sequence.yaml', '--partition', 'strat-end']);
    expect(q.stderr).toContain("did you mean 'start-end'");
    expect(runCli(['bounds', 'examples/gait-sequence.yaml', '--surrogate', 'dense']).code).toBe(2);
    const missing = runCli(['bounds', 'no/such/file.yaml']);
    expect(missing.code).toBe(2);
    expect(missing.stderr).toContain('no/such/file.yaml');
  });

  test('a network over the node limit is refused with exit 2', () => {
    const file = tempConfig('model:\n  input: {shape: [4096, 4096], features: 2}\n  layers:\n    - conv: {channels: 2}\n');
    const r = runCli(['bounds', file]);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('network/too-large');
  });

  test('same input, same bytes', () => {
    const a = runCli(['bounds', 'examples/weave-defects-training.yaml', '--model-path', '/experiment/network', '--format', 'json']);
    const b = runCli(['bounds', 'examples/weave-defects-training.yaml', '--model-path', '/experiment/network', '--format', 'json']);
    expect(a.code).toBe(0);
    expect(a.stdout).toBe(b.stdout);
  });
});
