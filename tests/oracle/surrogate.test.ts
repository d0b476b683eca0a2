/**
 * The evaluator against hand computations of the contributor guide's surrogate functions: small
 * models with fixed weights, h(x) worked out on paper from the text of each rule and compared
 * exactly (mod P). Every weight a model uses is fixed here; the test fails if the evaluator asks
 * for one more, so a misplaced map or tap cannot hide behind a random draw.
 */
import { describe, expect, it } from 'vitest';
import type { LayeredModel } from '../../src/config/model.js';
import { inv, mul, Rng } from './field.js';
import { planModel, type SurrogateKind } from './plan.js';
import {
  act,
  attention,
  branches,
  classToken,
  conv,
  convTranspose,
  dense,
  depthwise,
  dropout,
  embedding,
  flatten,
  globalPool,
  layered,
  norm,
  pool,
  positions,
  recurrent,
  residual,
  upsample,
} from './models.js';
import { compile, RefusedModel, WeightStore } from './surrogate.js';

/** h(x) with exactly the given weights (and no other draw). */
function value(model: LayeredModel, surrogate: SurrogateKind, weights: Record<string, readonly number[]>, x: readonly number[]): number {
  const store = new WeightStore(new Rng(1));
  for (const [k, v] of Object.entries(weights)) store.set(k, v);
  const ev = compile(model, surrogate, store);
  expect(store.size, `the evaluator drew weights beyond ${Object.keys(weights).join(', ')}`).toBe(Object.keys(weights).length);
  return ev.evaluate(Float64Array.from(x));
}

const frac = (num: number, den: number): number => mul(num, inv(den));
const both = ['tree', 'overlap'] as const;

describe('pool', () => {
  it('overlapping windows with `same` padding reuse positions; padding taps are left out', () => {
    // n = 3, window 3, stride 1, same: left 1; windows {0,1}, {0,1,2}, {1,2}; global product:
    // x0²·x1³·x2²; x = (2, 3, 5): 4·27·25 = 2700.
    const m = layered([3], 1, true, [pool([3], { stride: [1], padding: 'same' }), globalPool()]);
    for (const s of both) expect(value(m, s, { head: [1] }, [2, 3, 5])).toBe(2700);
  });

  it('a window made of padding only is refused (the text: frameworks forbid such padding)', () => {
    // n = 2, window 1, explicit padding 1: 4 windows, taps −1, 0, 1, 2; the first and last are
    // padding only.
    const m = layered([2], 1, true, [pool([1], { stride: [1], padding: [1] }), globalPool()]);
    expect(() => value(m, 'tree', { head: [1] }, [3, 7])).toThrow(RefusedModel);
  });
});

describe('upsample', () => {
  it('nearest copies each vector to f positions', () => {
    const m = layered([2], 1, true, [upsample([2]), globalPool()]);
    for (const s of both) expect(value(m, s, { head: [1] }, [3, 5])).toBe(225);
  });

  it('linear: 1 | ¾,¼ | ¼,¾ | 1 in 1D, and the product of both axes in 2D', () => {
    // x0 · (3x0 + x1)/4 · (x0 + 3x1)/4 · x1 at x = (1, 2): 5/4 · 7/4 · 2 = 35/8.
    const m1 = layered([2], 1, true, [upsample([2], 'linear'), globalPool()]);
    expect(value(m1, 'overlap', { head: [1] }, [1, 2])).toBe(frac(35, 8));
    // 2×2 → 4×4, output (1, 1): (9·v00 + 3·v01 + 3·v10 + v11)/16; v = 1, 2, 3, 4 → 28/16.
    const m2 = layered([2, 2], 1, true, [upsample([2, 2], 'linear')], { output: [1, 1] });
    expect(value(m2, 'tree', { head: [1] }, [1, 2, 3, 4])).toBe(frac(28, 16));
  });
});

describe('conv under the tree surrogate', () => {
  it('k ≥ s: the product over the stride window of W·v_p; shared and unshared maps', () => {
    // n = 5, k = 3, s = 2, same: P = {0}, {1,2}, {3,4}; W = 2: 2x0 · 4x1x2 · 4x3x4 → 32·120.
    const m = layered([5], 1, true, [conv(1, { kernel: [3], stride: [2] }), globalPool()]);
    expect(value(m, 'tree', { L0: [2], head: [1] }, [1, 2, 3, 4, 5])).toBe(3840);
    // Unshared: one map per input position p.
    const u = layered([5], 1, false, [conv(1, { kernel: [3], stride: [2] }), globalPool()]);
    const maps = { 'L0@0': [2], 'L0@1': [3], 'L0@2': [5], 'L0@3': [7], 'L0@4': [11], head: [1] };
    expect(value(u, 'tree', maps, [1, 1, 1, 1, 1])).toBe(2310);
  });

  it('stride 1: the centre tap; `valid` with dilation shrinks the grid to the centre', () => {
    // n = 5, k = 3, d = 2, valid: e = 5, one output, P = {2}.
    const m = layered([5], 1, true, [conv(1, { kernel: [3], dilation: [2], padding: 'valid' })]);
    expect(value(m, 'tree', { L0: [3], head: [1] }, [1, 2, 5, 7, 11])).toBe(15);
  });

  it('causal with stride 2 reads {2j−1, 2j}: the last position of an even length is unused', () => {
    const m = layered([4], 1, true, [conv(1, { kernel: [2], stride: [2], padding: 'causal' }), globalPool()]);
    // outputs: x0, x1·x2 (x3 is read by no output).
    expect(value(m, 'tree', { L0: [1], head: [1] }, [2, 3, 5, 1000])).toBe(30);
  });
});

describe('conv under the overlap surrogate', () => {
  it('causal dilated taps; the default output of a fully causal 1D net is the last position', () => {
    // k = 2, d = 2, causal: left 2, output j = a·x_{j−2} + b·x_j; default output j = 3.
    const m = layered([4], 1, true, [conv(1, { kernel: [2], dilation: [2], padding: 'causal' })]);
    expect(value(m, 'overlap', { L0t0: [5], L0t1: [7], head: [1] }, [1, 2, 3, 4])).toBe(5 * 2 + 7 * 4);
    expect(value({ ...m, output: { position: [0] } }, 'overlap', { L0t0: [5], L0t1: [7], head: [1] }, [1, 2, 3, 4])).toBe(7);
  });

  it('not every conv causal: the default output is the centre', () => {
    const m = layered([4], 1, true, [conv(1, { kernel: [1] })]);
    expect(planModel(m).output.position).toEqual([2]);
    expect(value(m, 'overlap', { L0t0: [3], head: [1] }, [1, 2, 5, 7])).toBe(15);
  });
});

describe('grouped maps', () => {
  it('groups = 2 and depthwise with multiplier 2 are block diagonal', () => {
    // M = 2, r = 2, g = 2: W = diag(a, b); head (1, 1): a·x0 + b·x1.
    const g2 = layered([1], 2, true, [conv(2, { groups: 2 })]);
    expect(value(g2, 'tree', { L0: [3, 5], head: [1, 1] }, [7, 11])).toBe(21 + 55);
    expect(value(g2, 'overlap', { L0t0: [3, 5], head: [1, 1] }, [7, 11])).toBe(21 + 55);
    // Depthwise ×2: rows (a,0), (b,0), (0,c), (0,d); head (1, 10, 100, 1000).
    const dw = layered([1], 2, true, [depthwise({ depthMultiplier: 2 })]);
    expect(planModel(dw).grids[0]!.width).toBe(4);
    expect(value(dw, 'tree', { L0: [1, 2, 3, 4], head: [1, 10, 100, 1000] }, [5, 7])).toBe(5 + 10 * 10 + 100 * 21 + 1000 * 28);
  });
});

describe('conv-transpose', () => {
  it('tree: output j reads input min(⌊j/s⌋, n−1) through the map of offset j mod s', () => {
    // n = 2, k = 3, s = 2: length 5; a·x0, b·x0, a·x1, b·x1, a·x1 → a³b²·x0²·x1³.
    const m = layered([2], 1, true, [convTranspose(1, { kernel: [3], stride: [2] }), globalPool()]);
    expect(value(m, 'tree', { L0o0: [2], L0o1: [3], head: [1] }, [5, 7])).toBe(8 * 9 * 25 * 343);
  });

  it('overlap: output j sums W_t·v_i over i·s − p + t·d = j', () => {
    // u·x0, v·x0, u·x1 + w·x0, v·x1, w·x1 at u, v, w = 2, 3, 5 and x = (1, 1): 2·3·7·3·5.
    const m = layered([2], 1, true, [convTranspose(1, { kernel: [3], stride: [2] }), globalPool()]);
    expect(value(m, 'overlap', { L0t0: [2], L0t1: [3], L0t2: [5], head: [1] }, [1, 1])).toBe(630);
  });
});

describe('dense readings and the square rule', () => {
  const w = { L0: [2, 3], head: [1] };
  it('a dense layer on the raw input mixes positions; the activation after it squares', () => {
    // (2·x0 + 3·x1)² · 5 at x = (1, 1): 125.
    expect(value(layered([2], 1, true, [dense(1), act(), dense(1)]), 'tree', { ...w, L2: [5] }, [1, 1])).toBe(125);
    // Dropout between: still the square.
    expect(value(layered([2], 1, true, [dense(1), dropout(), act(), dense(1)]), 'tree', { ...w, L3: [5] }, [1, 1])).toBe(125);
    // A second activation right after the first is the identity.
    expect(value(layered([2], 1, true, [dense(1), act(), act('tanh'), dense(1)]), 'tree', { ...w, L3: [5] }, [1, 1])).toBe(125);
    // Normalisation is the identity.
    expect(value(layered([2], 1, true, [dense(1), norm(), dense(1)]), 'tree', { ...w, L2: [5] }, [1, 1])).toBe(25);
    // The output's activation is ignored: no weighted layer follows it.
    expect(value(layered([2], 1, true, [dense(1), act()]), 'tree', w, [1, 1])).toBe(5);
  });

  it('after flatten of several positions the dense layer mixes; per position it does not', () => {
    // conv 1×1 (weight 1) → flatten → dense (2, 3) → relu (square) → dense 5.
    const f = layered([2], 1, true, [conv(1), flatten(), dense(1), act(), dense(1)]);
    expect(planModel(f).square).toEqual([false, false, false, true, false]);
    expect(value(f, 'tree', { L0: [1], L2: [2, 3], L4: [5], head: [1] }, [1, 1])).toBe(125);
    // conv → dense per position → relu: no square; the output is the centre position (1).
    const pp = layered([2], 1, true, [conv(1), dense(1), act(), dense(1)]);
    expect(planModel(pp).reading[1]).toBe('per-position');
    expect(planModel(pp).square[2]).toBe(false);
    expect(value(pp, 'tree', { L0: [2], L1: [3], L3: [5], head: [1] }, [7, 11])).toBe(2 * 3 * 5 * 11);
  });
});

describe('merges and M', () => {
  it('concat keeps input order; residual adds the identity', () => {
    const cat = layered([1], 1, true, [branches('concat', [[conv(1)], [conv(1)]])]);
    expect(value(cat, 'tree', { L0: [3], L1: [5], head: [1, 0] }, [2])).toBe(6);
    expect(value(cat, 'tree', { L0: [3], L1: [5], head: [0, 1] }, [2])).toBe(10);
    const res = layered([1], 1, true, [residual([conv(1)])]);
    expect(value(res, 'tree', { L0: [3], head: [1] }, [2])).toBe(8);
  });

  it('M defaults to the widest first map, found through pools and past no merge', () => {
    expect(planModel(layered([2], undefined, true, [conv(3), globalPool()])).m).toBe(3);
    expect(planModel(layered([4], undefined, true, [pool([2]), conv(4), branches('concat', [[conv(2)], [conv(5)]])])).m).toBe(4);
    // A concat of a map and the raw input: the map gives M, the raw path adds M to the width.
    const p = planModel(layered([2], undefined, true, [branches('concat', [[conv(2)], []])]));
    expect(p.m).toBe(2);
    expect(p.grids[1]!.width).toBe(4);
  });
});

describe('token inputs, embeddings, position vectors, class tokens', () => {
  it('a token is its indicator vector; the embedding picks its column', () => {
    // V = 3, d = 1, E = (2, 3, 5): token 1 → 3, token 2 → 5 (one position).
    const m = layered([1], undefined, true, [embedding(1)], { vocabulary: 3 });
    expect(planModel(m).m).toBe(3);
    expect(value(m, 'tree', { L0: [2, 3, 5], head: [1] }, [0, 1, 0])).toBe(3);
    expect(value(m, 'tree', { L0: [2, 3, 5], head: [1] }, [0, 0, 1])).toBe(5);
  });

  it('position vectors add one vector per position', () => {
    // (x0 + 10)(x1 + 20) at x = (1, 2): 242.
    const m = layered([2], 1, true, [positions(), globalPool()]);
    expect(value(m, 'tree', { 'L0@0': [10], 'L0@1': [20], head: [1] }, [1, 2])).toBe(242);
    expect(value(layered([2], 1, true, [positions('fixed'), globalPool()]), 'tree', { 'L0@0': [10], 'L0@1': [20], head: [1] }, [1, 2])).toBe(242);
  });

  it('a class token is a learned vector at position 0 of a 1D grid of N + 1 positions', () => {
    // 2×2 input → 5 positions: c·x0·x1·x2·x3 = 7·2·3·5·11.
    const m = layered([2, 2], 1, true, [classToken(), globalPool()]);
    expect(planModel(m).grids[0]).toEqual({ dims: [5], width: 1 });
    expect(value(m, 'tree', { L0: [7], head: [1] }, [2, 3, 5, 11])).toBe(2310);
    // Without a pool the default output is position 0, the class token itself.
    expect(value(layered([2], 1, true, [classToken()]), 'tree', { L0: [7], head: [1] }, [2, 3])).toBe(7);
  });
});

describe('linearised attention', () => {
  // D = 1, one head of width 1: y_i = Σ_{j∈N(i)} (q·x_i)(k·x_j)·o·v·x_j = qkov·x_i·Σ_j x_j².
  const w = { 'L0:Q0': [2], 'L0:K0': [3], 'L0:V0': [5], 'L0:O0': [7], head: [1] };
  it('full, causal and windowed fields', () => {
    // N = 2, default output 1 (centre; also the last position when causal); x = (1, 2).
    expect(value(layered([2], 1, true, [attention(1)]), 'tree', w, [1, 2])).toBe(210 * 2 * 5);
    expect(value(layered([2], 1, true, [attention(1, { causal: true })]), 'tree', w, [1, 2])).toBe(210 * 2 * 5);
    // Causal, output 0: x0·x0².
    expect(value(layered([2], 1, true, [attention(1, { causal: true })], { output: [0] }), 'tree', w, [1, 2])).toBe(210);
    // Window 0: y_1 = x1·x1².
    expect(value(layered([2], 1, true, [attention(1, { window: 0 })]), 'tree', w, [1, 2])).toBe(210 * 8);
    // N = 4, window 1, output 1: x1·(x0² + x1² + x2²) at x = (1, 2, 3, 100): 2·14.
    expect(value(layered([4], 1, true, [attention(1, { window: 1 })], { output: [1] }), 'tree', w, [1, 2, 3, 100])).toBe(210 * 28);
    // Causal and window 1, output 2: x2·(x1² + x2²) = 3·13.
    expect(value(layered([4], 1, true, [attention(1, { window: 1, causal: true })], { output: [2] }), 'tree', w, [1, 2, 3, 100])).toBe(210 * 39);
  });

  it('a causal mask on a 2D grid follows row-major order', () => {
    // 2×2 grid, output (0, 1) = position 1: x1·(x0² + x1²) at x = (1, 2, 3, 4).
    const m = layered([2, 2], 1, true, [attention(1, { causal: true })], { output: [0, 1] });
    expect(value(m, 'tree', w, [1, 2, 3, 4])).toBe(210 * 2 * 5);
  });

  it('heads add up; a head of width 2 contracts its queries and keys', () => {
    // Two heads of width 1: (qkov + 1)·x_1·Σ x_j².
    const two = { ...w, 'L0:Q1': [1], 'L0:K1': [1], 'L0:V1': [1], 'L0:O1': [1] };
    expect(value(layered([2], 1, true, [attention(2, { headDim: 1 })]), 'tree', two, [1, 2])).toBe(211 * 2 * 5);
    // One head of width 2, D = 1: Q = (1, 2)ᵀ, K = (3, 4)ᵀ → ⟨Q x_i, K x_j⟩ = 11·x_i·x_j;
    // V = (5, 6)ᵀ, O = (1, 1) → O V x_j = 11·x_j.
    const wide = { 'L0:Q0': [1, 2], 'L0:K0': [3, 4], 'L0:V0': [5, 6], 'L0:O0': [1, 1], head: [1] };
    expect(value(layered([2], 1, true, [attention(1, { headDim: 2 })]), 'tree', wide, [1, 2])).toBe(121 * 2 * 5);
  });

  it('queries and keys read the full width: D = 2, one head of width 1', () => {
    // Q = (1, 0), K = (0, 1), V = (1, 1), O = (1, 0)ᵀ, head (1, 0): y_1[0] = x1[0]·Σ_j x_j[1]·(x_j[0] + x_j[1]).
    // x_0 = (1, 2), x_1 = (3, 4): 3·(2·3 + 4·7) = 102.
    const m = layered([2], 2, true, [attention(1, { headDim: 1 })]);
    expect(value(m, 'tree', { 'L0:Q0': [1, 0], 'L0:K0': [0, 1], 'L0:V0': [1, 1], 'L0:O0': [1, 0], head: [1, 0] }, [1, 2, 3, 4])).toBe(102);
  });

  it('the literal double sum and the aggregated form agree', () => {
    const rng = new Rng(17);
    for (const layer of [attention(2, { headDim: 2 }), attention(1, { headDim: 3, causal: true }), attention(3, { headDim: 1, window: 1 }), attention(1, { window: 2, causal: true })]) {
      const m = layered([6], 3, true, [layer, attention(1, { headDim: 2, window: 1 })], { output: [4] });
      const weights = new WeightStore(rng);
      const x = Float64Array.from({ length: 18 }, () => rng.residue());
      expect(compile(m, 'tree', weights, 'aggregate').evaluate(x)).toBe(compile(m, 'tree', weights, 'literal').evaluate(x));
    }
  });
});

describe('recurrent layers', () => {
  it('per-step outputs: the grid keeps T positions holding h_t', () => {
    // R = M = 1, W_H = 2, W_I = 3, h_0 = 5: h_1 = 30·x0, h_2 = 2·h_1·3·x1 = 180·x0·x1.
    const m = layered([3], 1, true, [recurrent(1, 1, { sequence: true })], { output: [1] });
    expect(planModel(m).grids[0]).toEqual({ dims: [3], width: 1 });
    expect(value(m, 'tree', { 'L0:H1': [2], 'L0:I1': [3], 'L0:h0_1': [5], head: [1] }, [1, 2, 7])).toBe(360);
  });

  it('both directions: [f_T ; b_1] or their sum for the final state', () => {
    // T = 2: f_2 = 2·(2·5·3x0)·3x1 = 180·x0x1; b_1 = 7·(7·13·11x1)·11x0 = 77077·x0x1.
    const ws = { 'L0:H1': [2], 'L0:I1': [3], 'L0:h0_1': [5], 'L0:UH1': [7], 'L0:UI1': [11], 'L0:b0_1': [13] };
    const cat = layered([2], 1, true, [recurrent(1, 1, { bidirectional: true })]);
    expect(planModel(cat).grids[0]).toEqual({ dims: [1], width: 2 });
    expect(value(cat, 'tree', { ...ws, head: [1, 10] }, [1, 1])).toBe(180 + 770770);
    const sum = layered([2], 1, true, [recurrent(1, 1, { bidirectional: true, merge: 'sum' })]);
    expect(value(sum, 'tree', { ...ws, head: [1] }, [1, 1])).toBe(180 + 77077);
    // Per-step outputs, step 0: [f_1 ; b_1] = [30·x0 ; 77077·x0x1].
    const steps = layered([2], 1, true, [recurrent(1, 1, { bidirectional: true, sequence: true })], { output: [0] });
    expect(value(steps, 'tree', { ...ws, head: [1, 1] }, [1, 2])).toBe(30 + 154154);
  });

  it('the next level of a bidirectional stack reads [f ; b] in that order', () => {
    // One step, x: f¹ = 2x, b¹ = 3x; level 2: W_I = (1, 1) → 5x, U_I = (1, 2) → 8x; head (1, 10): 85x.
    const m = layered([1], 1, true, [recurrent(1, 2, { bidirectional: true })]);
    const ws = {
      'L0:H1': [1], 'L0:I1': [2], 'L0:h0_1': [1], 'L0:UH1': [1], 'L0:UI1': [3], 'L0:b0_1': [1],
      'L0:H2': [1], 'L0:I2': [1, 1], 'L0:h0_2': [1], 'L0:UH2': [1], 'L0:UI2': [1, 2], 'L0:b0_2': [1],
      head: [1, 10],
    };
    expect(value(m, 'tree', ws, [2])).toBe(170);
  });
});
