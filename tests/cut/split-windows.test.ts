/**
 * The split-windows lower bound for shared weights (DEVELOPERS.md, "Split windows under shared
 * weights"; derived here), checked against the oracle's exact generic rank (rank mod P of a probe
 * matrix at random weights, tests/oracle) and against the min-cut where the two must meet.
 */
import { describe, expect, it } from 'vitest';
import { computeBounds } from '../../src/cut/bounds.js';
import type { LayeredModel } from '../../src/config/model.js';
import { Rng } from '../oracle/field.js';
import { conv, globalPool, layered, partition, pool } from '../oracle/models.js';
import { compile, probeRankWith, WeightStore } from '../oracle/surrogate.js';

const METHOD = 'split windows';

function bounds(model: LayeredModel, spec: string) {
  const out = computeBounds(model, [partition(spec, model.input.shape)], { surrogate: 'tree', probeBudget: 0 });
  if (!out.ok) throw new Error(out.diagnostics.map((d) => d.message).join('; '));
  return out.result.partitions[0]!;
}

describe('split windows under shared weights', () => {
  it('4×4, conv 3, pool 2×2, conv 3, global pool, checkerboard: (2·min(3, C(M+1, 2)) − 3)^4, the min-cut 3^4 for M = 2', () => {
    const model = layered([4, 4], 2, true, [conv(3, { dims: 2 }), pool([2, 2]), conv(3, { dims: 2 }), globalPool()]);
    const b = bounds(model, 'checkerboard');
    expect(b.lower!.method).toBe(METHOD);
    expect(Number(b.lower!.rank)).toBe(81);
    expect(b.status).toBe('exact');
  });

  it('never above the oracle on random shared-weight conv/pool stacks (checkerboard, interleaved)', () => {
    const rng = new Rng(31);
    let used = 0;
    for (let i = 0; i < 40; i++) {
      const dims = rng.chance(0.5) ? [4, 4] : [8];
      const win = dims.length === 2 ? [2, 2] : [2];
      const c = () => conv(rng.int(1, 3), { dims: dims.length });
      const model = layered(dims, rng.int(1, 3), true, [c(), pool(win), c(), ...(rng.chance(0.5) ? [pool(win)] : []), globalPool()]);
      for (const spec of dims.length === 2 ? ['checkerboard'] : ['interleaved']) {
        const b = bounds(model, spec);
        if (b.lower?.method !== METHOD) continue;
        used++;
        const truth = probeRankWith(compile(model, 'tree', new WeightStore(new Rng(70 + i))), partition(spec, dims).side, Number(b.lower.rank) + 4, new Rng(71 + i));
        expect(Number(b.lower.rank), `case ${i}`).toBeLessThanOrEqual(truth);
      }
    }
    expect(used).toBeGreaterThan(10);
  });
});
