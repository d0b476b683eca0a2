/**
 * The degree rule graded by total degree (DEVELOPERS.md, "Graded degree"; derived here). Values
 * are compared with the oracle's exact generic rank (rank mod P of a probe matrix at random
 * weights, tests/oracle), computed independently of the engine.
 */
import { describe, expect, it } from 'vitest';
import { computeBounds } from '../../src/cut/bounds.js';
import { buildCircuit } from '../../src/network/build-circuit.js';
import { totalDegrees } from '../../src/cut/graded-degree.js';
import type { LayeredModel } from '../../src/config/model.js';
import { Rng } from '../oracle/field.js';
import { conv, layered, partition, pool, positions, recurrent, residual } from '../oracle/models.js';
import { compile, probeRankWith, WeightStore } from '../oracle/surrogate.js';

function upper(model: LayeredModel, spec: string): { rank: number; method: string } {
  const out = computeBounds(model, [partition(spec, model.input.shape)], { surrogate: 'overlap', probeBudget: 0 });
  if (!out.ok) throw new Error('rejected');
  const u = out.result.partitions[0]!.upper;
  return { rank: Number(u.rank), method: u.method };
}

function oracle(model: LayeredModel, spec: string, k: number): number {
  return probeRankWith(compile(model, 'overlap', new WeightStore(new Rng(5))), partition(spec, model.input.shape).side, k, new Rng(6));
}

describe('graded degree', () => {
  it('a recurrence after an overlapping conv, interleaved: 9, the oracle value (the ungraded frontier gives 12)', () => {
    // Four scalar inputs, a conv of kernel 3 ('same'), a depth-1 recurrence of width 2: the
    // output has total degree 4; x_0, x_2 reach it 2 and 3 times, x_1, x_3 3 and 2 times, so the
    // monomials per degree are 1, 2, 3, 3, 2, 1 on each side and Σ_e min(a_e, b_{4−e}) = 9.
    const model = layered([4], 1, false, [conv(2, { kernel: [3] }), recurrent(2, 1)]);
    const u = upper(model, 'interleaved');
    expect(u).toEqual({ rank: 9, method: 'graded degree' });
    expect(oracle(model, 'interleaved', 17)).toBe(9);
  });

  it('never below the oracle on random conv + pool + recurrence stacks', () => {
    const rng = new Rng(42);
    let graded = 0;
    for (let i = 0; i < 40; i++) {
      const t = rng.int(3, 6);
      const items = [conv(rng.int(1, 2), { kernel: [rng.int(2, 3)] }), ...(t % 2 === 0 && rng.chance(0.4) ? [pool([2])] : []), recurrent(rng.int(1, 2), rng.int(1, 2))];
      const model = layered([t], rng.int(1, 2), rng.chance(0.5), items);
      for (const spec of ['start-end', 'interleaved']) {
        const u = upper(model, spec);
        if (u.rank > 200) continue;
        const truth = oracle(model, spec, u.rank + 8);
        expect(u.rank, `case ${i} ${spec}: ${u.method}`).toBeGreaterThanOrEqual(truth);
        if (u.method === 'graded degree') graded++;
      }
    }
    expect(graded).toBeGreaterThan(5);
  });

  it('total degrees: a conv and a recurrence are homogeneous; position vectors and a residual around a product are not', () => {
    const top = (model: LayeredModel): number => {
      const built = buildCircuit(model, { surrogate: 'overlap' });
      if (!built.ok) throw new Error('rejected');
      return totalDegrees(built.circuit)[built.circuit.top]!;
    };
    // Depth-1 recurrence over 4 steps: degree 1 per step.
    expect(top(layered([4], 2, true, [conv(2, { kernel: [3] }), recurrent(2, 1)]))).toBe(4);
    // A product of two positions: degree 2; with the identity added (residual), degrees 1 and 2 mix.
    expect(top(layered([2], 2, true, [pool([2]), conv(2)]))).toBe(2);
    expect(top(layered([2], 2, true, [residual([pool([2], { stride: [1], padding: 'same' }), conv(2)]), pool([2])]))).toBe(-1);
    expect(top(layered([4], 2, true, [positions(), recurrent(2, 1)]))).toBe(-1);
  });
});
