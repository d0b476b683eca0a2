/**
 * The kind alias table: the spellings teams use for each layer (common practice), compared in
 * lower case without `_`/`-` and with a trailing 1d/2d dropped, each read as our kind with what
 * the spelling itself fixes (a max pool, a global pool, a depthwise conv, an LSTM cell). 3D kinds
 * and kinds whose function the surrogate does not model get their own messages.
 */
import { describe, expect, test } from 'vitest';
import { lookupKind } from '../../src/config/kind-names.js';
import { afterConv, bodyOf, codesAt, diagnostics, withConv } from './helpers.js';

describe('kind spellings', () => {
  test.each([
    ['Conv2d', 'conv'],
    ['Conv1D', 'conv'],
    ['convolution', 'conv'],
    ['CONV_2D', 'conv'],
    ['ConvTranspose2d', 'conv_transpose'],
    ['Conv2DTranspose', 'conv_transpose'],
    ['deconv', 'conv_transpose'],
    ['upconv', 'conv_transpose'],
    ['SeparableConv2D', 'separable_conv'],
    ['MaxPool2d', 'pool'],
    ['Linear', 'dense'],
    ['fc', 'dense'],
    ['UpSampling2D', 'upsample'],
    ['SimpleRNN', 'rnn'],
    ['RNN', 'rnn'],
    ['recurrent', 'recurrent'],
    ['LSTM', 'lstm'],
    ['CuDNNLSTM', 'lstm'],
    ['GRU', 'gru'],
    ['Embedding', 'embedding'],
    ['MultiheadAttention', 'attention'],
    ['MultiHeadAttention', 'attention'],
    ['CausalSelfAttention', 'attention'],
    ['TransformerEncoderLayer', 'transformer_block'],
    ['PositionalEncoding', 'position'],
    ['cls_token', 'class_token'],
    ['Concatenate', 'concat'],
    ['Add', 'add'],
    ['Sequential', 'sequence'],
    ['LeakyReLU', 'leaky_relu'],
    ['BatchNorm2d', 'batch_norm'],
    ['BatchNormalization', 'batch_norm'],
    ['bn', 'batch_norm'],
    ['LayerNorm', 'layer_norm'],
    ['GroupNorm', 'group_norm'],
    ['InstanceNorm1d', 'instance_norm'],
    ['LocalResponseNorm', 'local_response_norm'],
    ['SpatialDropout2D', 'spatial_dropout'],
    ['Dropout2d', 'dropout'],
    ['AlphaDropout', 'alpha_dropout'],
    ['Hardswish', 'hardswish'],
    ['Swish', 'silu'],
    ['WeightNorm', 'weight_norm'],
    ['Rescaling', 'scale'],
  ])('%s → %s', (written, canonical) => {
    const r = lookupKind(written);
    expect(r.ok && r.match.canonical).toBe(canonical);
  });
});

describe('what a spelling fixes, read through the loader', () => {
  test('pool kinds: mode and global', () => {
    const layers = afterConv([
      '{type: MaxPool2d, kernel_size: 2}',
      'MaxPooling2D: {pool_size: 2}',
      'AvgPool2d: {kernel_size: 2, stride: 1}',
      '{type: AveragePooling2D, pool_size: [2, 2]}',
      'pool: {window: 2, mode: sum}',
      'GlobalAveragePooling2D',
      'GlobalMaxPooling2D: {}',
      '{type: AdaptiveAvgPool2d, output_size: 1}',
      '{type: AdaptiveMaxPool2d, output_size: [1, 1]}',
    ], '[64, 64]');
    expect(layers.map((l) => (l.kind === 'pool' ? [l.mode, l.global, l.window, l.stride] : l.kind))).toEqual([
      ['max', false, [2, 2], [2, 2]],
      ['max', false, [2, 2], [2, 2]],
      ['average', false, [2, 2], [1, 1]],
      ['average', false, [2, 2], [2, 2]],
      ['sum', false, [2, 2], [2, 2]],
      ['average', true, [], []],
      ['max', true, [], []],
      ['average', true, [], []],
      ['max', true, [], []],
    ]);
  });

  test('pool modes by name: avg, mean, prod, lp', () => {
    const layers = afterConv(['pool: {window: 2, mode: avg}', 'pool: {window: 2, mode: Mean}', 'pool: {window: 2, mode: prod}', '{type: LPPool2d, kernel_size: 2}', 'pool: {window: 2}'], '[64, 64]');
    expect(layers.map((l) => l.kind === 'pool' && l.mode)).toEqual(['average', 'average', 'product', 'other', 'max']);
  });

  test('depthwise and separable convs', () => {
    const layers = afterConv(['{type: DepthwiseConv2D, kernel_size: 3, depth_multiplier: 2}', '{type: SeparableConv2D, filters: 16, kernel_size: 3, strides: 2}']);
    expect(layers.map(bodyOf)).toEqual([
      { kind: 'conv', kernel: [3, 3], stride: [1, 1], dilation: [1, 1], padding: { mode: 'same' }, groups: 'depthwise', depthMultiplier: 2 },
      { kind: 'conv', kernel: [3, 3], stride: [2, 2], dilation: [1, 1], padding: { mode: 'same' }, groups: 'depthwise', depthMultiplier: 1, bias: false },
      { kind: 'conv', channels: 16, kernel: [1, 1], stride: [1, 1], dilation: [1, 1], padding: { mode: 'valid' }, groups: 1, depthMultiplier: 1 },
    ]);
    // both layers of the separable conv point at its one entry
    expect(layers[1]!.span).toEqual(layers[2]!.span);
    expect(layers[1]!.path).toBe('/model/layers/2');
    expect(layers[2]!.path).toBe('/model/layers/2');
    expect(Object.keys(layers[1]!.fieldSpans).sort()).toEqual(['kernel', 'stride']);
    expect(Object.keys(layers[2]!.fieldSpans)).toEqual(['channels']);
  });

  test('upsample spellings and modes', () => {
    const layers = afterConv(['UpSampling2D', '{type: Upsample, scale_factor: 2, mode: bilinear}', 'upsample: {factor: [2, 3], interpolation: nearest}', 'UpsamplingBilinear2d: {scale_factor: 2}']);
    expect(layers.map(bodyOf)).toEqual([
      { kind: 'upsample', factor: [2, 2], mode: 'nearest' },
      { kind: 'upsample', factor: [2, 2], mode: 'linear' },
      { kind: 'upsample', factor: [2, 3], mode: 'nearest' },
      { kind: 'upsample', factor: [2, 2], mode: 'linear' },
    ]);
  });

  test('pointwise families', () => {
    const layers = afterConv(['BatchNorm2d: {num_features: 4, momentum: 0.1}', 'ELU', 'group_norm: {num_groups: 2}', 'weight_norm', 'softmax']);
    expect(layers.map((l) => l.kind === 'pointwise' && `${l.family}:${l.op}`)).toEqual([
      'normalisation:batch_norm',
      'activation:elu',
      'normalisation:group_norm',
      'scaling:weight_norm',
      'activation:softmax',
    ]);
  });
});

describe('kinds that are refused, with what to do instead', () => {
  test('3D kinds', () => {
    const d = diagnostics(withConv(['{type: Conv3d, out_channels: 2}', 'MaxPool3D: {pool_size: 2}', 'Conv3DTranspose: {filters: 2}']));
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/unsupported-3d@7:14', 'config/unsupported-3d@8:7', 'config/unsupported-3d@9:7']);
    expect(d[0]!.message).toBe("model.layers[1]: 'Conv3d' is a 3D layer; only 1D ([length]) and 2D ([height, width]) grids are supported");
  });

  test.each([
    ['LSTMCell', 'a single-step cell runs inside a loop'],
    ['ConvLSTM2D', 'convolutional recurrent layers are not read'],
    ['TransformerDecoderLayer', 'cross-attention reads a second sequence'],
    ['RotaryEmbedding', 'rotary and relative position schemes act inside attention'],
    ['Transformer', 'an encoder-decoder in some frameworks'],
    ['Bidirectional', 'bidirectional: true'],
  ])('%s is refused with what to write instead', (kind, why) => {
    const d = diagnostics(withConv([`{type: ${kind}, hidden_size: 8}`], '[16]'));
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/unsupported-kind@7:14']);
    expect(d[0]!.message).toContain(`'${kind}' layers are not read: `);
    expect(d[0]!.message).toContain(why);
  });

  test('adaptive pooling to a size other than 1: at the size, with the fixed-window hint', () => {
    const d = diagnostics(withConv(['{type: AdaptiveAvgPool2d, output_size: 7}']));
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/adaptive-pool@7:46']);
    expect(d[0]!.message).toContain('adaptive pooling is read only to size 1');
    expect(d[0]!.message).toContain('window = input size / output size');
  });

  test('adaptive pooling without a size', () => {
    expect(codesAt(withConv(['AdaptiveMaxPool2d']))).toEqual(['config/missing-field@7:7']);
  });

  test('a kind that contradicts its fields', () => {
    expect(codesAt(withConv(['MaxPool2d: {kernel_size: 2, mode: avg}', 'GlobalAveragePooling2D: {global: false}', '{type: DepthwiseConv2D, groups: 2}']))).toEqual([
      'config/conflicting-fields@7:41',
      'config/conflicting-fields@8:40',
      'config/conflicting-fields@9:39',
    ]);
  });

  test('an unknown kind far from every name has no suggestion', () => {
    const d = diagnostics(withConv(['frobnicate']));
    expect(d[0]!.message).toBe("model.layers[1]: unknown layer kind 'frobnicate'");
  });

  test('a misspelt pointwise kind is suggested as documented', () => {
    const d = diagnostics(withConv(['batchnrom']));
    expect(d[0]!.message).toBe("model.layers[1]: unknown layer kind 'batchnrom' (did you mean 'batch_norm'?)");
  });
});
