/**
 * End-to-end runs of `rankfloor check` through the built binary over the bundled examples and
 * policies, and over a scratch repository for error handling: verdicts, exit codes, JSON shape.
 */
import { mkdirSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, test } from 'vitest';
import { runCli } from './run-cli.js';

describe('rankfloor check over examples/ and policies/', () => {
  test('the planted failure fails, the rest pass or warn; exit 1', () => {
    const r = runCli(['check', '--policy', 'policies/', '--format', 'json']);
    expect(r.code).toBe(1);
    expect(r.stderr).toBe('');
    const doc = JSON.parse(r.stdout);
    expect(Object.keys(doc)).toEqual(['version', 'verdict', 'results', 'errors']);
    expect(doc.version).toBe(1);
    expect(doc.verdict).toBe('fail');
    expect(doc.errors).toEqual([]);
    const verdicts = Object.fromEntries(
      doc.results.map((x: { file: string; policy: string; verdict: string }) => [`${x.file} ${x.policy}`, x.verdict]),
    );
    expect(verdicts).toEqual({
      'examples/architectures/causal-lm-release-notes.yaml long-document-memory': 'pass',
      'examples/architectures/lstm-ticket-router.yaml long-document-memory': 'pass',
      'examples/gait-sequence.yaml long-sensor-sequences': 'pass',
      'examples/renal-pair-net-trimmed.yaml paired-organ-scans': 'fail',
      'examples/renal-pair-net.yaml paired-organ-scans': 'pass',
      'examples/train/gait-stride-clip.yaml wearable-gait-scores': 'pass',
      'examples/train/gait-stride-watch.yaml wearable-gait-scores': 'pass',
      'examples/train/seedling-tray-compact.yaml seedling-trays': 'pass',
      'examples/train/seedling-tray-full.yaml seedling-trays': 'pass',
      'examples/weave-defects-training.yaml textile-inspection': 'pass',
    });
    const trimmed = doc.results.find((x: { file: string }) => x.file === 'examples/renal-pair-net-trimmed.yaml');
    const organ = trimmed.requirements.find((q: { partition: string }) => q.partition === 'organ-pair');
    expect(organ).toMatchObject({
      required: { rank: '64', log2: 6 },
      upper: { rank: '16', log2: 4 },
      lower: { rank: '16', log2: 4 },
      status: 'exact',
      verdict: 'fail',
      cut: [{ layer: 8, line: 17, dim: 16, count: 1 }],
    });
    expect(organ.fix).toEqual([
      { layer: 8, field: 'channels', line: 17, column: 24, from: 16, to: 64, added_parameters: '7104', verdict: 'pass', rule: 'top-window span' },
    ]);
    const gait = doc.results.find((x: { file: string }) => x.file === 'examples/gait-sequence.yaml');
    // the depth-3 recurrence proves its start-end floor (the depth-2 bound, lowest level passed
    // through), the linearised-attention model both floors (its first attention layer), and the
    // LSTM classifier both floors
    expect(gait.requirements.map((q: { verdict: string }) => q.verdict)).toEqual(['pass', 'pass']);
    expect(gait.requirements[0].lower.rank).toBe('865397898472749309383031225'); // C(24 + 128 − 1, 128)
    const lm = doc.results.find((x: { file: string }) => x.file === 'examples/architectures/causal-lm-release-notes.yaml');
    expect(lm.requirements.map((q: { verdict: string }) => q.verdict)).toEqual(['pass', 'pass']);
    expect(lm.requirements.map((q: { lower: { rank: string } }) => q.lower.rank)).toEqual(['257', '257']);
    const router = doc.results.find((x: { file: string }) => x.file === 'examples/architectures/lstm-ticket-router.yaml');
    expect(router.requirements.map((q: { verdict: string }) => q.verdict)).toEqual(['pass', 'pass']);
  });

  test('text: the failing requirement is explained; --quiet prints failures only', () => {
    const r = runCli(['check', '--policy', 'policies/']);
    expect(r.code).toBe(1);
    expect(r.stdout).toContain('FAIL      organ-pair — columns 0-31 against columns 32-63');
    expect(r.stdout).toContain('provably short by 2.00 bits');
    expect(r.stdout).toContain('bottleneck (min-cut): 1 bond of dimension 16 from layer 8 (line 17)');
    expect(r.stdout).toContain('line 17:24  layer 8 channels: 16 → 64');
    expect(r.stdout).not.toContain('\u001b[');
    const q = runCli(['check', '--policy', 'policies/', '--quiet']);
    expect(q.stdout).not.toContain('PASS');
    expect(q.stdout).toContain('FAIL');
  });

  test('a single policy file with an explicit config ignores applies_to; a passing run exits 0', () => {
    const r = runCli(['check', '--policy', 'policies/paired-organ-scans.yaml', 'examples/renal-pair-net.yaml', '--format', 'json']);
    expect(r.code).toBe(0);
    expect(JSON.parse(r.stdout).verdict).toBe('pass');
  });
});

describe('rankfloor check: errors', () => {
  function scratchRepo(): string {
    const root = mkdtempSync(join(tmpdir(), 'rankfloor-check-'));
    mkdirSync(join(root, '.git'));
    mkdirSync(join(root, 'configs'));
    mkdirSync(join(root, 'policies'));
    writeFileSync(
      join(root, 'policies', 'seq.yaml'),
      'id: seq\ndescription: sequences\napplies_to: ["configs/*.yaml"]\nrequire:\n  - {partition: start-end, min_rank: 3}\n',
    );
    writeFileSync(join(root, 'configs', 'good.yaml'), 'model:\n  input: {shape: [8], features: 4}\n  layers:\n    - recurrent: {hidden: 4}\n');
    writeFileSync(join(root, 'configs', 'short.yaml'), 'model:\n  input: {shape: [8], features: 4}\n  layers:\n    - recurrent: {hidden: 2}\n');
    return root;
  }

  test('a malformed config: exit 2, its position reported, the other files still checked', () => {
    const root = scratchRepo();
    writeFileSync(join(root, 'configs', 'broken.yaml'), 'model:\n  input: {shape: [8], features: 4}\n  layers:\n    - recurrent: {hiden: 4}\n');
    const r = runCli(['check', '--policy', 'policies', '--format', 'json'], root);
    expect(r.code).toBe(2);
    const doc = JSON.parse(r.stdout);
    expect(doc.verdict).toBe('error');
    expect(doc.results.map((x: { file: string; verdict: string }) => `${x.file}:${x.verdict}`)).toEqual([
      'configs/good.yaml:pass',
      'configs/short.yaml:fail',
    ]);
    expect(doc.errors).toHaveLength(1);
    expect(doc.errors[0]).toMatchObject({ file: 'configs/broken.yaml', line: 4, column: 19 });
    expect(r.stderr).toContain('configs/broken.yaml:4:19: error:');
  });

  test('a failing requirement without input errors exits 1', () => {
    const r = runCli(['check', '--policy', 'policies'], scratchRepo());
    expect(r.code).toBe(1);
  });

  test('a policy with a schema error: exit 2 with the policy position', () => {
    const root = scratchRepo();
    writeFileSync(join(root, 'policies', 'bad.yaml'), 'id: bad\ndescription: x\nrequire:\n  - {partition: start-end, min_rnk: 3}\n');
    const r = runCli(['check', '--policy', 'policies', '--format', 'json'], root);
    expect(r.code).toBe(2);
    const doc = JSON.parse(r.stdout);
    expect(doc.errors[0]).toMatchObject({ file: 'policies/bad.yaml', line: 4 });
  });

  test('usage: --policy is required, a missing policy path is a usage error', () => {
    expect(runCli(['check']).code).toBe(2);
    expect(runCli(['check', '--policy', 'no/such/dir']).code).toBe(2);
  });
});
