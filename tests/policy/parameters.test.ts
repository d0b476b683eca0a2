/**
 * Parameter counts of the real network, checked against published figures where a paper gives
 * them and against counts derived here (by hand, beside the test) elsewhere.
 */
import { describe, expect, test } from 'vitest';
import { parameterCount } from '../../src/policy/parameters.js';
import { loadConfigText } from '../../src/config/load-config.js';
import type { LayeredModel } from '../../src/config/model.js';

function load(text: string): LayeredModel {
  const r = loadConfigText(text, 'p.yaml');
  if (!r.ok) throw new Error(r.diagnostics.map((d) => `${d.span?.line}:${d.span?.column} ${d.message}`).join('\n'));
  if (r.model.kind !== 'layered') throw new Error('not layered');
  return r.model;
}

const count = (input: string, layers: string[]): bigint =>
  parameterCount(load(`model:\n  input: ${input}\n  layers:\n${layers.map((l) => `    - ${l}\n`).join('')}`));

describe('published figures', () => {
  test('LeNet-5 layers C1, C5 and F6: 156, 48,120 and 10,164 trainable parameters', () => {
    // LeCun, Bottou, Bengio & Haffner, "Gradient-based learning applied to document recognition"
    // (1998), section II.B: C1 has 156 trainable parameters, C5 48,120, F6 10,164.
    expect(count('{shape: [32, 32], channels: 1}', ['conv: {channels: 6, kernel: 5, padding: valid}'])).toBe(156n);
    expect(count('{shape: [5, 5], channels: 16}', ['conv: {channels: 120, kernel: 5, padding: valid}'])).toBe(48120n);
    expect(count('{shape: [1], channels: 120}', ['dense: {units: 84}'])).toBe(10164n);
  });

  test('VGG configuration A (11 weight layers): 133 million', () => {
    // Simonyan & Zisserman, "Very deep convolutional networks for large-scale image recognition"
    // (ICLR 2015), Table 2: configuration A has 133 million parameters. Exact count derived here:
    // Σ 9·in·out + out over the convs, then 25088·4096, 4096·4096 and 4096·1000 with biases.
    const widths = [64, 'M', 128, 'M', 256, 256, 'M', 512, 512, 'M', 512, 512, 'M'] as const;
    const layers = widths.map((w) => (w === 'M' ? 'MaxPool2d: {kernel_size: 2}' : `conv: {channels: ${w}, kernel: 3, padding: 1, activation: relu}`));
    const total = count('{shape: [224, 224], channels: 3}', [...layers, 'flatten', 'dense: {units: 4096, activation: relu, dropout: 0.5}', 'dense: {units: 4096, activation: relu, dropout: 0.5}', 'dense: {units: 1000}']);
    let convs = 0;
    let inW = 3;
    for (const w of widths) if (w !== 'M') ((convs += 9 * inW * w + w), (inW = w));
    expect(total).toBe(BigInt(convs + 25088 * 4096 + 4096 + 4096 * 4096 + 4096 + 4096 * 1000 + 1000));
    expect(total).toBe(132863336n);
    expect(Math.round(Number(total) / 1e6)).toBe(133);
  });
});

describe('derived here', () => {
  test('depthwise: k·channels (times the depth multiplier); separable adds the 1×1 conv and its bias', () => {
    // a depthwise conv takes its width from its input, so M is set here
    const input = '{shape: [8, 8], channels: 32, representation: 32}';
    expect(count(input, ['{type: DepthwiseConv2D, kernel_size: 3, use_bias: false}'])).toBe(9n * 32n);
    expect(count(input, ['{type: DepthwiseConv2D, kernel_size: 3, depth_multiplier: 2, use_bias: false}'])).toBe(9n * 64n);
    expect(count(input, ['{type: SeparableConv2D, filters: 64, kernel_size: 3}'])).toBe(9n * 32n + 32n * 64n + 64n);
  });

  test('grouped conv: k·(in/groups)·out + out', () => {
    expect(count('{shape: [8, 8], channels: 8}', ['conv: {channels: 16, kernel: 3, groups: 4}'])).toBe(9n * 2n * 16n + 16n);
  });

  test('unshared weights: one set per output position', () => {
    const one = 9n * 2n * 4n + 4n;
    const text = (ws: boolean) => `model:\n  input: {shape: [6, 6], channels: 2}\n  weight_sharing: ${ws}\n  layers: [{conv: {channels: 4, kernel: 3, stride: 2}}]\n`;
    expect(parameterCount(load(text(true)))).toBe(one);
    expect(parameterCount(load(text(false)))).toBe(one * 9n);
  });

  test('a residual block counts both paths; the merge, pools and pointwise activations count nothing', () => {
    const main = 9n * 8n * 16n + 16n + 9n * 16n * 16n + 16n;
    const projection = 8n * 16n + 16n;
    expect(
      count('{shape: [8, 8], channels: 8}', [
        'residual: {layers: [{conv: {channels: 16, kernel: 3, stride: 2, activation: relu}}, {conv: {channels: 16, kernel: 3}}], shortcut: [{conv: {channels: 16, stride: 2}}], activation: relu}',
        'GlobalAveragePooling2D',
      ]),
    ).toBe(main + projection);
  });

  test('a concatenation widens what the next layer reads', () => {
    expect(count('{shape: [8, 8], channels: 3}', ['conv: {channels: 4, name: a}', 'conv: {channels: 6}', 'concat: {from: a}', 'conv: {channels: 2}'])).toBe(
      3n * 4n + 4n + 4n * 6n + 6n + 10n * 2n + 2n,
    );
  });

  test('a dense layer on the raw input reads every position; after flatten it reads the flattened width', () => {
    expect(count('{shape: [4, 4], channels: 3}', ['dense: {units: 5}'])).toBe(48n * 5n + 5n);
    expect(count('{shape: [4, 4], channels: 3}', ['flatten', 'dense: {units: 5}'])).toBe(48n * 5n + 5n);
  });

  test('normalisation: a scale and a shift per channel; PReLU a slope per channel; LRN nothing', () => {
    const conv = 3n * 8n + 8n;
    expect(count('{shape: [4, 4], channels: 3}', ['conv: {channels: 8, norm: batch}'])).toBe(conv + 16n);
    expect(count('{shape: [4, 4], channels: 3}', ['conv: {channels: 8}', 'PReLU', 'LocalResponseNorm: {size: 5}'])).toBe(conv + 8n);
  });

  test('without input.channels the first layer reads M values per position', () => {
    expect(count('{shape: [4, 4], representation: 5}', ['conv: {channels: 2}'])).toBe(5n * 2n + 2n);
  });
});
