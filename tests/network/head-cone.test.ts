/**
 * The head's cone (network/head-cone.ts): the nodes the analysed output reads, and the bounds the
 * rules find on it, which must be those of the whole network.
 */
import { describe, expect, it } from 'vitest';
import { NO_SPAN } from '../../src/diagnostic.js';
import { loadConfigText } from '../../src/config/load-config.js';
import type { LayeredModel } from '../../src/config/model.js';
import { defaultPartitions, resolvePartition } from '../../src/partition/partition.js';
import { buildCircuit } from '../../src/network/build-circuit.js';
import { CircuitBuilder, OP_INPUT, OP_PRODUCT, OP_SUM, type Circuit } from '../../src/network/circuit.js';
import { headCone } from '../../src/network/head-cone.js';
import { treeMinCut } from '../../src/cut/tree-min-cut.js';
import { degreeBound } from '../../src/cut/degree-bound.js';
import { rankPropagation } from '../../src/cut/rank-propagation.js';

function layered(text: string): LayeredModel {
  const loaded = loadConfigText(text, 'cone.yaml');
  if (!loaded.ok) throw new Error(loaded.diagnostics.map((d) => d.message).join('\n'));
  if (loaded.model.kind !== 'layered') throw new Error('not layered');
  return loaded.model;
}

function circuit(m: LayeredModel, surrogate: 'tree' | 'overlap'): Circuit {
  const built = buildCircuit(m, { surrogate });
  if (!built.ok) throw new Error(built.diagnostics.map((d) => d.message).join('\n'));
  return built.circuit;
}

/** A small encoder/decoder: a skip joins the upsampled path at 16×16; output away from the centre. */
const ENCODER_DECODER = `model:
  input: {shape: [16, 16], representation: 2}
  output: {position: [3, 12]}
  layers:
    - conv: {channels: 3, kernel: 3, padding: 1, name: enc}
    - pool: {window: 2}
    - conv: {channels: 4, kernel: 3, padding: 1}
    - upsample: {scale_factor: 2, mode: bilinear}
    - concat: {from: enc}
    - conv: {channels: 3, kernel: 3, padding: 1}
    - conv: {channels: 2, kernel: 1}
`;

describe('headCone', () => {
  it('keeps the top and exactly the nodes it reads (derived here: two 3-wide windows read 5 inputs)', () => {
    // Overlap surrogate: each conv output is one sum over its window, so the output at position 5
    // reads the layer-1 sums at 4, 5, 6 and they read inputs 3 to 7: 1 + 3 + 5 nodes.
    const whole = circuit(layered(`model:\n  input: {shape: [16], representation: 2}\n  output: {position: [5]}\n  layers:\n    - conv: {channels: 3, kernel: 3, padding: 1}\n    - conv: {channels: 3, kernel: 3, padding: 1}\n`), 'overlap');
    const cone = headCone(whole);
    expect(whole.size).toBe(16 + 16 + 16);
    expect(cone.size).toBe(9);
    expect(cone.top).toBe(8);
    expect(Array.from(cone.op)).toEqual([...Array(5).fill(OP_INPUT), ...Array(4).fill(OP_SUM)]);
    expect(Array.from(cone.position.subarray(0, 5))).toEqual([3, 4, 5, 6, 7]);
    expect([cone.reuse, cone.sums, cone.homogeneous]).toEqual([whole.reuse, whole.sums, whole.homogeneous]);
  });

  it('is the circuit itself when the head reads every node', () => {
    const whole = circuit(layered(`model:\n  input: {shape: [8], representation: 2}\n  layers:\n    - conv: {channels: 3, kernel: 3, padding: 1}\n    - pool: {global: true}\n`), 'overlap');
    expect(headCone(whole)).toBe(whole);
  });

  it.each(['tree', 'overlap'] as const)('gives the bounds of the whole network (%s surrogate, every default partition)', (surrogate) => {
    const m = layered(ENCODER_DECODER);
    const whole = circuit(m, surrogate);
    const cone = headCone(whole);
    expect(cone.size).toBeLessThan(whole.size);
    const weights = (c: Circuit): Float64Array => Float64Array.from(c.dim, (d) => Math.log2(d + 1));
    for (const spec of defaultPartitions(m.input.shape)) {
      const r = resolvePartition(spec, m.input.shape);
      if (!r.ok) throw new Error(r.message);
      const side = r.partition.side;
      const [a, b] = [treeMinCut(whole, side, weights(whole)), treeMinCut(cone, side, weights(cone))];
      expect([b.value, b.counts]).toEqual([a.value, a.counts]);
      const [da, db] = [degreeBound(whole, side), degreeBound(cone, side)];
      expect([db?.log2, db?.rank(), db?.counts]).toEqual([da?.log2, da?.rank(), da?.counts]);
      const [pa, pb] = [rankPropagation(whole, side), rankPropagation(cone, side, whole)];
      expect([pb.log2, pb.rank(), pb.counts]).toEqual([pa.log2, pa.rank(), pa.counts]);
    }
  });
});

describe('rank propagation on a cone', () => {
  it('looks at the whole circuit before refusing the exact pass (a product of 140,000 inputs beside the head)', () => {
    // Derived here: the head is x_0 + x_1 with x_0 on side A and x_1 on side B, mapped to 3
    // coordinates: f(x_A) + g(x_B), rank 2. Beside it, outside the cone, a product of 140,000
    // inputs of dimension 2^30 whose simple ceiling (4.2 million bits) is over the exact pass's
    // limit, though its rank bounds are not (ρ_A ≤ D·κ with κ = 1): the exact pass still runs.
    const positions = 140_000;
    const b = new CircuitBuilder(positions, 1_000_000);
    const tag = b.addTag({ label: 'input', line: 1, span: NO_SPAN, layerIndex: -1 });
    const inputs = Array.from({ length: positions }, (_, p) => b.add(OP_INPUT, 2 ** 30, tag, [], p));
    const top = b.add(OP_SUM, 3, tag, [inputs[0]!, inputs[1]!]);
    b.add(OP_PRODUCT, 2 ** 30, tag, inputs);
    const whole = b.finish(top);
    const side = new Uint8Array(positions);
    for (let p = 0; p < positions; p += 2) side[p] = 1;
    const cone = headCone(whole);
    expect(cone.size).toBe(3);
    expect(rankPropagation(cone, side, whole).rank()).toBe(2n);
    expect(rankPropagation(whole, side).rank()).toBe(2n);
  });
});
