/**
 * The lower bounds of recurrent layers of depth ≥ 2 whose lower levels are passed through
 * (DEVELOPERS.md, "Deep recurrences: passing the lower levels through"; derived here, with the
 * depth-2 start-end bound of Levine, Sharir, Ziv & Shashua, "Benefits of depth for long-term
 * memory of recurrent networks"). Each rule's value, with the certified probe off, is checked
 * against the oracle's exact generic rank (rank mod P of a probe matrix at random weights, the
 * independent evaluator of tests/oracle) on random small models, continuous and token inputs,
 * a third of them bidirectional and a third with per-step outputs analysed at a random step.
 */
import { describe, expect, it } from 'vitest';
import { computeBounds } from '../../src/cut/bounds.js';
import type { LayeredModel } from '../../src/config/model.js';
import type { Partition } from '../../src/partition/partition.js';
import { Rng } from '../oracle/field.js';
import { dense, embedding, layered, maskPartition, partition, recurrent, withOutput } from '../oracle/models.js';
import { compile, probeRankWith, WeightStore } from '../oracle/surrogate.js';

function oracleRank(model: LayeredModel, side: Uint8Array, k: number, seed: number): number {
  let best = 0;
  for (let attempt = 0; attempt < 2; attempt++) {
    const ev = compile(model, 'tree', new WeightStore(new Rng(seed + 7919 * attempt)));
    best = Math.max(best, probeRankWith(ev, side, k, new Rng(seed ^ 0x5bd1e995)));
  }
  return best;
}

function binomial(n: number, k: number): number {
  let r = 1;
  for (let i = 1; i <= k; i++) r = (r * (n - k + i)) / i;
  return Math.round(r);
}

describe('recurrent layers of depth ≥ 2: lower levels passed through', () => {
  it('never above the oracle (random models, depth 2–4)', () => {
    const rng = new Rng(20261202);
    const used = new Map<string, { applied: number }>();
    for (let i = 0; i < 120; i++) {
      const t = rng.int(2, 7);
      const token = rng.chance(0.35);
      const vocabulary = token ? rng.int(2, 3) : undefined;
      const m = token ? undefined : rng.int(1, 2);
      const depth = rng.int(2, 4);
      const r = rng.int(2, 4);
      // A third of the layers bidirectional (the rules then hold with the backward chains zeroed).
      const both = rng.chance(0.33) ? { bidirectional: true, merge: rng.chance(0.5) ? ('sum' as const) : ('concat' as const) } : {};
      // A third with per-step outputs, analysed at a random step.
      const sequence = rng.chance(0.33);
      const items = [...(rng.chance(0.3) ? [embedding(rng.int(2, 3))] : []), recurrent(r, depth, { ...both, sequence }), ...(rng.chance(0.3) ? [dense(rng.int(1, 3))] : [])];
      const plain = layered([t], m, true, items, vocabulary !== undefined ? { vocabulary } : {});
      const model = sequence ? withOutput(plain, [rng.int(0, t - 1)]) : plain;
      const side = new Uint8Array(t);
      for (let p = 0; p < t; p++) side[p] = rng.chance(0.5) ? 1 : 0;
      if (side.every((x) => x === side[0])) side[0] = 1 - side[0]!;
      const partitions: Partition[] = [maskPartition(side), ...(t % 2 === 0 ? [partition('start-end', [t])] : [])];
      const out = computeBounds(model, partitions, { surrogate: 'tree', probeBudget: 0 });
      if (!out.ok) throw new Error(out.diagnostics.map((d) => d.message).join('; '));
      out.result.partitions.forEach((pb, j) => {
        const lower = pb.lower;
        if (!lower || !/passed through/.test(lower.method)) return;
        // A probe of K columns reads min(rank, K) at most: K just above the claim decides it.
        const truth = oracleRank(model, partitions[j]!.side, Number(lower.rank) + 4, 1000 + i);
        const where = `T=${t} ${token ? `V=${vocabulary}` : `M=${m}`} depth=${depth} R=${r}${'merge' in both ? ` bidirectional ${both.merge}` : ''}${sequence ? ` output ${model.output?.position}` : ''} ${items.map((x) => x.kind).join('+')} ${pb.partition}`;
        expect(Number(lower.rank), `${where}: ${lower.method} ${lower.rank} above the oracle's ${truth}`).toBeLessThanOrEqual(truth);
        const u = used.get(lower.method) ?? { applied: 0 };
        u.applied++;
        used.set(lower.method, u);
      });
    }
    console.log([...used].map(([k, v]) => `${k}: ${v.applied} checks`).join('; '));
    // Both rules must have been the best lower bound somewhere, or this test checked nothing.
    expect(used.get('recurrent span, lower levels passed through')?.applied ?? 0).toBeGreaterThan(3);
    expect(used.get('published depth-2 recurrent, lower levels passed through')?.applied ?? 0).toBeGreaterThan(3);
    expect(used.get('recurrent span, lower levels passed through, backward chains zeroed')?.applied ?? 0).toBeGreaterThan(0);
    // Per-step outputs before the last step, and the backward chain kept, were checked too.
    expect([...used.keys()].some((k) => /steps \d+-\d+/.test(k))).toBe(true);
    expect([...used.keys()].some((k) => /forward chains zeroed/.test(k))).toBe(true);
  });

  it('depth 3 and 4 across start-end: C(min(M, R) + T/2 − 1, T/2), as at depth 2', () => {
    for (const [t, m, r, depth] of [
      [4, 2, 2, 3],
      [6, 2, 3, 3],
      [4, 3, 3, 4],
    ] as const) {
      const model = layered([t], m, true, [recurrent(r, depth)]);
      const out = computeBounds(model, [partition('start-end', [t])], { surrogate: 'tree', probeBudget: 0 });
      if (!out.ok) throw new Error('rejected');
      const lower = out.result.partitions[0]!.lower!;
      const expected = binomial(Math.min(m, r) + t / 2 - 1, t / 2);
      expect(lower.method).toBe('published depth-2 recurrent, lower levels passed through');
      expect(Number(lower.rank)).toBe(expected);
      expect(oracleRank(model, partition('start-end', [t]).side, expected + 4, 77)).toBeGreaterThanOrEqual(expected);
    }
  });
});
