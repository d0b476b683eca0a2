/**
 * Facts about the new blocks, measured by the oracle alone (no engine): exact generic ranks mod P
 * of small models built to isolate one block. Each is derived here (the argument is beside it) and
 * measured here; the engine's bounds for the same models must respect them (the property tests
 * check that on random models of every block family).
 */
import { describe, expect, it } from 'vitest';
import type { LayeredModel } from '../../src/config/model.js';
import { Rng } from './field.js';
import { act, branches, conv, dense, flatten, globalPool, layered, partition, pool, residual, withOutput } from './models.js';
import { compile, probeRank, probeRankWith, WeightStore, type SurrogateKind } from './surrogate.js';

/** Probe rank with K = bound + 8 (K must exceed the rank for the reading to be the rank). */
function rank(model: LayeredModel, spec: string, bound: number, surrogate: SurrogateKind = 'tree', seed = 1): number {
  return probeRank(model, surrogate, partition(spec, model.input.shape).side, bound + 8, new Rng(seed));
}

describe('residual blocks pass their full width', () => {
  it('a 1-wide bottleneck in the main path: rank r with the shortcut, 1 without', () => {
    // derived here: per-position maps and one global product, so h = Σ_k w_k Π_p (A x_p)_k with
    // A = (I + W2·W1)·W0. I + W2·W1 is generically invertible, so A has rank min(M, r) and the
    // start-end rank is r (for r ≤ M and enough positions per side); without the shortcut
    // A = W2·W1·W0 has rank 1 and so has h. Measured here: r = 2, 3, 4 → 2, 3, 4; plain: 1.
    for (const r of [2, 3, 4]) {
      for (const shared of [true, false]) {
        const withShortcut = layered([4], r, shared, [conv(r), residual([conv(1), conv(r)]), globalPool()]);
        const plain = layered([4], r, shared, [conv(r), conv(1), conv(r), globalPool()]);
        expect(rank(withShortcut, 'start-end', 16), `r=${r} shared=${shared}`).toBe(r);
        expect(rank(plain, 'start-end', 16), `r=${r} shared=${shared}`).toBe(1);
      }
    }
  });

  it('the same holds with a bottleneck of width b < r: rank r, not b', () => {
    // derived here (as above), one position per side so that the bond is the only limit: r = 4,
    // b = 2 → 4 with the shortcut, 2 without (measured here). With two positions per side the
    // plain net already passes min(r, b²) = 4: the bottleneck caps each position, not the bond.
    const withShortcut = layered([2], 4, false, [conv(4), residual([conv(2), act(), conv(4)]), globalPool()]);
    const plain = (n: number): LayeredModel => layered([n], 4, false, [conv(4), conv(2), act(), conv(4), globalPool()]);
    expect(rank(withShortcut, 'start-end', 16)).toBe(4);
    expect(rank(plain(2), 'start-end', 16)).toBe(2);
    expect(rank(plain(4), 'start-end', 16)).toBe(4);
  });
});

describe('a channel concatenation passes the sum of the widths', () => {
  it('concat(conv a, conv b) then one global product: min(a + b, what the inputs allow)', () => {
    // derived here: h = Σ_{k < a+b} w_k Π_p (U x_p)_k with U the stacked maps, so the concat is
    // the only bond across start-end and passes a + b functions, capped by the span of the products
    // on one side: M^|A| unshared, C(M+|A|−1, |A|) shared (symmetric tensors). Measured here.
    const cat = (n: number, m: number, shared: boolean, a: number, b: number): LayeredModel =>
      layered([n], m, shared, [branches('concat', [[conv(a)], [conv(b)]]), globalPool()]);
    expect(rank(cat(6, 2, false, 2, 3), 'start-end', 8)).toBe(5); // 2 + 3 (M^3 = 8 allows it)
    expect(rank(cat(6, 3, false, 3, 4), 'start-end', 27)).toBe(7); // 3 + 4
    expect(rank(cat(4, 2, false, 2, 3), 'start-end', 4)).toBe(4); // capped by M^|A| = 4
    expect(rank(cat(4, 2, true, 2, 3), 'start-end', 4)).toBe(3); // capped by C(3, 2) = 3
    expect(rank(cat(6, 2, true, 2, 2), 'start-end', 4)).toBe(4); // 2 + 2 ≤ C(4, 3) = 4
    // Each path alone passes its own width only.
    expect(rank(layered([6], 2, false, [conv(3), globalPool()]), 'start-end', 8)).toBe(3);
  });
});

describe('output positions', () => {
  it('a partition that moves only positions outside the receptive field has rank exactly 1', () => {
    // derived here: h reads only its receptive field, so it is constant in the other positions and
    // h(x_A, x_B) = h(x_B) for A outside: one term. Measured here, 1D and 2D, both surrogates.
    const one = layered([8], 2, true, [conv(2, { kernel: [3] }), conv(2, { kernel: [3] })]); // output 4, field 2..6
    const ev = compile(one, 'overlap', new WeightStore(new Rng(3)));
    expect(Array.from(ev.dependsOn())).toEqual([0, 0, 1, 1, 1, 1, 1, 0]);
    for (const s of ['positions:0', 'positions:0,1,7', 'positions:7'] as const) expect(rank(one, s, 4, 'overlap'), s).toBe(1);
    // One position inside the field is enough to couple (two convs and no product: h is linear,
    // rank 2).
    expect(rank(one, 'positions:0,1,4', 16, 'overlap')).toBe(2);
    const two = layered([4, 4], 2, true, [conv(2, { kernel: [3, 3] })]); // output (2, 2), field rows/cols 1..3
    expect(rank(two, 'block:0-1,0-4', 4, 'overlap')).toBe(1);
    expect(rank(two, 'block:0-4,0-1', 4, 'overlap')).toBe(1);
    expect(rank(two, 'block:0-2,0-4', 16, 'overlap')).toBe(2);
    // Tree surrogate: a pooled grid keeps two positions; the output (1) reads inputs 4..7 only.
    const tree = layered([8], 2, false, [conv(2), pool([2]), conv(2), pool([2])]);
    expect(rank(tree, 'start-end', 4)).toBe(1);
    expect(rank(withOutput(tree, [0]), 'start-end', 4)).toBe(1);
    expect(rank(tree, 'positions:0,1,2,3,4,5', 4)).toBe(2);
  });

  it('fully causal 1D net: the last position couples start and end, the first couples nothing', () => {
    // derived here: causal taps read only earlier positions, so output 0 reads x_0 alone (rank 1
    // across every partition) and the last output reads the whole dilated field. Measured here.
    const tcn = layered([8], 2, true, [
      conv(2, { kernel: [2], padding: 'causal' }),
      conv(2, { kernel: [2], dilation: [2], padding: 'causal' }),
      conv(2, { kernel: [2], dilation: [4], padding: 'causal' }),
    ]);
    const ev = compile(tcn, 'overlap', new WeightStore(new Rng(5)));
    expect(Array.from(ev.dependsOn())).toEqual([1, 1, 1, 1, 1, 1, 1, 1]); // default output: position 7
    // Convs without a product pool are linear under the surrogate: rank 2 = f(x_A) + g(x_B).
    expect(rank(tcn, 'start-end', 16, 'overlap')).toBe(2);
    expect(rank(tcn, 'interleaved', 16, 'overlap')).toBe(2);
    const first = withOutput(tcn, [0]);
    for (const s of ['start-end', 'interleaved', 'positions:0', 'positions:1,2']) expect(rank(first, s, 4, 'overlap'), s).toBe(1);
    // Tree surrogate: strided causal convs (kernel 2, stride 2) read {2j−1, 2j}, so products form
    // over windows shifted one step back and output 0 of every layer reads position 0 alone. Two
    // layers leave two positions; the default (last) output reads x_1..x_4, the first x_0.
    for (const r of [2, 3]) {
      const tree = layered([8], r, false, [conv(r, { kernel: [2], stride: [2], padding: 'causal' }), conv(r, { kernel: [2], stride: [2], padding: 'causal' })]);
      expect(Array.from(compile(tree, 'tree', new WeightStore(new Rng(7))).dependsOn())).toEqual([0, 1, 1, 1, 1, 0, 0, 0]);
      expect(rank(tree, 'start-end', 27), `r=${r}`).toBe(r);
      expect(rank(tree, 'positions:1,3', 27), `r=${r}`).toBe(r * r);
      for (const s of ['start-end', 'interleaved', 'positions:0']) expect(rank(withOutput(tree, [0]), s, 4), s).toBe(1);
    }
    // A third layer leaves one position, output 0: it reads x_0 alone.
    const three = layered([8], 2, false, [1, 2, 3].map(() => conv(2, { kernel: [2], stride: [2], padding: 'causal' })));
    expect(rank(three, 'start-end', 4)).toBe(1);
  });
});

describe('flatten + dense stacks', () => {
  it('without an activation the stack is linear: rank ≤ 2 across any partition (exactly 2)', () => {
    // derived here: h = Σ_p ⟨c_p, x_p⟩ = f(x_A) + g(x_B) = f·1 + 1·g. Measured here.
    const rng = new Rng(11);
    for (const [shape, stack] of [
      [[4], [flatten(), dense(3), dense(2)]],
      [[4], [dense(3), dense(3)]],
      [[2, 3], [conv(2, { dims: 2 }), flatten(), dense(4), dense(2)]],
    ] as const) {
      const m = layered(shape, 2, true, [...stack]);
      for (const s of shape.length === 1 ? ['start-end', 'interleaved', 'positions:1'] : ['left-right', 'checkerboard', 'top-bottom']) {
        expect(probeRankWith(compile(m, 'tree', new WeightStore(rng)), partition(s, shape).side, 12, rng), `${shape} ${s}`).toBe(2);
      }
    }
  });

  it('one activation (the square rule) after a hidden layer of h units reaches h + 2', () => {
    // derived here: Σ_k c_k (a_k(x_A) + b_k(x_B))² = Σ c_k a_k² + Σ c_k b_k² + 2 Σ c_k a_k b_k:
    // the functions 1, Σ c_k a_k², a_1..a_h on side A, so rank ≤ h + 2 (sharper than 3h), and
    // = min(h, |A|·M, |B|·M) + 2 for generic weights. Measured here.
    for (const h of [1, 2, 3, 4]) {
      const m = layered([4], 2, true, [flatten(), dense(h), act(), dense(1)]);
      expect(rank(m, 'start-end', 16), `h=${h}`).toBe(h + 2);
    }
    // The linear functions on a side are capped by its dimension: |A|·M = 2 for one position.
    expect(rank(layered([4], 2, true, [dense(4), act(), dense(1)]), 'positions:0', 16)).toBe(4);
    // Same stack without the activation: 2.
    expect(rank(layered([4], 2, true, [flatten(), dense(4), dense(1)]), 'start-end', 16)).toBe(2);
  });
});
