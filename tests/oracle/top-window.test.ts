/**
 * The shared-weight lower bound from the top product window, checked against the oracle where it
 * matters most: partitions that split some of the top window's children (odd halves), which the
 * rule handles by fixing those children's inputs. Random shared 1D and 2D pyramids; for every
 * case the bound must not exceed the probe rank, and the rule must actually fire.
 */
import { describe, expect, it } from 'vitest';
import { computeBounds } from '../../src/cut/bounds.js';
import type { LayeredModel } from '../../src/config/model.js';
import { Rng } from './field.js';
import { probeRank } from './surrogate.js';
import { conv, globalPool, layered, partition, pool } from './models.js';

function check(model: LayeredModel, spec: string, rng: Rng): { lower: bigint; oracle: number; rule: string } {
  const p = partition(spec, model.input.shape);
  // The rule alone: the certified probe, which runs after it and often improves on it, is off.
  const out = computeBounds(model, [p], { surrogate: 'tree', probeBudget: 0 });
  if (!out.ok) throw new Error(JSON.stringify(out.diagnostics));
  const b = out.result.partitions[0]!;
  const k = Math.min(Number(b.upper.rank) + 8, 300);
  const oracle = probeRank(model, 'tree', p.side, k, rng);
  return { lower: b.lower?.rank ?? 0n, oracle, rule: b.lower?.method ?? 'none' };
}

describe('top-window span rule with split children (shared weights)', () => {
  it('1D: three top children, the middle one split by start-end', () => {
    const rng = new Rng(20261202);
    let fired = 0;
    for (let i = 0; i < 60; i++) {
      const m = rng.int(1, 3);
      const r1 = rng.int(1, 4);
      const r2 = rng.int(1, 5);
      // 6 inputs → windows of 2 → 3 top children; start-end puts inputs 0-2 on A: child 1 is split
      const model = layered([6], m, true, [conv(r1), pool([2]), conv(r2), globalPool()]);
      const { lower, oracle, rule } = check(model, 'start-end', rng);
      expect(lower <= BigInt(oracle), `M=${m} r=(${r1},${r2}): lower ${lower} (${rule}) > oracle ${oracle}`).toBe(true);
      if (rule === 'top-window span') fired++;
    }
    expect(fired).toBeGreaterThan(0);
  });

  it('2D: a 3×3 top window, left-right splits its middle column', () => {
    const rng = new Rng(7);
    let fired = 0;
    for (let i = 0; i < 40; i++) {
      const m = rng.int(1, 2);
      const r1 = rng.int(1, 3);
      const model = layered([3, 6], m, true, [conv(r1, { dims: 2 }), pool([1, 2]), conv(rng.int(1, 4), { dims: 2 }), globalPool()]);
      const { lower, oracle, rule } = check(model, 'left-right', rng);
      expect(lower <= BigInt(oracle), `M=${m}: lower ${lower} (${rule}) > oracle ${oracle}`).toBe(true);
      if (rule === 'top-window span') fired++;
    }
    expect(fired).toBeGreaterThan(5);
  });
});
