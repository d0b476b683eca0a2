/**
 * Small inputs that ask for huge work: every one is refused (or answered) with a positioned
 * diagnostic before anything is allocated from the numbers it states.
 */
import { describe, expect, test } from 'vitest';
import { loadConfigText } from '../../src/config/load-config.js';
import { MAX_INPUT_POSITIONS, MAX_MODEL_INTEGER } from '../../src/config/limits.js';
import { buildCircuit, NODE_LIMIT } from '../../src/network/build-circuit.js';
import { OP_SUM } from '../../src/network/circuit.js';
import { computeBounds } from '../../src/cut/bounds.js';
import { resolvePartition } from '../../src/partition/partition.js';
import { codesAt, loadLayered } from '../config/helpers.js';
import { codesOf, HEAD } from '../policy/helpers.js';

describe('sizes are checked with arithmetic first', () => {
  test('a 1D input of a billion positions is refused by the loader, at the shape', () => {
    const text = 'model:\n  input: {shape: [1000000000], features: 2}\n  layers:\n    - conv: {channels: 4}\n    - pool: {global: true}\n';
    expect(Buffer.byteLength(text)).toBeLessThan(120);
    const r = loadConfigText(text, 'big.yaml');
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.diagnostics.map((d) => `${d.code}@${d.span?.line}:${d.span?.column}`)).toEqual(['network/too-large@2:18']);
    expect(r.diagnostics[0]!.message).toContain('1,000,000,000 positions');
  });

  test('a 2D shape whose product is beyond exact integers is refused, and so is an explicit network', () => {
    expect(codesAt('model:\n  input: {shape: [2000000000, 2000000000], features: 2}\n  layers:\n    - conv: {channels: 4}\n')).toEqual([
      'network/too-large@2:18',
    ]);
    expect(codesAt('model:\n  network:\n    shape: [100000, 100000]\n    tensors: [{name: a, legs: [{position: 0, dim: 2}]}]\n    bonds: []\n')).toContain(
      'network/too-large@3:12',
    );
  });

  test('the position limit is the network builder node limit, and the largest allowed input loads', () => {
    expect(MAX_INPUT_POSITIONS).toBe(NODE_LIMIT);
    const m = loadLayered(`model:\n  input: {shape: [${MAX_INPUT_POSITIONS}], features: 2}\n  layers:\n    - conv: {channels: 4}\n`);
    expect(m.input.shape).toEqual([MAX_INPUT_POSITIONS]);
  });

  test('a width of 2^31 is refused at the field; 2^31 − 1 loads and is analysed exactly', () => {
    expect(codesAt('model:\n  input: {shape: [16], features: 2}\n  layers:\n    - conv: {channels: 2147483648}\n')).toEqual([
      'config/number-too-large@4:24',
    ]);
    expect(codesAt('model:\n  input: {shape: [16], features: 2}\n  layers:\n    - recurrent: {hidden: 4294967296}\n')).toEqual([
      'config/number-too-large@4:27',
    ]);
    const m = loadLayered(`model:\n  input: {shape: [4], representation: 3}\n  layers:\n    - conv: {channels: ${MAX_MODEL_INTEGER}}\n    - pool: {window: 4}\n`);
    const p = resolvePartition('start-end', [4]);
    if (!p.ok) throw new Error(p.message);
    const r = computeBounds(m, [p.partition], { surrogate: 'tree' });
    if (!r.ok) throw new Error(JSON.stringify(r.diagnostics));
    // Derived here (DEVELOPERS.md, symmetric groups): with shared weights the two positions of
    // a side feed one window through the same map, so they pass Sym^2(R^3) of dimension
    // C(3 + 2 − 1, 2) = 6, far below the width.
    expect(r.result.partitions[0]!.upper.rank).toBe(6n);
  });
});

describe('deep recurrence with width 1', () => {
  test('hidden 1 and depth 3 over 64 steps has rank exactly 1 (no "internal error")', () => {
    // Derived here: every state is a scalar, so h is a product of one factor per input
    // position and its separation rank across any partition is 1.
    const m = loadLayered('model:\n  input: {shape: [64], features: 2}\n  layers:\n    - recurrent: {hidden: 1, depth: 3}\n');
    const parts = ['start-end', 'interleaved'].map((s) => {
      const p = resolvePartition(s, [64]);
      if (!p.ok) throw new Error(p.message);
      return p.partition;
    });
    const r = computeBounds(m, parts, { surrogate: 'tree' });
    if (!r.ok) throw new Error(JSON.stringify(r.diagnostics));
    for (const b of r.result.partitions) {
      expect(b.upper.rank).toBe(1n);
      expect(b.status).toBe('exact');
      for (const c of b.upper.cut) expect(Number.isSafeInteger(c.count)).toBe(true);
    }
  });
});

describe('policy globs', () => {
  test('a 70,000-character applies_to pattern is a positioned error, not an internal error', () => {
    const text = `${HEAD}applies_to: ["${'a'.repeat(70_000)}"]\nrequire:\n  - {partition: start-end, min_rank: 2}\n`;
    expect(codesOf(text)).toEqual(['policy/applies-to@3:14']);
  });

  test('a pattern of 1,024 characters is still accepted', () => {
    const text = `${HEAD}applies_to: ["${'a'.repeat(1019)}.yaml"]\nrequire:\n  - {partition: start-end, min_rank: 2}\n`;
    expect(() => codesOf(text)).toThrow(/expected diagnostics/);
  });
});

describe('kernels far wider than the grid', () => {
  test('an overlap conv with kernel 2^31 − 1 reads the 8 positions once per window, at once', () => {
    const m = loadLayered(`model:\n  input: {shape: [8], features: 2}\n  layers:\n    - conv: {channels: 3, kernel: ${MAX_MODEL_INTEGER}}\n`);
    const built = buildCircuit(m, { surrogate: 'overlap' });
    if (!built.ok) throw new Error(JSON.stringify(built.diagnostics));
    const c = built.circuit;
    // DEVELOPERS.md, overlap surrogate: 'same' keeps 8 outputs, and every window covers the grid.
    const windows = [...Array(c.size).keys()].filter((v) => c.op[v] === OP_SUM);
    expect(windows).toHaveLength(8);
    for (const v of windows) expect(c.childStart[v + 1]! - c.childStart[v]!).toBe(8);
  });
});

describe('partition masks', () => {
  test('resolving a partition of a billion positions answers without allocating a mask', () => {
    const r = resolvePartition('start-end', [1_000_000_000]);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message).toBe('the shape [1000000000] has more than 4000000 positions');
  });
});
