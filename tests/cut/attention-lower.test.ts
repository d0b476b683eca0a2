/**
 * The lower bound through one linearised attention layer with the rest passed through
 * (DEVELOPERS.md, "One attention layer, the rest passed through"; derived here). Values are
 * compared with the oracle's exact generic rank (rank mod P of a probe matrix at random weights,
 * tests/oracle), and with the one-layer rank 1 + min(H·a, D) that tests/oracle/sequence-facts
 * measures (measured here).
 */
import { describe, expect, it } from 'vitest';
import { computeBounds } from '../../src/cut/bounds.js';
import type { LayeredModel } from '../../src/config/model.js';
import { Rng } from '../oracle/field.js';
import { act, attention, classToken, conv, dense, embedding, layered, maskPartition, norm, partition, positions, residual } from '../oracle/models.js';
import { compile, probeRankWith, WeightStore } from '../oracle/surrogate.js';

const METHOD = 'one attention layer, the rest passed through';

function lowerOf(model: LayeredModel, side: Uint8Array): { rank: number; method: string } | null {
  const out = computeBounds(model, [maskPartition(side)], { surrogate: 'tree', probeBudget: 0 });
  if (!out.ok) throw new Error(out.diagnostics.map((d) => d.message).join('; '));
  const l = out.result.partitions[0]!.lower;
  return l ? { rank: Number(l.rank), method: l.method } : null;
}

function oracle(model: LayeredModel, side: Uint8Array, k: number, seed = 3): number {
  return probeRankWith(compile(model, 'tree', new WeightStore(new Rng(seed))), side, k, new Rng(seed + 1));
}

const block = (heads: number, headDim: number, width: number, causal = false) => [
  residual([norm('layer_norm'), attention(heads, { headDim, causal })]),
  residual([norm('layer_norm'), dense(2 * width), act('gelu'), dense(width)]),
];

describe('one attention layer, the rest passed through', () => {
  it('continuous inputs, one block: 1 + min(H·a, D), the rank the oracle measures', () => {
    for (const [n, d, h, a] of [
      [4, 2, 1, 1],
      [5, 3, 1, 2],
      [6, 3, 2, 2],
      [5, 4, 3, 1],
    ] as const) {
      const model = layered([n], d, true, [positions(), ...block(h, a, d), dense(2)]);
      const side = partition('start-end', [n]).side;
      const lower = lowerOf(model, side)!;
      expect(lower.method).toBe(METHOD);
      expect(lower.rank).toBe(1 + Math.min(h * a, d));
      expect(oracle(model, side, lower.rank + 4)).toBe(lower.rank);
    }
  });

  it('a stack of blocks: the later attention layers zeroed, never above the oracle', () => {
    const rng = new Rng(11);
    let checked = 0;
    for (let i = 0; i < 25; i++) {
      const n = rng.int(3, 7);
      const width = rng.int(2, 3);
      const token = rng.chance(0.5);
      const causal = rng.chance(0.5);
      const items = [...(token ? [embedding(width)] : []), ...block(rng.int(1, 2), rng.int(1, 2), width, causal), ...block(1, 1, width, causal)];
      const model = layered([n], token ? undefined : width, true, items, token ? { vocabulary: rng.int(2, 4) } : {});
      const side = new Uint8Array(n);
      for (let p = 0; p < n; p++) side[p] = rng.chance(0.5) ? 1 : 0;
      if (side.every((x) => x === side[0])) side[0] = 1 - side[0]!;
      const lower = lowerOf(model, side);
      if (!lower || lower.method !== METHOD) continue;
      expect(lower.rank, `case ${i}`).toBeLessThanOrEqual(oracle(model, side, lower.rank + 4, 100 + i));
      checked++;
    }
    expect(checked).toBeGreaterThan(10);
  });

  it('no bound where the argument does not hold', () => {
    const n = 6;
    const startEnd = partition('start-end', [n]).side;
    // The analysed output (default: the last position) attends to no position after it.
    const causal = layered([n], 3, true, [attention(2, { headDim: 2, causal: true })], { output: [2] });
    const afterOutput = new Uint8Array(n).map((_, p) => (p > 2 ? 1 : 0));
    expect(lowerOf(causal, afterOutput)?.method).not.toBe(METHOD);
    // A class token is the query: it reads no input.
    expect(lowerOf(layered([n], 3, true, [classToken(), attention(2, { headDim: 2 })]), new Uint8Array(n + 1).map((_, p) => (p > 3 ? 1 : 0)))?.method).not.toBe(METHOD);
    // A window conv after the attention layer mixes positions.
    expect(lowerOf(layered([n], 3, true, [attention(2, { headDim: 2 }), conv(3, { kernel: [3] })]), startEnd)?.method).not.toBe(METHOD);
  });
});
