/**
 * The model diff: fields per kind compared over the topological layer list aligned by kind, each
 * change at the span of the head's field, named as the YAML's canonical field.
 */
import { describe, expect, test } from 'vitest';
import { diffModels, type FieldChange } from '../../src/config/model-diff.js';
import { load } from './helpers.js';

const BASE = `model:
  input: {shape: [32, 32], channels: 3}
  layers:
    - conv: {channels: 16, kernel: 3, name: stem, activation: relu}
    - residual:
        layers: [{conv: {channels: 16, kernel: 3, dilation: 1}}]
    - conv: {channels: 32, name: enc}
    - MaxPool2d: {kernel_size: 3, stride: 1, padding: 1}
    - conv: {channels: 32}
    - concat: {from: enc}
`;

const show = (c: FieldChange) => `${c.layer}.${c.field}: ${c.from} → ${c.to} @${c.span.line}:${c.span.column}`;

describe('model diff', () => {
  test('identical models have no changes', () => {
    expect(diffModels(load(BASE), load(BASE))).toEqual([]);
  });

  test('changed fields of the new kinds, at the head field', () => {
    const head = BASE.replace('dilation: 1', 'dilation: 2')
      .replace('activation: relu', 'activation: gelu')
      .replace('MaxPool2d: {kernel_size: 3, stride: 1, padding: 1}', 'AvgPool2d: {kernel_size: 3, stride: 1, padding: same}')
      .replace('conv: {channels: 32, name: enc}', 'conv: {channels: 32, name: enc, padding: 1, kernel: 3}');
    expect(diffModels(load(BASE), load(head)).map(show)).toEqual([
      // a pointwise layer from a shortcut field spans that field (`activation: gelu`)
      '1.op: relu → gelu @4:51',
      '2.dilation: [1, 1] → [2, 2] @6:61',
      'enc.kernel: [1, 1] → [3, 3] @7:59',
      'enc.padding: same → [1, 1] @7:48',
      '5.mode: max → average @8:7',
      '5.padding: [1, 1] → same @8:55',
    ]);
  });

  test('input channels and M, and the output position', () => {
    const head = BASE.replace('{shape: [32, 32], channels: 3}', '{shape: [32, 32], channels: 1, representation: 8}').replace('  layers:', '  output: {position: [4, 4]}\n  layers:');
    expect(diffModels(load(BASE), load(head)).map(show)).toEqual([
      'input.channels: 3 → 1 @2:38',
      'input.representation: (none) → 8 @2:57',
      'output.position: (none) → [4, 4] @3:22',
    ]);
  });

  test('a skip that reads another layer', () => {
    const head = BASE.replace('conv: {channels: 32}\n', 'conv: {channels: 32, name: mid}\n').replace('concat: {from: enc}', 'concat: {from: mid}');
    expect(diffModels(load(BASE), load(head)).map(show)).toEqual(['7.from: [enc] → [mid] @10:22']);
  });

  test('an inserted pointwise layer is one added layer, not a shift of every later one', () => {
    const head = BASE.replace('    - MaxPool2d', '    - BatchNorm2d\n    - MaxPool2d');
    expect(diffModels(load(BASE), load(head)).map(show)).toEqual(['5.layer: (none) → pointwise @8:7']);
  });
});
