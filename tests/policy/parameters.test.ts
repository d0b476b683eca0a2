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

  test('GPT-2 small (12 causal blocks of width 768, 12 heads, MLP 3072): 124,439,808 with the output map tied to the token embedding', () => {
    // Radford, Wu, Child, Luan, Amodei & Sutskever, "Language models are unsupervised multitask
    // learners" (2019), Table 2: the smallest model has 12 layers of width 768 over a 50,257-token
    // vocabulary and 1,024 positions. 124,439,808 is the common-practice count of that model; derived
    // here: 50257·768 + 1024·768 + 12·(2·2·768 + 4·768² + 4·768 + 2·768·3072 + 3072 + 768) + 2·768.
    const total = count('{shape: [1024], vocab_size: 50257}', [
      'token_embedding: {dim: 768}',
      'position: {max_position_embeddings: 1024}',
      'transformer_block: {n_head: 12, d_ff: 3072, causal: true, depth: 12}',
      'layer_norm',
    ]);
    expect(total).toBe(50257n * 768n + 1024n * 768n + 12n * (4n * 768n + 4n * 768n * 768n + 4n * 768n + 2n * 768n * 3072n + 3072n + 768n) + 2n * 768n);
    expect(total).toBe(124439808n);
  });

  test('ViT-B/16 (16×16 patches of a 224×224 image, class token, 12 blocks of width 768): 86,567,656', () => {
    // Dosovitskiy et al., "An image is worth 16x16 words: transformers for image recognition at
    // scale" (ICLR 2021), Table 1: ViT-Base has 12 layers, width 768, MLP 3072, 12 heads, 86M
    // parameters. Exact count derived here with a 1000-way head: the patch map 16·16·3·768 + 768,
    // the class token 768, 197·768 position vectors, 12 blocks, a final norm and 768·1000 + 1000.
    const total = count('{shape: [224, 224], channels: 3}', [
      'conv: {channels: 768, kernel: 16, stride: 16, padding: valid}',
      'cls_token',
      'pos_embed',
      'repeat: {times: 12, layers: [{transformer_block: {num_heads: 12, mlp_dim: 3072}}]}',
      'layer_norm',
      'dense: {units: 1000}',
    ]);
    expect(total).toBe(86567656n);
    expect(Math.floor(Number(total) / 1e6)).toBe(86);
  });

  test('one encoder layer of the base Transformer (width 512, MLP 2048, 8 heads): 3,152,384', () => {
    // Vaswani et al., "Attention is all you need" (NeurIPS 2017), Table 3 (base): d_model 512,
    // d_ff 2048, h 8. Derived here: 4·512² + 4·512 (attention) + 512·2048 + 2048 + 2048·512 + 512
    // (MLP) + 2·2·512 (two layer norms) — post-norm, as in the paper.
    expect(count('{shape: [16], representation: 512}', ['transformer_encoder_layer: {d_model: 512, nhead: 8, dim_feedforward: 2048, activation: relu, norm_first: false}'])).toBe(
      3152384n,
    );
  });
});

describe('sequence kinds (common practice: one bias per gate block)', () => {
  test('recurrent cells: g·(h·(d + h) + h) per level and direction, g = 4 (LSTM), 3 (GRU), 1', () => {
    const input = '{shape: [10], representation: 6}';
    expect(count(input, ['lstm: {hidden: 5}'])).toBe(4n * (5n * (6n + 5n) + 5n));
    expect(count(input, ['gru: {hidden: 5}'])).toBe(3n * (5n * (6n + 5n) + 5n));
    expect(count(input, ['SimpleRNN: {units: 5}'])).toBe(5n * (6n + 5n) + 5n);
    expect(count(input, ['recurrent: {hidden: 5, bias: false}'])).toBe(5n * (6n + 5n));
  });

  test('two levels in both directions: level 2 reads both directions (concatenated, or summed)', () => {
    const level = (d: bigint): bigint => 2n * 4n * (5n * (d + 5n) + 5n);
    expect(count('{shape: [10], representation: 6}', ['lstm: {hidden: 5, num_layers: 2, bidirectional: true}'])).toBe(level(6n) + level(10n));
    expect(count('{shape: [10], representation: 6}', ['lstm: {hidden: 5, num_layers: 2, bidirectional: true, merge_mode: sum}'])).toBe(level(6n) + level(5n));
    // the next layer reads 2h
    expect(count('{shape: [10], representation: 6}', ['gru: {hidden: 5, bidirectional: true}', 'dense: {units: 1}'])).toBe(2n * 3n * (5n * 11n + 5n) + 10n + 1n);
  });

  test('embedding V·d, learned positions n·d (fixed: none), class token d, attention 4·d·H·a + 3·H·a + d', () => {
    expect(count('{shape: [7], vocab_size: 30}', ['embedding: {dim: 4}'])).toBe(120n);
    expect(count('{shape: [7], vocab_size: 30}', ['embedding: {dim: 4}', 'position: {}'])).toBe(120n + 28n);
    expect(count('{shape: [7], vocab_size: 30}', ['embedding: {dim: 4}', 'positional_encoding'])).toBe(120n);
    expect(count('{shape: [2, 3], representation: 4}', ['cls_token', 'position'])).toBe(4n + 7n * 4n);
    // heads of width 5 over width 4: the maps are 4 × (2·5) each
    expect(count('{shape: [7], representation: 4}', ['attention: {heads: 2, head_dim: 5}'])).toBe(4n * 4n * 10n + 3n * 10n + 4n);
    expect(count('{shape: [7], representation: 4}', ['attention: {heads: 2, head_dim: 5, bias: false}'])).toBe(4n * 4n * 10n);
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
