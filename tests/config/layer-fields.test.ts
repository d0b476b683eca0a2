/**
 * Field spellings per kind (the ones common in ML configs: common practice), the fields accepted
 * and ignored, the shortcut fields that become pointwise layers, and the errors of each, at the
 * exact place they are written.
 */
import { describe, expect, test } from 'vitest';
import type { Layer } from '../../src/config/model.js';
import { inferShapes } from '../../src/config/model-shapes.js';
import { afterConv, bodyOf, codesAt, diagnostics, loadLayered, withConv } from './helpers.js';

const value = (layer: Layer, field: string): unknown => (layer as unknown as Record<string, unknown>)[field];

describe('field aliases per kind', () => {
  test.each([
    ['conv: {out_channels: 8}', 'channels', 8],
    ['conv: {filters: 8}', 'channels', 8],
    ['conv: {channels: 8, kernel_size: [3, 5]}', 'kernel', [3, 5]],
    ['conv: {channels: 8, strides: 2}', 'stride', [2, 2]],
    ['conv: {channels: 8, dilation_rate: 2}', 'dilation', [2, 2]],
    ['conv: {channels: 8, padding: valid}', 'padding', { mode: 'valid' }],
    ['conv: {channels: 8, padding: 1}', 'padding', { mode: 'explicit', amount: [1, 1] }],
    ['conv: {channels: 8, padding: [0, 2]}', 'padding', { mode: 'explicit', amount: [0, 2] }],
    ['conv: {channels: 8, groups: 2}', 'groups', 2],
    ['conv: {channels: 8, groups: depthwise}', 'groups', 'depthwise'],
    ['conv: {depthwise: true, depth_multiplier: 2}', 'depthMultiplier', 2],
    ['conv: {channels: 8, use_bias: false}', 'bias', false],
    ['conv_transpose: {out_channels: 8, kernel_size: 2, strides: 2}', 'stride', [2, 2]],
    ['conv_transpose: {channels: 8, kernel: 3, stride: 2, padding: 1, output_padding: 1}', 'outputPadding', [1, 1]],
    ['pool: {pool_size: 3}', 'window', [3, 3]],
    ['pool: {kernel_size: 3, strides: 1}', 'stride', [1, 1]],
    ['pool: {window: 3, stride: 1, padding: same}', 'padding', { mode: 'same' }],
    ['dense: {out_features: 8}', 'units', 8],
    ['dense: {features: 8}', 'units', 8],
    ['dense: {units: 8, in_features: 99}', 'units', 8],
    ['upsample: {scale_factor: 3}', 'factor', [3, 3]],
    ['upsample: {factor: 2, interpolation: bilinear}', 'mode', 'linear'],
  ])('%s → %s', (entry, field, expected) => {
    expect(value(afterConv([entry], '[16, 16]')[0]!, field)).toEqual(expected);
  });

  test.each([
    ['recurrent: {hidden_size: 8}', 'hidden', 8],
    ['recurrent: {units: 8}', 'hidden', 8],
    ['recurrent: {hidden: 8, num_layers: 2}', 'depth', 2],
    ['conv: {channels: 8, padding: causal, dilation: 4}', 'padding', { mode: 'causal' }],
  ])('1D: %s → %s', (entry, field, expected) => {
    expect(value(afterConv([entry], '[16]')[0]!, field)).toEqual(expected);
  });

  test('keys are compared without case, `_` and `-`: camelCase and kebab-case spellings', () => {
    const [l] = afterConv(['conv: {outChannels: 8, kernelSize: 3, dilation-rate: 2}'], '[16, 16]');
    expect(l).toMatchObject({ channels: 8, kernel: [3, 3], dilation: [2, 2] });
    expect(Object.keys(l!.fieldSpans).sort()).toEqual(['channels', 'dilation', 'kernel']);
  });

  test('the canonical field span is the alias value as written', () => {
    const text = withConv(['{type: Conv2d, out_channels: 16, kernel_size: 5}']);
    const [l] = afterConv(['{type: Conv2d, out_channels: 16, kernel_size: 5}']);
    const s = l!.fieldSpans['channels']!;
    expect(text.slice(s.offset, s.endOffset)).toBe('16');
    expect(s).toMatchObject({ line: 7, column: 36 });
  });

  test('accepted and ignored fields leave no trace: in_channels, initialisers, data_format, framework flags', () => {
    const [conv, pool, rnn] = afterConv(
      [
        '{type: Conv2d, in_channels: 4, out_channels: 8, kernel_size: 3, kernel_initializer: he_normal, data_format: channels_last, trainable: true}',
        '{type: MaxPool2d, kernel_size: 2, count_include_pad: false, ceil_mode: false}',
      ],
      '[16, 16]',
    );
    expect(bodyOf(conv!)).toEqual({ kind: 'conv', channels: 8, kernel: [3, 3], stride: [1, 1], dilation: [1, 1], padding: { mode: 'same' }, groups: 1, depthMultiplier: 1 });
    expect(Object.keys(conv!.fieldSpans).sort()).toEqual(['channels', 'kernel']);
    expect(pool).toMatchObject({ kind: 'pool', window: [2, 2] });
    expect(rnn).toBeUndefined();
    const [r] = afterConv(['{type: RNN, input_size: 4, hidden_size: 8, batch_first: true, nonlinearity: tanh, dropout: 0.2, bidirectional: false}'], '[16]');
    expect(bodyOf(r!)).toEqual({ kind: 'recurrent', hidden: 8, depth: 1, cell: 'rnn', bidirectional: false, merge: 'concat', sequence: true });
  });
});

describe('field errors, at the field', () => {
  test('an alias together with its canonical name, or two aliases', () => {
    expect(codesAt(withConv(['conv: {channels: 4, filters: 8}', '{type: Linear, units: 2, out_features: 3}']))).toEqual([
      'config/alias-conflict@7:27',
      'config/alias-conflict@8:32',
    ]);
    expect(diagnostics(withConv(['conv: {channels: 4, filters: 8}']))[0]!.message).toBe(
      "model.layers[1].conv gives 'channels' and 'filters', which both mean 'channels'; keep only one of them",
    );
  });

  test('an unknown field suggests the nearest spelling of this kind and lists what it reads', () => {
    const d = diagnostics(withConv(['pool: {pool_sise: 2}']));
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/unknown-field@7:14']);
    expect(d[0]!.message).toBe(
      "unknown field 'pool_sise' in model.layers[1].pool (did you mean 'pool_size'?); it reads window, stride, padding, mode, global, output_size, ceil_mode, name",
    );
  });

  test("upsample 'size' is refused: it means a factor in some frameworks and an output size in others", () => {
    const d = diagnostics(withConv(['upsample: {size: 2}']));
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/unsupported-field@7:18']);
    expect(d[0]!.message).toContain("write 'factor'");
  });

  test('fields read only at one value', () => {
    expect(codesAt(withConv(['pool: {window: 2, ceil_mode: true}', 'upsample: {mode: linear, align_corners: true}']))).toEqual([
      'config/unsupported-value@7:36',
      'config/unsupported-value@8:47',
    ]);
    expect(codesAt(withConv(['recurrent: {hidden: 2, go_backwards: true}', 'attention: {heads: 2, add_bias_kv: true}'], '[8]'))).toEqual([
      'config/unsupported-value@7:44',
      'config/unsupported-value@8:42',
    ]);
  });

  test('bad values: padding word, groups, pool mode, upsample mode, depth multiplier without depthwise', () => {
    const d = diagnostics(
      withConv([
        'conv: {channels: 2, padding: smae}',
        'conv: {channels: 2, groups: all}',
        'pool: {window: 2, mode: maks}',
        'upsample: {mode: bicubic}',
        'conv: {channels: 2, depth_multiplier: 2}',
        'conv: {channels: 2, padding: -1}',
      ]),
    );
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual([
      'config/invalid-value@7:36',
      'config/type@8:35',
      'config/invalid-value@9:31',
      'config/invalid-value@10:24',
      'config/conflicting-fields@11:45',
      'config/invalid-number@12:36',
    ]);
    expect(d[0]!.message).toBe("model.layers[1].conv.padding must be one of 'same', 'valid', 'causal', got the string \"smae\" (did you mean 'same'?)");
    expect(d[2]!.message).toContain("(did you mean 'max'?)");
  });

  test('a transposed conv: a padding word cannot be combined with output_padding', () => {
    expect(codesAt(withConv(['conv_transpose: {channels: 2, kernel: 2, stride: 2, padding: same, output_padding: 1}']))).toEqual(['config/conflicting-fields@7:90']);
  });

  test('required fields', () => {
    expect(codesAt(withConv(['conv: {kernel: 3}', 'dense: {}', 'conv_transpose: {kernel: 2}', 'separable_conv: {kernel: 3}', 'activation: {}']))).toEqual([
      'config/missing-field@7:13',
      'config/missing-field@8:14',
      'config/missing-field@9:23',
      'config/missing-field@10:23',
      'config/missing-field@11:19',
    ]);
  });
});

describe('transposed conv padding words', () => {
  test('same gives an output of n·stride; valid removes nothing', () => {
    // derived here from the output length (n−1)·s − 2p + e + q: same needs −2p + e + q = s
    const entries = ['conv_transpose: {channels: 2, kernel: 3, stride: 2, padding: same}', 'conv_transpose: {channels: 2, kernel: 3, stride: 2, padding: valid}', 'conv_transpose: {channels: 2, kernel: 1, stride: 3, padding: valid}'];
    const [same, valid, small] = afterConv(entries, '[5, 5]');
    expect([same, valid, small].map((l) => (l?.kind === 'conv-transpose' ? [l.padding, l.outputPadding] : undefined))).toEqual([
      [[1, 1], [1, 1]],
      [[0, 0], [0, 0]],
      [[0, 0], [2, 2]],
    ]);
    // 5 → 5·2 = 10 (same); 10 → 9·2 + 3 = 21 (valid); 21 → 21·3 = 63 (valid, kernel below the stride)
    const shapes = inferShapes(loadLayered(withConv(entries, '[5, 5]')));
    expect(shapes.ok && shapes.shapes.layers.slice(1).map((l) => l.shape[0])).toEqual([10, 21, 63]);
  });
});

describe('shortcut fields become pointwise layers after the layer', () => {
  test('norm → activation → dropout, whatever order the YAML gives them in', () => {
    const layers = afterConv(['conv: {channels: 8, dropout: 0.1, activation: relu, norm: batch}']);
    expect(layers.map((l) => (l.kind === 'pointwise' ? l.op : l.kind))).toEqual(['conv', 'batch_norm', 'relu', 'dropout']);
    expect(layers.map((l) => l.inputs)).toEqual([[0], [1], [2], [3]]);
  });

  test('each has the span of its field (key and value) and the path of its value', () => {
    const text = withConv(['{type: Dense, units: 10, activation: softmax}']);
    const [, act] = afterConv(['{type: Dense, units: 10, activation: softmax}']);
    expect(text.slice(act!.span.offset, act!.span.endOffset)).toBe('activation: softmax');
    expect(act!.span).toMatchObject({ line: 7, column: 32 });
    expect(act!.path).toBe('/model/layers/1/activation');
    expect(act!.fieldSpans['activation']).toMatchObject({ line: 7, column: 44 });
    expect(act!.name).toBeUndefined();
  });

  test('the spellings of a normalisation', () => {
    const ops = (entry: string) => afterConv([entry]).slice(1).map((l) => l.kind === 'pointwise' && l.op);
    expect(ops('conv: {channels: 8, batch_norm: true}')).toEqual(['batch_norm']);
    expect(ops('conv: {channels: 8, use_bn: true}')).toEqual(['batch_norm']);
    expect(ops('conv: {channels: 8, normalization: layer}')).toEqual(['layer_norm']);
    expect(ops('conv: {channels: 8, norm: GroupNorm}')).toEqual(['group_norm']);
    expect(ops('conv: {channels: 8, layer_norm: true}')).toEqual(['layer_norm']);
  });

  test('values that mean none', () => {
    const layers = afterConv(['conv: {channels: 8, activation: linear, norm: none, dropout: 0, batch_norm: false}', '{type: Dense, units: 2, activation: null}']);
    expect(layers.map((l) => l.kind)).toEqual(['conv', 'dense']);
  });

  test('residual and branches blocks take them after their merge', () => {
    const layers = afterConv(['residual: {layers: [{conv: {channels: 4}}], activation: relu}']);
    expect(layers.map((l) => (l.kind === 'pointwise' ? l.op : l.kind))).toEqual(['conv', 'merge', 'relu']);
  });

  test('errors: two normalisations, a normalisation as activation, a misspelt one, a rate of 1', () => {
    const d = diagnostics(
      withConv(['conv: {channels: 2, norm: batch, batch_norm: true}', 'conv: {channels: 2, activation: batch_norm}', 'conv: {channels: 2, norm: batc}', 'conv: {channels: 2, dropout: 1}', 'conv: {channels: 2, activation: rleu}']),
    );
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual([
      'config/conflicting-fields@7:40',
      'config/invalid-value@8:39',
      'config/invalid-value@9:33',
      'config/invalid-number@10:36',
      'config/invalid-value@11:39',
    ]);
    expect(d[1]!.message).toBe('model.layers[2].conv.activation names batch_norm, which is a normalisation layer, not an activation');
    expect(d[2]!.message).toContain("(did you mean 'batch'?)");
    expect(d[4]!.message).toContain("(did you mean 'relu'?)");
  });

  test('pool, upsample, flatten and pointwise layers take no shortcut fields', () => {
    expect(codesAt(withConv(['pool: {window: 2, activation: relu}', 'flatten: {dropout: 0.5}']))).toEqual(['config/unknown-field@7:25', 'config/unknown-field@8:17']);
  });
});
