import { describe, expect, test } from 'vitest';
import { MAX_EXPANDED_LAYERS } from '../../src/config/load-config.js';
import { codesAt, diagnostics, layered, loadLayered } from './helpers.js';

const REPEAT = `model:
  input: {shape: [64, 64], features: 3}
  layers:
    - conv: {channels: 8, name: stem}
    - repeat:
        times: 3
        layers:
          - conv: {channels: 16}
          - pool: {window: 2, name: down}
    - dense: {units: 10}
`;

describe('repeat expansion', () => {
  test('indices, paths and iterations of the expanded layers', () => {
    const m = loadLayered(REPEAT);
    expect(m.layers.map((l) => [l.index, l.kind, l.path, l.repeatIteration])).toEqual([
      [0, 'conv', '/model/layers/0', undefined],
      [1, 'conv', '/model/layers/1/repeat/layers/0', 0],
      [2, 'pool', '/model/layers/1/repeat/layers/1', 0],
      [3, 'conv', '/model/layers/1/repeat/layers/0', 1],
      [4, 'pool', '/model/layers/1/repeat/layers/1', 1],
      [5, 'conv', '/model/layers/1/repeat/layers/0', 2],
      [6, 'pool', '/model/layers/1/repeat/layers/1', 2],
      [7, 'dense', '/model/layers/2', undefined],
    ]);
    // copies of a named layer are numbered from 1, so every layer has one label
    expect(m.layers.map((l) => l.name)).toEqual(['stem', undefined, 'down[1]', undefined, 'down[2]', undefined, 'down[3]', undefined]);
    expect(m.layers.map((l) => l.inputs)).toEqual([[-1], [0], [1], [2], [3], [4], [5], [6]]);
  });

  test('spans of expanded layers point at the inner YAML', () => {
    const m = loadLayered(REPEAT);
    for (const i of [1, 3, 5]) {
      expect(m.layers[i]!.span).toMatchObject({ line: 8, column: 13 });
      expect(m.layers[i]!.fieldSpans['channels']).toMatchObject({ line: 8, column: 30 });
    }
    for (const i of [2, 4, 6]) expect(m.layers[i]!.span).toMatchObject({ line: 9, column: 13 });
    expect(m.layers[7]!.span).toMatchObject({ line: 10, column: 7 });
  });

  test('nested repeats: the innermost iteration is recorded', () => {
    const text = `model:
  input: {shape: [16], features: 2}
  layers:
    - repeat:
        times: 2
        layers:
          - dense: {units: 4}
          - repeat:
              times: 3
              layers:
                - conv: {channels: 5}
`;
    const m = loadLayered(text);
    expect(m.layers.map((l) => [l.index, l.kind, l.repeatIteration, l.path])).toEqual([
      [0, 'dense', 0, '/model/layers/0/repeat/layers/0'],
      [1, 'conv', 0, '/model/layers/0/repeat/layers/1/repeat/layers/0'],
      [2, 'conv', 1, '/model/layers/0/repeat/layers/1/repeat/layers/0'],
      [3, 'conv', 2, '/model/layers/0/repeat/layers/1/repeat/layers/0'],
      [4, 'dense', 1, '/model/layers/0/repeat/layers/0'],
      [5, 'conv', 0, '/model/layers/0/repeat/layers/1/repeat/layers/0'],
      [6, 'conv', 1, '/model/layers/0/repeat/layers/1/repeat/layers/0'],
      [7, 'conv', 2, '/model/layers/0/repeat/layers/1/repeat/layers/0'],
    ]);
    expect(m.layers[7]!.span).toMatchObject({ line: 11, column: 19 });
  });

  test('an error inside a repeat body is reported once, however often it expands', () => {
    expect(codesAt(layered('    - repeat: {times: 5, layers: [{conv: {channels: 0}}]}\n'))).toEqual(['config/invalid-number@6:53']);
  });

  test('repeat needs times and a non-empty layers list', () => {
    expect(codesAt(layered('    - repeat: {layers: [{dense: {units: 1}}]}\n    - repeat: {times: 2, layers: []}\n'))).toEqual([
      'config/missing-field@6:15',
      'config/empty-layers@7:34',
    ]);
  });
});

describe('the expansion cap', () => {
  test(`exactly ${MAX_EXPANDED_LAYERS} layers are allowed`, () => {
    expect(MAX_EXPANDED_LAYERS).toBe(10000);
    const m = loadLayered(layered('    - repeat: {times: 9999, layers: [{dense: {units: 1}}]}\n    - dense: {units: 1}\n'));
    expect(m.layers).toHaveLength(10000);
    expect(m.layers[9999]!.index).toBe(9999);
  });

  test('one more is refused at the times of the outermost repeat', () => {
    const d = diagnostics(layered('    - repeat: {times: 10000, layers: [{dense: {units: 1}}]}\n    - dense: {units: 1}\n'));
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/too-many-layers@6:23']);
    expect(d[0]!.message).toContain('10001 layers');
  });

  test('nested repeats multiply; the error is at the outer times, and nothing is expanded', () => {
    const text = `model:
  input: {shape: [16], features: 2}
  layers:
    - dense: {units: 2}
    - repeat:
        times: 1000000
        layers:
          - repeat:
              times: 1000000000
              layers: [{dense: {units: 1}}]
`;
    const started = Date.now();
    const d = diagnostics(text);
    expect(Date.now() - started).toBeLessThan(2000);
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/too-many-layers@6:16']);
    expect(d[0]!.message).toContain('model.layers[1].repeat.times is 1000000');
    expect(d[0]!.message).toContain('1000000000000001 layers');
  });

  test('a repeat inside a block is blamed at its times; the blocks count their merges', () => {
    const text = layered(
      '    - conv: {channels: 2}\n    - residual:\n        layers:\n          - repeat: {times: 9997, layers: [{conv: {channels: 2}}]}\n        activation: relu\n',
    );
    // 1 + 9997 + the merge + its activation = 10000: allowed; one more copy is not
    expect(loadLayered(text).layers).toHaveLength(10000);
    const d = diagnostics(text.replace('9997', '9998'));
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/too-many-layers@9:29']);
    expect(d[0]!.message).toContain('model.layers[1].residual.layers[0].repeat.times is 9998');
  });

  test('the biggest of several top-level repeats is blamed', () => {
    const text = layered('    - repeat: {times: 3000, layers: [{dense: {units: 1}}]}\n    - repeat: {times: 4000, layers: [{dense: {units: 1}}, {dense: {units: 1}}]}\n');
    expect(codesAt(text)).toEqual(['config/too-many-layers@7:23']);
  });

  test('a YAML list of more than the cap is refused at the list, before validation', () => {
    const entries = '    - dense: {units: 0}\n'.repeat(MAX_EXPANDED_LAYERS - 1);
    const inRepeat = '    - repeat: {times: 1, layers: [{dense: {units: 0}}, {dense: {units: 0}}]}\n';
    const d = diagnostics(layered(entries + inRepeat));
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/too-many-layers@6:5']);
    expect(d[0]!.message).toContain('lists 10001 layers');
  });
});
