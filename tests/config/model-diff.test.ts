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

  test('sequence kinds: the vocabulary, the cell and directions of a recurrent layer, embedding width, heads and masks', () => {
    const base = `model:
  input: {shape: [16], vocab_size: 100}
  layers:
    - embedding: {dim: 8}
    - position: {}
    - lstm: {hidden: 8, bidirectional: true}
    - attention: {heads: 2, window: 2}
    - dense: {units: 3}
`;
    const head = base
      .replace('vocab_size: 100', 'vocab_size: 120')
      .replace('dim: 8', 'dim: 16')
      .replace('position: {}', 'positional_encoding: {}')
      .replace('lstm: {hidden: 8, bidirectional: true}', 'gru: {hidden: 8, bidirectional: true, merge_mode: sum, return_sequences: true}')
      .replace('heads: 2, window: 2', 'heads: 4, head_dim: 2, causal: true');
    expect(diffModels(load(base), load(head)).map(show)).toEqual([
      'input.vocabulary: 100 → 120 @2:36',
      '0.dim: 8 → 16 @4:24',
      '1.mode: learned → fixed @5:7',
      '2.cell: lstm → gru @6:7',
      '2.merge: concat → sum @6:57',
      '3.heads: 2 → 4 @7:26',
      '3.head_dim: (none) → 2 @7:39',
      '3.causal: false → true @7:50',
      '3.window: 2 → (none) @7:7',
    ]);
  });
});
