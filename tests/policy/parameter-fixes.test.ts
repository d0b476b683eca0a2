/**
 * Fixes for configs built from an architecture definition: the parameters first, each the
 * smallest value on its grid (multiples of its step) within the range the judging side declares
 * that restores the requirement — checked by loading the config with that value, and with one
 * step less —, then the layer fields of the definition. Widths of tests/helpers/definitions.ts:
 * across left-right the tree surrogate's bound is the width of the last conv, ceil(16 · width)
 * (derived here, and read off the engine below).
 */
import { describe, expect, test } from 'vitest';
import { NO_SPAN } from '../../src/diagnostic.js';
import type { LayeredModel } from '../../src/config/model.js';
import { evaluatePolicy, type RequirementResult } from '../../src/policy/evaluate.js';
import type { Policy } from '../../src/policy/policy.js';
import { loadRun, NET, runConfig } from '../helpers/definitions.js';

function policy(partition: string, minRank: bigint): Policy {
  return {
    id: 'test',
    description: 'test policy',
    file: 'p.yaml',
    surrogate: 'tree',
    appliesTo: [],
    partitions: new Map(),
    requirements: [{ partition, minRank, written: `min_rank: ${minRank}`, unproven: 'warn', file: 'p.yaml', span: NO_SPAN }],
    unproven: 'warn',
    removal: 'warn',
    chain: ['p.yaml'],
    span: NO_SPAN,
  };
}

function requirement(config: string, minRank: bigint, files?: Record<string, string>, judging?: Record<string, string>, partition = 'left-right'): RequirementResult {
  const r = loadRun(config, files, judging);
  if (!r.ok) throw new Error(r.diagnostics.map((d) => d.message).join('\n'));
  const out = evaluatePolicy(r.model, policy(partition, minRank), r.parameters ? { parameters: r.parameters } : {});
  if (!out.ok) throw new Error(JSON.stringify(out.diagnostics));
  return out.result.requirements[0]!;
}

const fixText = (q: RequirementResult): string[] =>
  q.fixes.map((f) => `${f.file ?? 'config'}:${f.line}:${f.column} ${f.layer} ${f.field}: ${f.from} → ${f.to}${f.added ? ' (added)' : ''} ${f.verdict}`);

describe('parameter fixes', () => {
  test('the bound follows the width parameter as derived', () => {
    expect(requirement(runConfig('width: 0.5'), 2n).bounds.upper.rank).toBe(8n);
    expect(requirement(runConfig('width: 0.75'), 2n).bounds.upper.rank).toBe(12n);
    expect(requirement(runConfig('width: 1'), 2n).bounds.upper.rank).toBe(16n);
  });

  test('come first, the smallest multiple of the step that restores, then the fields of the definition', () => {
    const q = requirement(runConfig('width: 0.5'), 12n);
    expect(q.verdict).toBe('fail');
    expect(fixText(q)).toEqual([
      'config:4:10 parameter width: 0.5 → 0.75 pass',
      'arch/net.yaml:30:30 b[1] channels: 8 → 12 pass',
    ]);
    // one more than 12 needs the next step: ceil(16 · 0.75) = 12 < 13
    expect(fixText(requirement(runConfig('width: 0.5'), 13n))[0]).toBe('config:4:10 parameter width: 0.5 → 1 pass');
  });

  test('every parameter fix restores the requirement, and one step less does not', () => {
    for (const min of [9n, 12n, 16n, 40n, 64n]) {
      const q = requirement(runConfig('width: 0.5'), min);
      const fix = q.fixes.find((f) => f.layer === 'parameter')!;
      expect(requirement(runConfig(`width: ${fix.to}`), min).failing).toBe(false);
      if (fix.to - 0.25 > 0.5) expect(requirement(runConfig(`width: ${fix.to - 0.25}`), min).failing).toBe(true);
    }
  });

  test('stay within the declared range: no width fix beyond max 4', () => {
    const q = requirement(runConfig('width: 0.5'), 80n);
    expect(q.fixes.some((f) => f.layer === 'parameter')).toBe(false);
    expect(q.fixes.length).toBeGreaterThan(0);
  });

  test('the range is the judging side’s: a head that raises max cannot use it for its fixes', () => {
    const wider = NET.replace('max: 4', 'max: 8');
    const raised = requirement(runConfig('width: 0.5'), 80n, { 'arch/net.yaml': wider });
    expect(fixText(raised)[0]).toBe('config:4:10 parameter width: 0.5 → 5 pass');
    const judged = requirement(runConfig('width: 0.5'), 80n, { 'arch/net.yaml': wider }, { 'arch/net.yaml': NET });
    expect(judged.fixes.some((f) => f.layer === 'parameter')).toBe(false);
  });

  test('a parameter the config leaves at its default is added, at the architecture line', () => {
    expect(fixText(requirement(runConfig(), 20n))[0]).toBe('config:3:17 parameter width: 1 → 1.25 (added) pass');
  });

  test('one entry of a list parameter', () => {
    const net = NET.replace('"=ceil(16 * width)"', '"=widths[1]"').replace(
      '  size: {type: int',
      '  widths: {type: list, default: [8, 16], min: 4, max: 64, step: 4, description: widths per stage}\n  size: {type: int',
    );
    const q = requirement(runConfig('widths: [8, 8]'), 20n, { 'arch/net.yaml': net });
    expect(fixText(q).filter((f) => f.includes('parameter'))).toEqual(['config:4:15 parameter widths[1]: 8 → 20 pass']);
  });

  test('a config that lists its layers directly gets field fixes only, as before', () => {
    const r = loadRun('model:\n  input: {shape: [16, 16], channels: 3}\n  layers:\n    - conv: {channels: 8}\n    - pool: {global: true}\n');
    if (!r.ok) throw new Error('expected a model');
    expect(r.parameters).toBeUndefined();
    const out = evaluatePolicy(r.model as LayeredModel, policy('left-right', 12n));
    if (!out.ok) throw new Error('expected bounds');
    expect(out.result.requirements[0]!.fixes.map((f) => `${f.file ?? 'config'}:${f.line} ${f.layer} ${f.field}: ${f.from} → ${f.to}`)).toEqual(['config:4 0 channels: 8 → 12']);
  });
});
