/**
 * Lower bounds of `overlap` networks with strided convs through the special case that keeps one
 * tap per strided axis (DEVELOPERS.md, "Special cases for lower bounds"; derived here). The lower
 * bound is checked against the oracle's exact generic rank (rank mod P of a probe matrix at
 * random weights, tests/oracle).
 */
import { describe, expect, it } from 'vitest';
import { computeBounds } from '../../src/cut/bounds.js';
import type { LayeredModel } from '../../src/config/model.js';
import { Rng } from '../oracle/field.js';
import { conv, globalPool, layered, partition } from '../oracle/models.js';
import { compile, probeRankWith, WeightStore } from '../oracle/surrogate.js';

const STEP = 'all taps but one zeroed';

function lower(model: LayeredModel, spec: string): { rank: number; method: string } | null {
  const out = computeBounds(model, [partition(spec, model.input.shape)], { surrogate: 'overlap', probeBudget: 0 });
  if (!out.ok) throw new Error(out.diagnostics.map((d) => d.message).join('; '));
  const l = out.result.partitions[0]!.lower;
  return l ? { rank: Number(l.rank), method: l.method } : null;
}

function oracle(model: LayeredModel, spec: string, k: number, seed: number): number {
  return probeRankWith(compile(model, 'overlap', new WeightStore(new Rng(seed))), partition(spec, model.input.shape).side, k, new Rng(seed + 1));
}

describe('strided convs under overlap: one tap kept', () => {
  it('same, causal and explicit padding give a special case; never above the oracle', () => {
    const rng = new Rng(9);
    let used = 0;
    for (let i = 0; i < 30; i++) {
      const n = rng.pick([6, 8, 9]);
      const k = rng.int(2, 4);
      const s = rng.int(2, 3);
      const padding = rng.pick(['same', 'causal', 'explicit'] as const);
      const stem = conv(rng.int(2, 3), { kernel: [k], stride: [s], padding: padding === 'explicit' ? [rng.int(0, k - 1)] : padding });
      const model = layered([n], rng.int(1, 2), rng.chance(0.5), [stem, conv(rng.int(2, 3), { kernel: [3] }), globalPool()]);
      let l;
      try {
        l = lower(model, 'start-end');
      } catch {
        continue; // a padding that reads only zeros somewhere: refused by the model's own rules
      }
      if (!l || !l.method.includes(STEP)) continue;
      used++;
      expect(l.rank, `case ${i}`).toBeLessThanOrEqual(oracle(model, 'start-end', l.rank + 4, 50 + i));
    }
    expect(used).toBeGreaterThan(10);
  });

  it('valid padding whose kernel-1 length differs: no special case', () => {
    // n = 8, k = 3, s = 2: valid gives ⌊(8 − 3)/2⌋ + 1 = 3 outputs, a kernel-1 conv ⌊7/2⌋ + 1 = 4.
    const model = layered([8], 2, true, [conv(2, { kernel: [3], stride: [2], padding: 'valid' }), conv(2, { kernel: [3] })]);
    expect(lower(model, 'start-end')?.method ?? '').not.toContain(STEP);
  });
});
