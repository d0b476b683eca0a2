/**
 * Verdicts and fixes on the engine: exact threshold edges, unproven in both modes, every fix
 * checked by applying it (and one less), and directional facts of the trade about where width
 * buys which dependency.
 */
import { describe, expect, test } from 'vitest';
import { NO_SPAN } from '../../src/diagnostic.js';
import type { LayeredModel } from '../../src/config/model.js';
import type { Policy, Requirement, UnprovenMode } from '../../src/policy/policy.js';
import { evaluatePolicy } from '../../src/policy/evaluate.js';
import { computeBounds } from '../../src/cut/bounds.js';
import { resolvePartition } from '../../src/partition/partition.js';
import { layered } from '../helpers/models.js';

function req(partition: string, minRank: bigint, unproven: UnprovenMode = 'warn'): Requirement {
  return { partition, minRank, written: `min_rank: ${minRank}`, unproven, file: 'p.yaml', span: NO_SPAN };
}

function policy(requirements: Requirement[], extra: Partial<Policy> = {}): Policy {
  return {
    id: 'test',
    description: 'test policy',
    file: 'p.yaml',
    surrogate: 'tree',
    appliesTo: [],
    partitions: new Map(),
    requirements,
    unproven: 'warn',
    removal: 'warn',
    chain: ['p.yaml'],
    span: NO_SPAN,
    ...extra,
  };
}

function evaluate(model: LayeredModel, p: Policy) {
  const out = evaluatePolicy(model, p);
  if (!out.ok) throw new Error(JSON.stringify(out.diagnostics));
  return out.result;
}

/** 8×8, M = 2, three stages; unshared, so every bound here is exact (power-rounding rule). */
function pyramid(r1: number, r2: number, r3: number, shared = false): LayeredModel {
  return layered([8, 8], 2, [
    { kind: 'conv', channels: r1 },
    { kind: 'pool', window: [2, 2] },
    { kind: 'conv', channels: r2 },
    { kind: 'pool', window: [2, 2] },
    { kind: 'conv', channels: r3 },
    { kind: 'pool', window: [2, 2] },
  ], shared);
}

function rank(model: LayeredModel, spec: string, probeBudget?: number): { upper: bigint; lower: bigint | undefined } {
  const r = resolvePartition(spec, model.input.shape);
  if (!r.ok) throw new Error(r.message);
  const out = computeBounds(model, [r.partition], { surrogate: 'tree', ...(probeBudget === undefined ? {} : { probeBudget }) });
  if (!out.ok) throw new Error('bounds');
  const b = out.result.partitions[0]!;
  return { upper: b.upper.rank, lower: b.lower?.rank };
}

describe('verdicts', () => {
  test('a minimum equal to an exact bound passes; one more fails', () => {
    const m = pyramid(4, 8, 16);
    expect(rank(m, 'left-right')).toEqual({ upper: 16n, lower: 16n });
    const r = evaluate(m, policy([req('left-right', 16n), req('left-right', 17n)]));
    expect(r.requirements.map((q) => q.verdict)).toEqual(['pass', 'fail']);
    expect(r.verdict).toBe('fail');
  });

  test('unproven counts as the policy says', () => {
    // Shared weights, checkerboard: upper 3^16 (symmetric groups of the first windows), lower 2^16
    // (split windows: each 2×2 window's sum of 4 products has rank ≥ 3 + 3 − 4), so 2^20 is
    // neither proven nor refuted.
    const m = pyramid(4, 8, 16, true);
    const b = rank(m, 'checkerboard');
    expect([b.upper, b.lower]).toEqual([3n ** 16n, 2n ** 16n]);
    const warn = evaluate(m, policy([req('checkerboard', 2n ** 20n, 'warn')]));
    expect(warn.requirements[0]!.verdict).toBe('unproven');
    expect(warn.requirements[0]!.failing).toBe(false);
    expect(warn.verdict).toBe('pass');
    const fail = evaluate(m, policy([req('checkerboard', 2n ** 20n, 'fail')]));
    expect(fail.requirements[0]!.failing).toBe(true);
    expect(fail.verdict).toBe('fail');
  });

  test('named partitions resolve through the policy', () => {
    const named = new Map([['roi', { name: 'roi', spec: 'block:0-4,0-8', file: 'p.yaml', span: NO_SPAN }]]);
    const r = evaluate(pyramid(4, 8, 16), policy([req('roi', 16n)], { partitions: named }));
    expect(r.requirements[0]!.partition.label).toBe('roi');
    expect(r.requirements[0]!.bounds.upper.rank).toBe(rank(pyramid(4, 8, 16), 'top-bottom').upper);
  });

  test('a partition that does not fit the config is an input error at the requirement', () => {
    const out = evaluatePolicy(pyramid(4, 8, 16), policy([req('start-end', 2n)]));
    expect(out.ok).toBe(false);
    if (!out.ok) expect(out.diagnostics[0]!.code).toBe('policy/partition-does-not-fit');
  });
});

describe('fixes', () => {
  const cases: { name: string; model: LayeredModel; partition: string; min: bigint; unproven?: UnprovenMode }[] = [
    { name: 'left-right through the deepest layer', model: pyramid(4, 8, 4), partition: 'left-right', min: 64n },
    { name: 'checkerboard through the first layer', model: pyramid(2, 8, 16), partition: 'checkerboard', min: 2n ** 24n },
    { name: 'shared weights, left-right', model: pyramid(4, 8, 4, true), partition: 'left-right', min: 32n },
    { name: 'recurrent start-end', model: layered([8], 4, [{ kind: 'recurrent', hidden: 2, depth: 1 }]), partition: 'start-end', min: 4n },
  ];
  for (const c of cases) {
    test(`every fix restores the requirement and one less does not: ${c.name}`, () => {
      const r = evaluate(c.model, policy([req(c.partition, c.min, c.unproven)]));
      const q = r.requirements[0]!;
      expect(q.verdict).toBe('fail');
      expect(q.fixes.length).toBeGreaterThan(0);
      for (const f of q.fixes) {
        const apply = (v: number): LayeredModel =>
          f.layer === 'input'
            ? { ...c.model, input: { ...c.model.input, representation: v } }
            : { ...c.model, layers: c.model.layers.map((l) => (l.index === f.layer ? ({ ...l, [f.field]: v } as typeof l) : l)) };
        const fixed = evaluate(apply(f.to), policy([req(c.partition, c.min, c.unproven)])).requirements[0]!;
        expect(fixed.failing, `${f.layer}.${f.field} → ${f.to}`).toBe(false);
        expect(fixed.verdict).toBe(f.verdict);
        const short = evaluate(apply(f.to - 1), policy([req(c.partition, c.min, c.unproven)])).requirements[0]!;
        expect(short.failing, `${f.layer}.${f.field} → ${f.to - 1}`).toBe(true);
      }
      const costs = q.fixes.map((f) => f.addedParameters);
      expect([...costs].sort((a, b) => (a < b ? -1 : a > b ? 1 : 0))).toEqual(costs);
    });
  }

  test('left-right fix on the deepest layer: 4 → 64 channels', () => {
    const q = evaluate(pyramid(4, 8, 4), policy([req('left-right', 64n)])).requirements[0]!;
    const deepest = q.fixes.find((f) => f.layer === 4);
    expect(deepest).toMatchObject({ field: 'channels', from: 4, to: 64, verdict: 'pass' });
  });
});

describe('directional facts of the trade', () => {
  // Levine, Yakira, Cohen, Shashua, "Deep learning and quantum entanglement: fundamental
  // connections with implications to network design" (ICLR 2018): under the tree surrogate,
  // deep layers' widths control coarse (left/right) coupling and the first layer's width controls
  // fine (checkerboard) coupling; allocate channels accordingly.
  test('widening the deepest layer raises left/right and leaves checkerboard unchanged', () => {
    const narrow = pyramid(2, 8, 4);
    const wide = pyramid(2, 8, 32);
    expect(rank(wide, 'left-right').upper).toBeGreaterThan(rank(narrow, 'left-right').upper);
    expect(rank(wide, 'left-right').lower).toBe(rank(wide, 'left-right').upper);
    expect(rank(wide, 'checkerboard')).toEqual(rank(narrow, 'checkerboard'));
  });

  test('widening the first layer raises checkerboard and leaves left/right unchanged', () => {
    const narrow = pyramid(2, 8, 4);
    const wide = pyramid(4, 8, 4);
    expect(rank(wide, 'checkerboard').lower!).toBeGreaterThan(rank(narrow, 'checkerboard').upper);
    expect(rank(wide, 'left-right')).toEqual(rank(narrow, 'left-right'));
  });

  // Levine, Sharir, Ziv, Shashua, "Benefits of depth for long-term memory of recurrent networks":
  // a shallow recurrent arithmetic circuit's start/end separation rank is its hidden width, while
  // a depth-2 one's grows combinatorially with the sequence length.
  test('a shallow recurrent net grows with hidden width only', () => {
    const rnn = (t: number, r: number) => layered([t], 8, [{ kind: 'recurrent', hidden: r, depth: 1 }]);
    expect(rank(rnn(8, 4, ), 'start-end')).toEqual({ upper: 4n, lower: 4n });
    expect(rank(rnn(32, 4), 'start-end')).toEqual({ upper: 4n, lower: 4n });
    expect(rank(rnn(32, 6), 'start-end')).toEqual({ upper: 6n, lower: 6n });
  });

  test('a depth-2 recurrent net grows with sequence length', () => {
    const rnn = (t: number) => layered([t], 3, [{ kind: 'recurrent', hidden: 3, depth: 2 }]);
    // The published depth-2 bound alone (the certified probe off): C(min(M, R) + T/2 − 1, T/2).
    const published = [4, 8, 16].map((t) => rank(rnn(t), 'start-end', 0).lower!);
    expect(published).toEqual([6n, 15n, 45n]);
    // With the probe: the generic ranks R·C(R + T/2 − 1, T/2) of DESIGN §5 (measured equal for M ≥ R).
    const proven = [4, 8, 16].map((t) => rank(rnn(t), 'start-end').lower!);
    expect(proven).toEqual([18n, 45n, 135n]);
  });
});
