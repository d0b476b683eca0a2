/**
 * Facts about sequence models and linearised attention, measured by the oracle alone (no engine):
 * exact generic ranks mod P of small models built to isolate one effect. Every value here is the
 * oracle's own measurement ("measured here"); the argument beside it is derived here unless a
 * paper is named. The engine's bounds for such models must respect them (the property tests
 * check that on random models of the sequence and attention families).
 */
import { describe, expect, it } from 'vitest';
import type { LayeredModel } from '../../src/config/model.js';
import { Rng } from './field.js';
import { attention, classToken, conv, embedding, globalPool, layered, partition, positions, recurrent, residual, withOutput } from './models.js';
import { planModel } from './plan.js';
import { compile, probeRankWith, WeightStore } from './surrogate.js';

/** Probe rank with K = bound + 8 (K must exceed the rank for the reading to be the rank). */
function rank(model: LayeredModel, side: string | Uint8Array, bound: number, seed = 1): number {
  const s = typeof side === 'string' ? partition(side, model.input.shape).side : side;
  return probeRankWith(compile(model, 'tree', new WeightStore(new Rng(seed))), s, bound + 8, new Rng(seed + 1));
}

/** Side A = the given positions of n. */
function positionsMask(n: number, a: readonly number[]): Uint8Array {
  const side = new Uint8Array(n);
  for (const p of a) side[p] = 1;
  return side;
}

const stack = (layers: number, make: () => ReturnType<typeof attention>) => Array.from({ length: layers }, make);

describe('linearised attention: one layer', () => {
  it('rank = 1 + min(Σ_h a, D) across start-end and interleaved, on 30 random one-layer nets', () => {
    // derived here: for h = ⟨w, y_o⟩ the far side (the one without o) enters only through the
    // per-head aggregates Σ_{j far} ⟨Q_h v_o, K_h v_j⟩ (wᵀO_h V_h v_j): a numbers per head, each
    // multiplied by a coordinate of Q_h v_o, a linear function of v_o (at most D independent ones),
    // plus the one term that reads the near side only: rank ≤ 1 + min(Σ_h a, D). Measured here
    // (the oracle's own evaluation): equality on every draw, with and without a residual
    // connection, a causal mask (output: the last position) or position vectors, N = 3–8,
    // D = 2–4, H = 1–3, a = 1–3.
    const rng = new Rng(5);
    for (let i = 0; i < 30; i++) {
      const n = rng.int(3, 8);
      const d = rng.int(2, 4);
      const h = rng.int(1, 3);
      const a = rng.int(1, 3);
      const att = attention(h, { headDim: a, causal: rng.chance(0.4) });
      const m = layered([n], d, true, [...(rng.chance(0.4) ? [positions()] : []), rng.chance(0.5) ? residual([att]) : att]);
      for (const spec of ['start-end', 'interleaved']) expect(rank(m, spec, 1 + d), `N=${n} D=${d} H=${h} a=${a} ${spec}`).toBe(1 + Math.min(h * a, d));
    }
  });
});

describe('linearised attention: depth', () => {
  it('D = 2, two heads of width 2: L = 1, 2, 3 → start-end ranks 3, 18, 232', () => {
    // Measured here (the oracle's own evaluation), N = 4 and 6 alike (N = 4 for L = 3); the same
    // values on interleaved. Single positions carry less at depth (L = 2: 17 for position 0).
    const net = (n: number, l: number): LayeredModel => layered([n], 2, true, stack(l, () => attention(2, { headDim: 2 })));
    for (const n of [4, 6]) {
      expect(rank(net(n, 1), 'start-end', 3), `N=${n}`).toBe(3);
      expect(rank(net(n, 2), 'start-end', 18), `N=${n}`).toBe(18);
      expect(rank(net(n, 2), 'interleaved', 18), `N=${n}`).toBe(18);
    }
    expect(rank(net(4, 3), 'start-end', 232)).toBe(232);
    expect(rank(net(5, 2), 'positions:0', 18)).toBe(17);
  });

  it('scalar heads (H = a = 1): 2, 8, 50 for L = 1, 2, 3, whatever the width and the partition', () => {
    // Measured here (the oracle's own evaluation), D = 2, 3, 4, partitions start-end, interleaved
    // and a single position: one scalar head passes one number per layer, so the width does not
    // enter. The growth 2 → 8 → 50 is the depth alone.
    for (const d of [2, 3, 4]) {
      for (const [l, want] of [
        [1, 2],
        [2, 8],
      ] as const) {
        const m = layered([5], d, true, stack(l, () => attention(1, { headDim: 1 })));
        for (const spec of ['start-end', 'interleaved', 'positions:0', 'positions:2']) expect(rank(m, spec, want), `D=${d} L=${l} ${spec}`).toBe(want);
      }
    }
    const deep = layered([5], 3, true, stack(3, () => attention(1, { headDim: 1 })));
    for (const spec of ['start-end', 'positions:0']) expect(rank(deep, spec, 50), spec).toBe(50);
  });
});

describe('causal masks', () => {
  const causalNet = (n: number, layers: number): LayeredModel => layered([n], 2, true, stack(layers, () => attention(2, { headDim: 2, causal: true })));

  it("a causal model's last position couples the start and the end; its first position couples nothing", () => {
    // derived here: with every layer causal, y_i reads only v_j for j ≤ i, so the output at 0
    // reads v_0 alone (rank 1 across every partition), and the output at o is constant in every
    // position after o (rank 1 for any partition whose side A holds only such positions). The
    // default output of a model whose position-reading layers are all causal is the last one.
    // Measured here.
    for (const layers of [1, 2]) {
      const m = causalNet(6, layers);
      expect(planModel(m).output.position).toEqual([5]);
      expect(rank(m, 'start-end', 18), `L=${layers}`).toBe(layers === 1 ? 3 : 18);
      const first = withOutput(m, [0]);
      for (const spec of ['start-end', 'interleaved', 'positions:0', 'positions:1,3']) expect(rank(first, spec, 4), `L=${layers} ${spec}`).toBe(1);
      const third = withOutput(m, [2]);
      for (const later of [[3], [4, 5], [3, 4, 5]]) expect(rank(third, positionsMask(6, later), 4), `L=${layers} A=${later}`).toBe(1);
      // One position at or before the output is enough to couple.
      expect(rank(third, positionsMask(6, [1, 4, 5]), 18), `L=${layers}`).toBeGreaterThan(1);
    }
    // The same for per-step outputs of a unidirectional recurrent layer (causal by construction),
    // and its loss with both directions: the backward state b_3 carries the later positions into
    // the output at 2, ⟨w, [f_2; b_2]⟩ = ⟨w_f, f_2⟩ + Σ_k w_b,k (U_I v_2)_k (U_H b_3)_k, so at most
    // 1 + R terms (derived here); measured here: R = 2 → 3.
    const rnn = layered([6], 2, true, [recurrent(2, 2, { sequence: true })], { output: [2] });
    expect(rank(rnn, positionsMask(6, [3, 4, 5]), 4)).toBe(1);
    const bi = layered([6], 2, true, [recurrent(2, 1, { sequence: true, bidirectional: true })], { output: [2] });
    expect(rank(bi, positionsMask(6, [3, 4, 5]), 4)).toBe(3);
  });

  it('a causal layer followed by a full one brings the later positions back: rank 10, not 1', () => {
    // derived here: the full layer's output at o reads every position's causal output, and the
    // position after o read them all. Measured here: D = 2, Σ_h a ≥ 2 (two heads of width 2, one
    // of width 2, two of width 1), output 1, side A = the positions after it, N = 4 and 6: 10;
    // scalar heads: 4; with both layers causal: 1.
    for (const n of [4, 6]) {
      const later = positionsMask(n, Array.from({ length: n - 2 }, (_, i) => i + 2));
      for (const [h, a, want] of [
        [2, 2, 10],
        [1, 2, 10],
        [2, 1, 10],
        [1, 1, 4],
      ] as const) {
        const mixed = layered([n], 2, true, [attention(h, { headDim: a, causal: true }), attention(h, { headDim: a })], { output: [1] });
        expect(rank(mixed, later, want), `N=${n} H=${h} a=${a}`).toBe(want);
        const causal = layered([n], 2, true, [attention(h, { headDim: a, causal: true }), attention(h, { headDim: a, causal: true })], { output: [1] });
        expect(rank(causal, later, 4), `N=${n} H=${h} a=${a}`).toBe(1);
      }
    }
  });

  it('a window of w per layer: after L layers nothing beyond L·w is read', () => {
    // derived here: y_i reads v_j for |i − j| ≤ w only, so L layers read |i − j| ≤ L·w. Measured
    // here: N = 8, output 0, w = 1: one layer reads {0, 1}, two read {0, 1, 2}.
    for (const layers of [1, 2]) {
      const m = layered([8], 2, true, stack(layers, () => attention(1, { headDim: 2, window: 1 })), { output: [0] });
      const reach = compile(m, 'tree', new WeightStore(new Rng(3))).dependsOn();
      expect(Array.from(reach)).toEqual([1, 1, ...(layers === 2 ? [1] : [0]), 0, 0, 0, 0, 0]);
      expect(rank(m, positionsMask(8, [3, 4, 5, 6, 7]), 4), `L=${layers}`).toBe(1);
    }
  });

  it('a class token with a causal mask reads nothing: the default output (position 0) is constant', () => {
    // derived here: the class token sits at position 0 and a causal layer lets position 0 read
    // only itself, so the default output of such a model (position 0 whenever a class token is
    // present) depends on no input. Measured here: rank 1 on every partition, while the last
    // position couples.
    const m = layered([4], 2, true, [classToken(), attention(1, { headDim: 2, causal: true }), attention(1, { headDim: 2, causal: true })]);
    expect(planModel(m).output.position).toEqual([0]);
    expect(Array.from(compile(m, 'tree', new WeightStore(new Rng(4))).dependsOn())).toEqual([0, 0, 0, 0]);
    for (const spec of ['start-end', 'interleaved']) expect(rank(m, spec, 4), spec).toBe(1);
    expect(rank(withOutput(m, [4]), 'start-end', 18)).toBeGreaterThan(1);
  });
});

describe('token inputs: the vocabulary bottleneck', () => {
  it('one position carries at most V functions; through an embedding into a product network, min(V, d)', () => {
    // derived here: a function of one token position takes V values, so it is a combination of
    // the V indicators: rank ≤ V across {p}, whatever follows. When the position enters the
    // network once, linearly (embedding E of width d, then per-position maps and a product over
    // positions), everything it passes crosses E's image: rank ≤ min(V, d) (the vocabulary
    // bottleneck of Wies, Levine, Jannai & Shashua, "Which transformer architecture fits my data?
    // A vocabulary bottleneck in self-attention", ICML 2021). Measured here: equality.
    for (const v of [2, 3, 5]) {
      for (const d of [1, 2, 3, 4]) {
        const m = layered([4], undefined, true, [embedding(d), conv(4), globalPool()], { vocabulary: v });
        expect(rank(m, 'positions:0', 4), `V=${v} d=${d}`).toBe(Math.min(v, d));
      }
    }
  });

  it('in attention one position enters with degree 2–3: it can pass more than d functions, never more than V', () => {
    // derived here: across {p} a non-output position p enters a one-layer net through
    // (K v_p)_t·(c·V v_p), a quadratic, and through the terms that do not read it (the constant
    // function): 1 + min(a, D) functions, which exceeds min(V, d) = d when V > d. The discrete
    // domain still caps it at V. Measured here, N = 3, output 1, one head of width 2:
    // d = 2 → 3 for V = 3, 5, 8 and 2 for V = 2; d = 1 → 2 for every V.
    for (const [v, d, want] of [
      [2, 2, 2],
      [3, 2, 3],
      [5, 2, 3],
      [8, 2, 3],
      [5, 1, 2],
      [5, 3, 3],
    ] as const) {
      const m = layered([3], undefined, true, [embedding(d), attention(1, { headDim: 2 })], { vocabulary: v });
      expect(rank(m, 'positions:0', 4), `V=${v} d=${d}`).toBe(want);
    }
    // Two layers: one position never passes more than V (V = 2, 3, 4; d = 4).
    for (const v of [2, 3, 4]) {
      const m = layered([6], undefined, true, [embedding(4), attention(1), attention(1)], { vocabulary: v });
      expect(rank(m, 'positions:0', v), `V=${v}`).toBe(v);
    }
  });

  it('width beyond the vocabulary adds nothing: the start-end rank stops growing at d = V', () => {
    // Wies, Levine, Jannai & Shashua (ICML 2021, abstract): "an embedding rank bottleneck that
    // limits the contribution of self-attention width to the Transformer expressivity"; the
    // embedding rank is min(V, d). Measured here: N = 8, one head of width d (the default),
    // start-end. One layer: min(V, 1 + d). Two layers, V = 4: d = 1..6 → 5, 18, 22, 24, 24, 24;
    // V = 3: 5, 12, 13, 13, 13, 13. The same nets on continuous inputs (M = d) keep growing:
    // 5, 18, 49, 110 for d = 1..4. So on tokens, width beyond V adds no separation rank here, as
    // the bottleneck predicts; below V the discrete domain already caps it under the
    // continuous value.
    const net = (layers: number, d: number, v: number | undefined): LayeredModel =>
      v === undefined
        ? layered([8], d, true, stack(layers, () => attention(1)))
        : layered([8], undefined, true, [embedding(d), ...stack(layers, () => attention(1))], { vocabulary: v });
    for (const v of [2, 3, 4]) for (const d of [1, 2, 3, 4, 5]) expect(rank(net(1, d, v), 'start-end', 6), `L=1 V=${v} d=${d}`).toBe(Math.min(v, 1 + d));
    const two = { 4: [5, 18, 22, 24, 24, 24], 3: [5, 12, 13, 13, 13, 13] } as const;
    for (const v of [3, 4] as const) {
      two[v].forEach((want, i) => expect(rank(net(2, i + 1, v), 'start-end', want), `L=2 V=${v} d=${i + 1}`).toBe(want));
    }
    [5, 18, 49, 110].forEach((want, i) => expect(rank(net(2, i + 1, undefined), 'start-end', want), `continuous d=${i + 1}`).toBe(want));
  });
});

describe('class tokens and position vectors', () => {
  it("a class token's query is a constant: one layer adds up the positions, a second one couples them", () => {
    // derived here: the output at position 0 is Σ_j ⟨Q c, K v_j⟩ O V v_j with c constant, a sum
    // of one term per position: rank 2 across every partition (f(x_A) + g(x_B)). The next layer's
    // query at position 0 reads that sum, so two layers couple. Measured here: D = 2, one head of
    // width 2, N = 6, start-end: 2 with one layer, 3 without the class token; two layers: 14.
    const one = layered([6], 2, true, [classToken(), attention(1, { headDim: 2 })]);
    expect(planModel(one).output.position).toEqual([0]);
    for (const spec of ['start-end', 'interleaved', 'positions:0']) expect(rank(one, spec, 3), spec).toBe(2);
    expect(rank(layered([6], 2, true, [attention(1, { headDim: 2 })]), 'start-end', 3)).toBe(3);
    const two = layered([6], 2, true, [classToken(), attention(1, { headDim: 2 }), attention(1, { headDim: 2 })]);
    expect(rank(two, 'start-end', 18)).toBe(14);
  });

  it('position vectors make each position a different affine map: they do not lower the rank', () => {
    // derived here: v_t + p_t is an affine function of v_t, so it adds constant terms; measured
    // here on one layer (3 with and without) and on a partition that moves one position of a
    // two-layer net with scalar heads (8 with and without).
    const plain = layered([6], 2, true, [attention(1, { headDim: 2 })]);
    const placed = layered([6], 2, true, [positions(), attention(1, { headDim: 2 })]);
    expect(rank(plain, 'start-end', 3)).toBe(3);
    expect(rank(placed, 'start-end', 3)).toBe(3);
    const deep = (p: boolean): LayeredModel => layered([5], 2, true, [...(p ? [positions('fixed')] : []), ...stack(2, () => attention(1, { headDim: 1 }))]);
    expect(rank(deep(false), 'positions:0', 8)).toBe(8);
    expect(rank(deep(true), 'positions:0', 8)).toBe(8);
  });
});
