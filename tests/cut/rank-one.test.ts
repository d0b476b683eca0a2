/**
 * An upper bound of 1 is exact: every model the engine accepts has an analysed output that is
 * not zero for generic weights (a layered model whose output reads only padding is refused; an
 * explicit network of generic tensors is not zero), so its separation rank is at least 1
 * (derived here). Checked here against the oracle's exact rank.
 */
import { describe, expect, it } from 'vitest';
import { computeBounds } from '../../src/cut/bounds.js';
import { Rng } from '../oracle/field.js';
import { conv, globalPool, layered, maskPartition, pool } from '../oracle/models.js';
import { compile, probeRankWith, WeightStore } from '../oracle/surrogate.js';

describe('rank 1 is proven', () => {
  it('an overlap net with width-1 maps (upper 1) that no lower rule reads: lower 1, exact (oracle: 1)', () => {
    // Output j is the scalar a_j·x_j + b_j·x_{j+2}: with positions of one parity on each side,
    // every factor of the product reads one side only (rank 1), and the taps' sums keep the
    // lower-bound special cases from applying.
    const model = layered([6], 2, false, [conv(1, { kernel: [2], dilation: [2], padding: [0] }), pool([2]), globalPool()]);
    const side = Uint8Array.from([1, 0, 1, 0, 1, 0]);
    const out = computeBounds(model, [maskPartition(side)], { surrogate: 'overlap', probeBudget: 0 });
    if (!out.ok) throw new Error('refused');
    const pb = out.result.partitions[0]!;
    expect(pb.upper.rank).toBe(1n);
    expect(pb.lower).toMatchObject({ rank: 1n, method: 'the output is not zero' });
    expect(pb.status).toBe('exact');
    const ev = compile(model, 'overlap', new WeightStore(new Rng(5)));
    expect(probeRankWith(ev, side, 4, new Rng(6))).toBe(1);
  });
});
