import { describe, expect, test } from 'vitest';
import { codesAt, diagnostics, loadExplicit } from './helpers.js';

const NETWORK = `model:
  network:
    shape: [4]
    tensors:
      - name: a
        legs: [{position: 0, dim: 2}]
      - name: b
        legs: [{position: 1, dim: 2}, {position: 2, dim: 3}]
      - {name: c, legs: [{position: 3, dim: 2}]}
      - {name: hub}
    bonds:
      - {between: [a, b], dim: 3}
      - {between: [b, c], dim: 2}
      - {between: [a, b, c, hub], dim: 5}
`;

describe('explicit networks', () => {
  test('a good network loads with names, legs, bonds and spans', () => {
    const m = loadExplicit(NETWORK);
    expect(m.file).toBe('test.yaml');
    expect(m.shape).toEqual([4]);
    expect(m.tensors.map((t) => [t.name, t.legs.map((l) => [l.position, l.dim])])).toEqual([
      ['a', [[0, 2]]],
      ['b', [[1, 2], [2, 3]]],
      ['c', [[3, 2]]],
      ['hub', []],
    ]);
    expect(m.bonds.map((b) => [b.tensors, b.dim])).toEqual([
      [['a', 'b'], 3],
      [['b', 'c'], 2],
      [['a', 'b', 'c', 'hub'], 5],
    ]);
    expect(m.span).toMatchObject({ line: 2, column: 3 });
    expect(m.tensors[0]!.span).toMatchObject({ line: 5, column: 9 });
    expect(m.tensors[1]!.legs[1]!.span).toMatchObject({ line: 8, column: 39 });
    expect(m.tensors[2]!.span).toMatchObject({ line: 9, column: 9 });
    expect(m.bonds[2]!.span).toMatchObject({ line: 14, column: 9 });
  });

  test('bonds are optional, and a 2D shape numbers positions row-major', () => {
    const m = loadExplicit('model:\n  network:\n    shape: [1, 2]\n    tensors: [{name: t, legs: [{position: 0, dim: 2}, {position: 1, dim: 2}]}]\n');
    expect(m.shape).toEqual([1, 2]);
    expect(m.bonds).toEqual([]);
  });

  test('a bond naming an unknown tensor, with did-you-mean', () => {
    const d = diagnostics(NETWORK.replace('between: [b, c]', 'between: [b, cc]'));
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/unknown-tensor@13:23']);
    expect(d[0]!.message).toBe("model.network.bonds[1].between[1] names the tensor 'cc', which is not in network.tensors (did you mean 'c'?)");
  });

  test('a position without a leg', () => {
    const d = diagnostics(NETWORK.replace('shape: [4]', 'shape: [6]'));
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/position-without-leg@3:12']);
    expect(d[0]!.message).toContain('positions 4, 5 of model.network.shape [6] have no open leg');
  });

  test('a leg outside the shape', () => {
    const d = diagnostics(NETWORK.replace('{position: 3, dim: 2}', '{position: 4, dim: 2}'));
    // position 3 now has no leg either
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual([
      'config/position-without-leg@3:12',
      'config/position-out-of-range@9:37',
    ]);
    expect(d[1]!.message).toContain('positions 0 to 3');
  });

  test('duplicate tensor names, repeated tensors in a bond, and bonds with one tensor', () => {
    const text = NETWORK.replace('{name: hub}', '{name: a}').replace('[a, b, c, hub]', '[a, b, b]').replace('between: [b, c]', 'between: [c]');
    expect(codesAt(text)).toEqual([
      'config/duplicate-tensor@10:16',
      'config/invalid-length@13:19',
      'config/duplicate-bond-tensor@14:26',
    ]);
  });

  test('dims must be positive integers and positions non-negative', () => {
    const text = NETWORK.replace('{position: 0, dim: 2}', '{position: -1, dim: 0}').replace('{between: [a, b], dim: 3}', '{between: [a, b], dim: 1.5}');
    expect(codesAt(text)).toEqual(['config/position-without-leg@3:12', 'config/invalid-number@6:27', 'config/invalid-number@6:36', 'config/invalid-number@12:32']);
  });

  test('unknown fields in tensors, legs and bonds', () => {
    const text = NETWORK.replace('{name: hub}', '{name: hub, leg: []}').replace('{between: [a, b], dim: 3}', '{betwen: [a, b], dim: 3}');
    expect(codesAt(text)).toEqual(['config/unknown-field@10:21', 'config/unknown-field@12:10']);
  });

  test('a network needs shape and tensors', () => {
    const d = diagnostics('model:\n  network: {bonds: []}\n');
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/missing-field@2:12']);
    expect(d[0]!.message).toContain("'shape'");
    expect(d[0]!.message).toContain("'tensors'");
  });
});
