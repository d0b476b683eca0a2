/**
 * The partner-ideal rule (DEVELOPERS.md, "Partner ideal"; derived here). Values are compared with
 * the oracle's exact generic rank (rank mod P of a probe matrix at random weights, tests/oracle),
 * computed independently of the engine.
 */
import { describe, expect, it } from 'vitest';
import { computeBounds } from '../../src/cut/bounds.js';
import { degreeBound, sideReach } from '../../src/cut/degree-bound.js';
import { partnerIdealBound } from '../../src/cut/partner-ideal.js';
import { buildCircuit } from '../../src/network/build-circuit.js';
import { headCone } from '../../src/network/head-cone.js';
import type { LayeredModel } from '../../src/config/model.js';
import { Rng } from '../oracle/field.js';
import { conv, layered, maskPartition, partition, pool, recurrent } from '../oracle/models.js';
import { compile, probeRankWith, WeightStore } from '../oracle/surrogate.js';

function upper(model: LayeredModel, spec: string): { rank: number; method: string } {
  const out = computeBounds(model, [partition(spec, model.input.shape)], { surrogate: 'tree', probeBudget: 0 });
  if (!out.ok) throw new Error('rejected');
  const u = out.result.partitions[0]!.upper;
  return { rank: Number(u.rank), method: u.method };
}

function oracle(model: LayeredModel, side: Uint8Array, k: number, seed = 5): number {
  return probeRankWith(compile(model, 'tree', new WeightStore(new Rng(seed))), side, k, new Rng(seed + 1));
}

describe('partner ideal', () => {
  it('depth-2 recurrence whose input spans M = 2 < R = 3, start-end of 7 steps: 42, the oracle value (degree 45)', () => {
    // The cut leaves four steps: h is linear in the top state v and quartic in the lower one u.
    // v's coefficient (W_H² v)_r is a multiple of (W_I² h¹_4)_r, one of M linear forms of u:
    // 3·(C(6, 4) − C(4, 4)) = 3·14 = 42.
    const model = layered([7], 2, false, [recurrent(3, 2)]);
    expect(upper(model, 'start-end')).toEqual({ rank: 42, method: 'partner ideal' });
    expect(oracle(model, partition('start-end', [7]).side, 50)).toBe(42);
  });

  it('depth-3 recurrence of width 2, start-end: 106 of 8 steps and 52 of 6, the oracle values (degree 110 and 56)', () => {
    // Four steps after the cut: degrees 10, 4, 1 in the three states. The top state's coefficient
    // is a multiple of one of two bilinear forms of the lower two: 2·(2·10·4 − 9·3) = 106.
    const eight = layered([8], 2, true, [recurrent(2, 3)]);
    expect(upper(eight, 'start-end')).toEqual({ rank: 106, method: 'partner ideal' });
    expect(oracle(eight, partition('start-end', [8]).side, 114)).toBe(106);
    // Three steps: degrees 6, 3, 1: 2·(2·6·3 − 5·2) = 52.
    const six = layered([6], 2, false, [recurrent(2, 3)]);
    expect(upper(six, 'start-end')).toEqual({ rank: 52, method: 'partner ideal' });
    expect(oracle(six, partition('start-end', [6]).side, 60)).toBe(52);
  });

  it('a pool before the recurrence: the first step that mixes the sides brings M forms (12 → 9, the oracle value)', () => {
    const model = layered([6], 2, false, [conv(3, { kernel: [1] }), pool([2]), recurrent(3, 2)]);
    expect(upper(model, 'start-end')).toEqual({ rank: 9, method: 'partner ideal' });
    expect(oracle(model, partition('start-end', [6]).side, 16)).toBe(9);
  });

  it('never below the oracle on random recurrences, and below the degree rule on some', () => {
    const rng = new Rng(7);
    let sharper = 0;
    for (let i = 0; i < 60; i++) {
      const t = rng.int(3, 8);
      const items = [...(rng.chance(0.3) ? [conv(rng.int(1, 3), { kernel: [1] })] : []), recurrent(rng.int(2, 3), rng.int(2, 3))];
      const model = layered([t], rng.int(1, 3), rng.chance(0.5), items);
      const built = buildCircuit(model, { surrogate: 'tree' });
      if (!built.ok) throw new Error('rejected');
      const c = headCone(built.circuit);
      const sides = [partition('start-end', [t]).side, Uint8Array.from({ length: t }, (_, p) => (p >= t - rng.int(1, t - 1) ? 1 : 0))];
      for (const side of sides) {
        const reach = sideReach(c, side);
        const b = reach && partnerIdealBound(c, reach);
        if (!reach || !b || b.rank() > 200n) continue;
        const truth = oracle(model, side, Number(b.rank()) + 6, 100 + i);
        expect(Number(b.rank()), `case ${i} ${maskPartition(side).label}`).toBeGreaterThanOrEqual(truth);
        if (b.rank() < degreeBound(c, side, reach)!.rank()) sharper++;
      }
    }
    expect(sharper).toBeGreaterThan(5);
  });
});
