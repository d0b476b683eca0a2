/**
 * The graphology view of a network: one node per tensor (copy tensors for pools, a head), one
 * edge per bond use, each carrying layer, line, span, dimension and position — counted exactly on
 * small configs loaded from YAML, so the spans are real.
 */
import { describe, expect, test } from 'vitest';
import { loadConfigText } from '../../src/config/load-config.js';
import { buildCircuit } from '../../src/network/build-circuit.js';
import { circuitToGraph, explicitToGraph } from '../../src/network/to-graph.js';

function load(text: string) {
  const r = loadConfigText(text, 'net.yaml');
  if (!r.ok) throw new Error(JSON.stringify(r.diagnostics));
  return r.model;
}

describe('circuitToGraph', () => {
  const yaml = 'model:\n  input: {shape: [4], representation: 3}\n  layers:\n    - conv: {channels: 2, name: c}\n    - pool: {window: 2}\n    - pool: {global: true}\n';

  test('tree surrogate: inputs, per-position maps, copy tensors, a global pool, head', () => {
    const m = load(yaml);
    if (m.kind !== 'layered') throw new Error('layered');
    const built = buildCircuit(m, { surrogate: 'tree' });
    if (!built.ok) throw new Error('build');
    const g = circuitToGraph(built.circuit);
    const kinds = g.mapNodes((_, a) => a.kind).sort();
    // 4 inputs, 4 linear maps, 2 pool windows + 1 global pool, the head
    expect(kinds).toEqual(['copy', 'copy', 'copy', 'head', 'input', 'input', 'input', 'input', 'linear', 'linear', 'linear', 'linear']);
    expect(g.size).toBe(4 + 4 + 2 + 1);
    const inputs = g.filterNodes((_, a) => a.kind === 'input').map((n) => g.getNodeAttributes(n));
    expect(inputs.map((a) => a.position)).toEqual([0, 1, 2, 3]);
    expect(inputs.every((a) => a.dim === 3 && a.line === 2 && a.span.line === 2)).toBe(true);
    const maps = g.filterNodes((_, a) => a.kind === 'linear').map((n) => g.getNodeAttributes(n));
    expect(maps.every((a) => a.layer === 'c' && a.line === 4 && a.span.column === 7 && a.dim === 2)).toBe(true);
    // a bond out of a pool window carries the channels of the conv that set its dimension
    const windowEdges = g.filterEdges((_, a, s, t) => g.getNodeAttribute(s, 'kind') === 'copy' && g.getNodeAttribute(t, 'kind') === 'copy');
    expect(windowEdges.map((e) => g.getEdgeAttributes(e)).map((a) => [a.layer, a.dim])).toEqual([['c', 2], ['c', 2]]);
  });

  test('overlap surrogate: a 3-tap window reuses activations', () => {
    const m = load(yaml.replace('{channels: 2, name: c}', '{channels: 2, kernel: 3, name: c}'));
    if (m.kind !== 'layered') throw new Error('layered');
    const built = buildCircuit(m, { surrogate: 'overlap' });
    if (!built.ok) throw new Error('build');
    const g = circuitToGraph(built.circuit);
    expect(g.filterNodes((_, a) => a.kind === 'sum')).toHaveLength(4);
    // same padding: taps 2 + 3 + 3 + 2
    expect(g.filterEdges((_, a, s) => g.getNodeAttribute(s, 'kind') === 'input')).toHaveLength(10);
    expect(built.circuit.reuse).toBe(true);
  });
});

describe('explicitToGraph', () => {
  test('tensors, open legs and a hyperedge as a copy node', () => {
    const m = load(
      'model:\n  network:\n    shape: [3]\n    tensors:\n      - {name: a, legs: [{position: 0, dim: 2}]}\n      - {name: b, legs: [{position: 1, dim: 2}]}\n      - {name: c, legs: [{position: 2, dim: 2}]}\n    bonds:\n      - {between: [a, b, c], dim: 3}\n',
    );
    if (m.kind !== 'explicit') throw new Error('explicit');
    const g = explicitToGraph(m);
    expect(g.order).toBe(3 + 3 + 1);
    expect(g.size).toBe(3 + 3);
    const hub = g.filterNodes((_, a) => a.kind === 'copy');
    expect(hub).toHaveLength(1);
    expect(g.getNodeAttributes(hub[0]!)).toMatchObject({ dim: 3, line: 9 });
  });
});
