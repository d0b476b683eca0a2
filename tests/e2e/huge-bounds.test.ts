/**
 * Bounds beyond the 4,000,000-bit limit are results, never input errors: every consumer (verdicts,
 * drops, fixes, the JSON `rank: null`, SARIF, JUnit, the job summary) works from the bound's log2
 * and the sentinel rank, which lies above every minimum a policy can state (2^1,000,000), so that
 * verdicts stay exact. The sizes (derived here): a depth-3 recurrent net of width 24 over 65,536
 * steps has an interleaved degree bound of about 18.7 million bits; an unshared pyramid of 280,000
 * positions with 2^30-wide maps cuts 140,000 windows of 30 bits each, 4,200,000 bits, above (the
 * min-cut) and below (power rounding, exact on powers of one integer).
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, test } from 'vitest';
import { loadConfigText } from '../../src/config/load-config.js';
import { computeBounds } from '../../src/cut/bounds.js';
import { HUGE_RANK } from '../../src/cut/types.js';
import { resolvePartition } from '../../src/partition/partition.js';
import { boundsJson } from '../../src/report/bounds-json.js';
import { checkJson } from '../../src/report/check-json.js';
import { renderJobSummary } from '../../src/action/job-summary.js';
import { runCheck } from '../../src/check/run-check.js';
import { runRatchet } from '../../src/data/ratchet-job.js';
import { ratchetJson, ratchetText } from '../../src/data/ratchet-report.js';
import { initRepo, isolateThisProcess, removeTempDirs } from '../action/action-fixture.js';
import { runCli } from './run-cli.js';

const dirs: string[] = [];
afterAll(() => dirs.forEach((d) => rmSync(d, { recursive: true, force: true })));

function scratch(files: Record<string, string>): string {
  const dir = mkdtempSync(join(tmpdir(), 'rankfloor-huge-'));
  dirs.push(dir);
  for (const [name, text] of Object.entries(files)) writeFileSync(join(dir, name), text);
  return dir;
}

const RECURRENT = `model:
  input: {shape: [65536], channels: 6}
  layers:
    - recurrent: {hidden: 24, depth: 3, name: memory}
    - dense: {units: 1}
`;

const POLICY = `id: long
description: long memory
applies_to: ["*.yaml"]
require:
  - {partition: interleaved, min_bits: 1000000}
  - {partition: start-end, min_rank: 16}
`;

describe('a depth-3 recurrent net over 65,536 steps', () => {
  test('bounds: exit 0, the interleaved bound by its log2 and rank null', () => {
    const dir = scratch({ 'rnn.yaml': RECURRENT });
    const r = runCli(['bounds', 'rnn.yaml', '--format', 'json'], dir);
    expect(r.code).toBe(0);
    const parts = JSON.parse(r.stdout).partitions;
    const interleaved = parts.find((p: { partition: string }) => p.partition === 'interleaved');
    expect(interleaved.upper.rank).toBeNull();
    expect(interleaved.upper.log2).toBeGreaterThan(4_000_000);
    expect(interleaved.status).toBe('bounded');
    const text = runCli(['bounds', 'rnn.yaml'], dir);
    expect(text.code).toBe(0);
    expect(text.stdout).toMatch(/interleaved +18749704\.53 +more than 2\^4,000,000 \(≈2\^18749704\.5\)/);
  });

  test('check: the largest minimum a policy can state is not refuted by a huge ceiling; every report is written; exit 0', () => {
    const dir = scratch({ 'rnn.yaml': RECURRENT, 'policy.yaml': POLICY });
    const r = runCli(['check', '--policy', 'policy.yaml', 'rnn.yaml', '--format', 'json', '--sarif', 'out.sarif', '--junit', 'out.xml'], dir);
    expect(r.code).toBe(0);
    const [interleaved, startEnd] = JSON.parse(r.stdout).results[0].requirements;
    expect(interleaved).toMatchObject({ verdict: 'unproven', upper: { rank: null }, required: { log2: 1_000_000 } });
    expect(startEnd.verdict).toBe('pass');
    const sarif = JSON.parse(readFileSync(join(dir, 'out.sarif'), 'utf8')).runs[0].results;
    expect(sarif.map((x: { ruleId: string; level: string }) => `${x.ruleId} ${x.level}`)).toEqual(['rankfloor/requirement-unproven warning']);
    expect(sarif[0].message.text).toContain('more than 2^4,000,000 (≈2^18749704.5)');
    const junit = readFileSync(join(dir, 'out.xml'), 'utf8');
    expect(junit).toContain('tests="2" failures="0" errors="0" skipped="1"');
    expect(junit).toContain('more than 2^4,000,000');
  });

  test('check --base: huge ceilings are compared by log2; a fall of the ceiling alone may have dropped, with no fix from a huge target; the job summary shows the range', () => {
    isolateThisProcess();
    const repo = initRepo();
    repo.write('policies/long.yaml', 'id: long\ndescription: long memory\napplies_to: ["models/*.yaml"]\nmax_drop_bits: 2\nunproven: fail\nrequire:\n  - {partition: interleaved, min_rank: 16}\n');
    repo.write('models/rnn.yaml', RECURRENT);
    const base = repo.commit('base');
    repo.write('models/rnn.yaml', RECURRENT.replace('hidden: 24', 'hidden: 16'));
    const outcome = runCheck({ cwd: repo.dir, policy: 'policies', configs: [], base });
    expect(outcome.errors).toEqual([]);
    const interleaved = JSON.parse(checkJson(outcome)).results[0].requirements[0];
    expect(interleaved).toMatchObject({ base: { upper: { rank: null } }, upper: { rank: null }, drop: 'possible', drop_fails: true, fix: [] });
    expect(interleaved.change_bits).toBeLessThan(-2);
    const summary = renderJobSummary(outcome, 'fail', []);
    expect(summary).toMatch(/<td>interleaved<\/td><td>4\.00<\/td><td>4\.58–18749704\.53<\/td><td>[0-9.]+–[0-9.]+<\/td><td>-[0-9.]+<\/td><td>fail \(may have dropped\)<\/td>/);
    removeTempDirs();
  });
});

describe('a 448×448 input under overlap', () => {
  test('check finishes with a result, not an input error', () => {
    const config = `model:\n  input: {shape: [448, 448], representation: 3}\n  layers:\n    - conv: {channels: 4, kernel: 3}\n    - pool: {window: 4}\n    - conv: {channels: 4, kernel: 3}\n    - pool: {global: true}\n    - dense: {units: 1}\n`;
    const policy = `id: big\ndescription: big images\napplies_to: ["*.yaml"]\nsurrogate: overlap\nrequire:\n  - {partition: checkerboard, min_rank: 4}\n  - {partition: left-right, min_rank: 4}\n`;
    const dir = scratch({ 'big.yaml': config, 'policy.yaml': policy });
    const c = runCli(['check', '--policy', 'policy.yaml', 'big.yaml', '--format', 'json'], dir);
    expect(c.code).toBe(0);
    expect(JSON.parse(c.stdout).errors).toEqual([]);
  });
});

describe('a lower bound beyond the limit', () => {
  test('is reported by its log2 too; two huge bounds are never called exact; a minimum of 2^1,000,000 passes', () => {
    const text = `model:\n  input: {shape: [280000], representation: 1073741824}\n  weight_sharing: false\n  layers:\n    - conv: {channels: 1073741824}\n    - pool: {window: 2}\n    - conv: {channels: 1073741824}\n    - pool: {global: true}\n    - dense: {units: 1}\n`;
    const loaded = loadConfigText(text, 'pyramid.yaml');
    if (!loaded.ok) throw new Error('config');
    const p = resolvePartition('interleaved', [280000]);
    if (!p.ok) throw new Error('partition');
    const out = computeBounds(loaded.model, [p.partition], { surrogate: 'tree' });
    if (!out.ok) throw new Error('bounds');
    const b = out.result.partitions[0]!;
    expect([b.upper.huge, b.lower?.huge, b.upper.log2, b.lower?.log2, b.status]).toEqual([true, true, 4_200_000, 4_200_000, 'bounded']);
    expect(b.lower!.rank).toBe(HUGE_RANK);
    expect(b.lower!.rank >= 1n << 1_000_000n).toBe(true);
    const json = JSON.parse(boundsJson(out.result)).partitions[0];
    expect([json.upper.rank, json.lower.rank]).toEqual([null, null]);
    // ratchet: a floor from it is capped at the largest minimum a policy states, 2^1,000,000.
    const dir = scratch({ 'pyramid.yaml': text });
    const ratchet = runRatchet({ config: join(dir, 'pyramid.yaml'), partitions: ['interleaved'], write: false, margin: 2, cwd: dir, root: dir });
    if (!ratchet.ok) throw new Error('ratchet');
    expect(ratchet.outcome.partitions[0]!.minRank).toBe(1n << 1_000_000n);
    expect(ratchetText(ratchet.outcome)).toMatch(/interleaved +more than 2\^4000000 \(≈2\^4200000\.0\) \(4200000\.0 bits\) +min_rank 2\^1000000/);
    expect(JSON.parse(ratchetJson(ratchet.outcome)).partitions[0].lower.rank).toBeNull();
  });
});
