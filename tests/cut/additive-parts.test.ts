/**
 * Rank propagation's additive parts (src/cut/additive-parts.ts; DEVELOPERS.md, "Rank
 * propagation", rule 6). Each expected value is derived here (the argument is beside it) and
 * measured by the independent oracle (tests/oracle/surrogate.ts: the exact rank modulo a prime of
 * a probe matrix); the engine's upper bound must equal it.
 */
import { describe, expect, it } from 'vitest';
import type { LayeredModel } from '../../src/config/model.js';
import { computeBounds } from '../../src/cut/bounds.js';
import { Rng } from '../oracle/field.js';
import { act, branches, conv, dense, globalPool, layered, partition, pool, residual, upsample } from '../oracle/models.js';
import { probeRank } from '../oracle/surrogate.js';

function upper(model: LayeredModel, spec: string): { rank: bigint; method: string } {
  const out = computeBounds(model, [partition(spec, model.input.shape)], { surrogate: 'overlap', probeBudget: 0 });
  if (!out.ok) throw new Error(JSON.stringify(out.diagnostics));
  return out.result.partitions[0]!.upper;
}

const oracle = (model: LayeredModel, spec: string, k: number): number => probeRank(model, 'overlap', partition(spec, model.input.shape).side, k, new Rng(7));

describe('networks without products are separable: rank ≤ 2', () => {
  // Derived here: under `overlap` a conv is linear in its window, a merge is a sum and pointwise
  // layers are the identity, so without a pool the output is h = Σ_p ⟨w_p, x_p⟩ = g(x_A) + g'(x_B),
  // separation rank 2 across every partition that leaves inputs on both sides.
  const nets: [string, LayeredModel][] = [
    ['two convs', layered([6], 2, true, [conv(2, { kernel: [3] }), conv(2, { kernel: [3] })])],
    ['a residual block', layered([6], 2, false, [conv(2, { kernel: [2] }), residual([conv(2, { kernel: [3] }), conv(2, { kernel: [3] })])])],
    ['three summed branches', layered([2, 3], 2, true, [conv(2, { kernel: [2, 2] }), branches('sum', [[conv(2, { kernel: [3, 3] })], [conv(2, { kernel: [1, 1] })], []])])],
  ];
  for (const [name, model] of nets) {
    it(name, () => {
      for (const spec of model.input.shape.length === 1 ? ['start-end', 'interleaved'] : ['left-right', 'checkerboard']) {
        expect(oracle(model, spec, 12), `${name} ${spec}`).toBe(2);
        expect(upper(model, spec).rank, `${name} ${spec}`).toBe(2n);
      }
    });
  }
});

describe('a product of separable factors, expanded term by term', () => {
  it('conv (stride 3) then a pool of two positions: 1 + 1 + 2·2 = 6', () => {
    // Derived here: h = Σ_c w_c (a_c + b_c)(a'_c + b'_c) over 2 channels, a reading x_A, b x_B:
    // Σ w a a' is one A-function, Σ w b b' one B-function, and Σ_c w_c (a_c b'_c + b_c a'_c) is a sum of
    // two terms of rank ≤ min(2 channels, spans) = 2 each: 6. Before the expansion the bound was
    // D·κ = 2·4 = 8.
    const model = layered([7], 2, true, [conv(2, { kernel: [2], stride: [3] }), pool([2])]);
    expect(oracle(model, 'interleaved', 16)).toBe(6);
    expect(upper(model, 'interleaved')).toMatchObject({ rank: 6n, method: 'rank propagation' });
  });

  it('a width-1 conv then a global pool of three windows', () => {
    // Derived here: h = w Π_{i<3} (a_i + b_i) with scalar factors (three windows of 3 over 5
    // positions). Interleaved: every term with both sides present is a product of scalars, rank 1;
    // with the two pure terms, 8. Start-end (A = positions 0, 1): the third window reads side B
    // only (a_2 = 0), so the terms that take it from side A vanish: one pure-B term and three
    // mixed ones, 4. The oracle reads 8 and 4.
    const model = layered([5], 2, false, [conv(1, { kernel: [3], padding: 'valid' }), globalPool()]);
    expect(oracle(model, 'interleaved', 16)).toBe(8);
    expect(upper(model, 'interleaved').rank).toBe(8n);
    expect(oracle(model, 'start-end', 16)).toBe(4);
    expect(upper(model, 'start-end').rank).toBe(4n);
  });
});

describe('copies of one separable factor count how many go to each side', () => {
  it('a fully connected layer, its activation read as the square, a dense head: 4', () => {
    // Derived here: the first dense layer reads the whole 2×2 input, y_k = a_k + b_k (two units,
    // a_k reading the left column, b_k the right); the square rule gives y ⊙ y, and the head
    // h = Σ_k w_k (a_k + b_k)² = Σ w_k a_k² + Σ w_k b_k² + 2 Σ_k w_k a_k b_k: one function of each
    // side and a sum of two rank-1 terms, 4. Counting the two copies of y as different factors
    // gave 1 + 1 + 2·2 = 6. The oracle reads 4.
    const model = layered([2, 2], 2, false, [dense(2), act(), dense(2)]);
    for (const spec of ['left-right', 'checkerboard']) {
      expect(oracle(model, spec, 16), spec).toBe(4);
      expect(upper(model, spec).rank, spec).toBe(4n);
    }
  });

  it('nearest upsampling then a global pool: each vector appears twice', () => {
    // Derived here: two positions, y_0 = a + b (its kernel reads x_0 and x_1), y_1 reading x_1 only;
    // upsampling by 2 and the global product give h = Σ_c w_c y_0c² y_1c². The choices of how many
    // copies of y_0 take the A part: 2 (a² ⊙ y_1², rank ≤ 2 channels), 1 (2 a ⊙ b ⊙ y_1², ≤ 2) and
    // 0 (side B only, 1): 5. The oracle reads 5; the subsets of four factors gave 6.
    const model = layered([2], 2, true, [conv(2, { kernel: [2] }), upsample([2]), globalPool()]);
    expect(oracle(model, 'interleaved', 16)).toBe(5);
    expect(upper(model, 'interleaved').rank).toBe(5n);
  });
});
