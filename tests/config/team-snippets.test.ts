/**
 * Architecture snippets written the way teams write them (common practice): a module list dumped
 * from a training script, a layer-by-layer definition with separate activation and normalisation
 * layers, and a densely connected block written with a named identity and a concatenation. Each
 * must read as written, into exactly the layers and wiring the snippet means.
 */
import { describe, expect, test } from 'vitest';
import type { Layer } from '../../src/config/model.js';
import { inferShapes } from '../../src/config/model-shapes.js';
import { loadLayered } from './helpers.js';

const kinds = (layers: readonly Layer[]) => layers.map((l) => (l.kind === 'pointwise' ? l.op : l.kind === 'merge' ? `${l.mode}(${l.inputs.join(',')})` : l.kind));

describe('team snippets', () => {
  test('a module list dumped from a training script (kind keys, camelCase fields, explicit padding)', () => {
    const m = loadLayered(`net:
  input: {shape: [1, 64, 64], inChannels: 1}
  layers:
    - {kind: Conv2d, inChannels: 1, outChannels: 16, kernelSize: 3, padding: 1, bias: false}
    - {kind: BatchNorm2d, numFeatures: 16}
    - {kind: LeakyReLU, negativeSlope: 0.1}
    - {kind: MaxPool2d, kernelSize: 2}
    - {kind: Conv2d, inChannels: 16, outChannels: 32, kernelSize: 3, padding: 1}
    - {kind: Dropout2d, p: 0.25}
    - {kind: AdaptiveAvgPool2d, outputSize: 1}
    - {kind: Flatten, startDim: 1}
    - {kind: Linear, inFeatures: 32, outFeatures: 4}
`, { modelPath: '/net' });
    expect(m.input).toMatchObject({ shape: [64, 64], channels: 1 });
    expect(kinds(m.layers)).toEqual(['conv', 'batch_norm', 'leaky_relu', 'pool', 'conv', 'dropout', 'pool', 'flatten', 'dense']);
    expect(m.layers[0]).toMatchObject({ channels: 16, padding: { mode: 'explicit', amount: [1, 1] }, bias: false });
  });

  test('a layer-by-layer definition with separate activation and normalisation layers', () => {
    const m = loadLayered(`model:
  input:
    shape: [96, 96, 3]
    channels: 3
  layers:
    - Conv2D: {filters: 32, kernel_size: [3, 3], strides: [2, 2], padding: valid, use_bias: false}
    - BatchNormalization: {axis: -1, momentum: 0.99, epsilon: 0.001}
    - Activation: {activation: relu}
    - SeparableConv2D: {filters: 64, kernel_size: 3, padding: same}
    - BatchNormalization: {}
    - Activation: relu
    - GlobalMaxPooling2D: {}
    - Dense: {units: 5, activation: softmax}
`);
    expect(kinds(m.layers)).toEqual(['conv', 'batch_norm', 'relu', 'conv', 'conv', 'batch_norm', 'relu', 'pool', 'dense', 'softmax']);
    const shapes = inferShapes(m);
    // derived here: valid 3×3 stride 2 on 96 → ⌊(96−3)/2⌋+1 = 47
    expect(shapes.ok && shapes.shapes.layers[0]).toEqual({ shape: [47, 47], width: 32 });
  });

  test('a densely connected block: each layer joins its input to its output', () => {
    const m = loadLayered(`model:
  input: {shape: [32, 32], channels: 3}
  layers:
    - conv: {channels: 24, kernel: 3}
    - repeat:
        times: 3
        layers:
          - {type: Identity, name: block_in}
          - conv: {channels: 12, kernel: 3, norm: batch, activation: relu}
          - concat: {from: block_in}
`);
    expect(kinds(m.layers).filter((k) => k.startsWith('concat'))).toEqual(['concat(4,1)', 'concat(9,6)', 'concat(14,11)']);
    const shapes = inferShapes(m);
    // widths grow by the growth rate 12 per layer: 24 → 36 → 48 → 60
    expect(shapes.ok && shapes.shapes.layers.filter((_, i) => m.layers[i]!.kind === 'merge').map((s) => s.width)).toEqual([36, 48, 60]);
  });
});
