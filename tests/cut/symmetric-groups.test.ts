/**
 * The shared-weight refinement of the min-cut: a window's identical pure children on the far side
 * of its copy tensor pass only the symmetric power of the space their function factors through.
 * Values: the 4×4 checkerboard with shared weights has generic rank 81 (measured here, exact rank
 * mod a prime; unshared: 256), and a shallow shared network across |A| inputs is bounded by
 * C(M + |A| − 1, |A|) (derived here: Π_i ⟨w_z, x_i⟩ lies in Sym^|A|(R^M)).
 */
import { describe, expect, test } from 'vitest';
import { computeBounds } from '../../src/cut/bounds.js';
import { resolvePartition } from '../../src/partition/partition.js';
import type { LayeredModel } from '../../src/config/model.js';
import { layered } from '../helpers/models.js';

function upper(model: LayeredModel, spec: string): bigint {
  const r = resolvePartition(spec, model.input.shape);
  if (!r.ok) throw new Error(r.message);
  const out = computeBounds(model, [r.partition], { surrogate: 'tree' });
  if (!out.ok) throw new Error('bounds');
  return out.result.partitions[0]!.upper.rank;
}

const grid = (shared: boolean): LayeredModel =>
  layered([4, 4], 2, [
    { kind: 'conv', channels: 4 },
    { kind: 'pool', window: [2, 2] },
    { kind: 'conv', channels: 4 },
    { kind: 'pool', window: [2, 2] },
  ], shared);

describe('symmetric groups under shared weights', () => {
  test('4×4, 2×2 pooling, M = 2, channels 4: checkerboard 81 shared, 256 unshared', () => {
    expect(upper(grid(true), 'checkerboard')).toBe(81n);
    expect(upper(grid(false), 'checkerboard')).toBe(256n);
  });

  test('shallow network, M = 2, 6 inputs, start-end: min(Z, C(2 + 3 − 1, 3) = 4) shared, min(Z, 8) unshared', () => {
    for (const z of [1, 2, 3, 4, 6, 10]) {
      const net = (shared: boolean) => layered([6], 2, [{ kind: 'conv', channels: z }, { kind: 'pool', global: true }], shared);
      expect(upper(net(true), 'start-end'), `Z = ${z}`).toBe(BigInt(Math.min(z, 4)));
      expect(upper(net(false), 'start-end'), `Z = ${z}`).toBe(BigInt(Math.min(z, 8)));
    }
  });

  test('the refinement never applies to recurrent layers (their window children differ)', () => {
    const rnn = layered([4], 3, [{ kind: 'recurrent', hidden: 3, depth: 1 }]);
    expect(upper(rnn, 'start-end')).toBe(3n);
  });
});
