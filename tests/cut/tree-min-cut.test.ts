/**
 * The tree DP against an independent min-cut: the circuit is expanded into its duplicated tree
 * (every use of a reused node gets its own copy), written out as a hypergraph (copy tensors as
 * hyperedges, open legs tied to their side), and cut by max-flow with the hyperedge gadget. The
 * two values must agree, and the DP's reported cut must multiply out to its value.
 */
import { describe, expect, test } from 'vitest';
import { buildCircuit } from '../../src/network/build-circuit.js';
import { OP_CONST, OP_INPUT, OP_PRODUCT, type Circuit } from '../../src/network/circuit.js';
import { treeMinCut } from '../../src/cut/tree-min-cut.js';
import { minHyperCut, type Hyperedge } from '../../src/cut/hypergraph-cut.js';
import type { LayeredModel } from '../../src/config/model.js';
import { layered, prng } from '../helpers/models.js';

/** Min-cut of the duplicated tree by max-flow; node ids are per copy. */
function flowCut(c: Circuit, side: Uint8Array, aug: number): number {
  const edges: Hyperedge[] = [];
  const tiedA: number[] = [];
  const tiedB: number[] = [];
  let nodes = 0;
  const w = (v: number): number => Math.log2(c.dim[v]! + aug);
  // expand(v) returns the member list (tensor copies) that v's output index joins, creating copies.
  const expand = (v: number): number[] => {
    if (c.op[v] === OP_PRODUCT) {
      const members: number[] = [];
      for (let i = c.childStart[v]!; i < c.childStart[v + 1]!; i++) members.push(...expand(c.childList[i]!));
      return members;
    }
    const id = nodes++;
    if (c.op[v] === OP_INPUT) (side[c.position[v]!] === 1 ? tiedA : tiedB).push(id);
    if (c.op[v] !== OP_INPUT && c.op[v] !== OP_CONST) {
      for (let i = c.childStart[v]!; i < c.childStart[v + 1]!; i++) {
        const ch = c.childList[i]!;
        edges.push({ members: [...expand(ch), id], weight: w(ch) });
      }
    }
    return [id];
  };
  const head = nodes++;
  edges.push({ members: [...expand(c.top), head], weight: w(c.top) });
  return minHyperCut(nodes, edges, tiedA, tiedB).value;
}

function randomModel(r: ReturnType<typeof prng>): { model: LayeredModel; surrogate: 'tree' | 'overlap' } {
  const family = r.int(4);
  if (family === 0) {
    const windows = r.pick([[2, 2, 2], [3, 2], [2, 3], [4, 2], [2, 4]]);
    const n = windows.reduce((a, b) => a * b, 1);
    const bodies = windows.flatMap((w) => [
      ...(r.int(3) > 0 ? [{ kind: 'conv' as const, channels: 1 + r.int(5) }] : []),
      { kind: 'pool' as const, window: [w] },
    ]);
    return { model: layered([n], 1 + r.int(4), bodies, r.int(2) === 0), surrogate: 'tree' };
  }
  if (family === 1) {
    const shape = r.pick([[2, 2], [2, 4], [4, 4], [4, 2]]);
    const bodies = [
      { kind: 'conv' as const, channels: 1 + r.int(4) },
      { kind: 'pool' as const, window: [2, 2].map((w, i) => Math.min(w, shape[i]!)) },
      { kind: 'conv' as const, channels: 1 + r.int(4) },
    ];
    return { model: layered(shape, 1 + r.int(3), bodies, r.int(2) === 0), surrogate: 'tree' };
  }
  if (family === 2) {
    const t = 2 + r.int(4);
    return { model: layered([t], 1 + r.int(3), [{ kind: 'recurrent', hidden: 1 + r.int(3), depth: 1 + r.int(3) }]), surrogate: 'tree' };
  }
  const bodies = [
    { kind: 'conv' as const, channels: 1 + r.int(3), kernel: [1 + r.int(3)] },
    { kind: 'pool' as const, window: [2] },
    { kind: 'conv' as const, channels: 1 + r.int(3), kernel: [1 + r.int(3)] },
  ];
  return { model: layered([4], 1 + r.int(3), bodies), surrogate: 'overlap' };
}

describe('tree min-cut DP', () => {
  test('agrees with max-flow on the duplicated tree (600 random circuits)', () => {
    const r = prng(20261201);
    let reused = 0;
    for (let i = 0; i < 600; i++) {
      const { model, surrogate } = randomModel(r);
      const built = buildCircuit(model, { surrogate });
      if (!built.ok) throw new Error(JSON.stringify(built.diagnostics));
      const c = built.circuit;
      if (c.reuse) reused++;
      const n = model.input.shape.reduce((a, b) => a * b, 1);
      const side = new Uint8Array(n);
      for (let p = 0; p < n; p++) side[p] = r.int(2);
      side[0] = 1;
      side[n - 1] = 0;
      const aug = c.sums ? 1 : 0;
      const weights = Float64Array.from(c.dim, (d) => Math.log2(d + aug));
      const dp = treeMinCut(c, side, weights);
      expect(dp.value, `case ${i}`).toBeCloseTo(flowCut(c, side, aug), 9);
      let fromCounts = 0;
      for (const byDim of dp.counts.values()) for (const [d, k] of byDim) fromCounts += k * Math.log2(d + aug);
      expect(fromCounts, `case ${i}`).toBeCloseTo(dp.value, 9);
    }
    expect(reused).toBeGreaterThan(100);
  });

  test('a copy tensor is paid once: 4×4 grid, 2×2 pooling, M = r = 2, checkerboard', () => {
    // Derived here: the cut through the four level-1 copy tensors costs 2^4 = 16 (the generic rank
    // measured here mod a prime is also 16); paying each leg of a copy tensor would give 256.
    const built = buildCircuit(layered([4, 4], 2, [{ kind: 'conv', channels: 2 }, { kind: 'pool', window: [2, 2] }, { kind: 'conv', channels: 2 }, { kind: 'pool', window: [2, 2] }]), { surrogate: 'tree' });
    if (!built.ok) throw new Error('build');
    const side = new Uint8Array(16).map((_, p) => ((Math.floor(p / 4) + (p % 4)) % 2 === 0 ? 1 : 0));
    const dp = treeMinCut(built.circuit, side, Float64Array.from(built.circuit.dim, (d) => Math.log2(d)));
    expect(dp.value).toBe(4);
  });
});
