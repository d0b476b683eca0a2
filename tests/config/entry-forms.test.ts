/**
 * The forms a layer entry takes, as teams write them (common practice): the kind as the single
 * key, a `type`/`layer`/`kind` key, a bare kind name, a kind with an empty or null body, and a
 * scalar body for activations and dropout. Each form must give exactly the layer the canonical
 * form gives.
 */
import { describe, expect, test } from 'vitest';
import { afterConv, bodyOf, codesAt, diagnostics, withConv } from './helpers.js';

describe('entry forms read as the canonical form', () => {
  const canonical = afterConv(['conv: {channels: 32, kernel: 3}']).map(bodyOf);

  test('the canonical form: the kind as the only key', () => {
    expect(canonical).toEqual([
      { kind: 'conv', channels: 32, kernel: [3, 3], stride: [1, 1], dilation: [1, 1], padding: { mode: 'same' }, groups: 1, depthMultiplier: 1 },
    ]);
  });

  test.each(['{type: Conv2d, out_channels: 32, kernel_size: 3}', '{layer: conv, channels: 32, kernel: 3}', '{kind: Convolution, filters: 32, kernelSize: 3}'])(
    'a kind key: %s',
    (entry) => {
      expect(afterConv([entry]).map(bodyOf)).toEqual(canonical);
    },
  );

  test('a bare kind name, and a kind with an empty or null body', () => {
    const relu = { kind: 'pointwise', family: 'activation', op: 'relu' };
    expect(afterConv(['relu', 'relu: {}', 'relu: null', 'relu:', 'ReLU']).map(bodyOf)).toEqual([relu, relu, relu, relu, relu]);
    expect(afterConv(['flatten']).map(bodyOf)).toEqual([{ kind: 'flatten' }]);
  });

  test('activation layers: a scalar body, fn, and the kind-key form with an activation field', () => {
    const ops = afterConv(['activation: gelu', 'activation: {fn: tanh}', '{type: Activation, activation: swish}', 'activation: linear']).map(bodyOf);
    expect(ops).toEqual([
      { kind: 'pointwise', family: 'activation', op: 'gelu' },
      { kind: 'pointwise', family: 'activation', op: 'tanh' },
      { kind: 'pointwise', family: 'activation', op: 'silu' },
      { kind: 'pointwise', family: 'activation', op: 'identity' },
    ]);
  });

  test('dropout layers: a scalar rate, p, rate', () => {
    const drop = { kind: 'pointwise', family: 'dropout', op: 'dropout' };
    expect(afterConv(['dropout: 0.1', '{type: Dropout, p: 0.5}', 'dropout: {rate: 0.2}']).map(bodyOf)).toEqual([drop, drop, drop]);
  });

  test('the span of a bare name is the name; of a kind-key entry, the whole mapping', () => {
    const text = withConv(['relu', '{type: Linear, out_features: 3}']);
    const [relu, dense] = afterConv(['relu', '{type: Linear, out_features: 3}']);
    expect(text.slice(relu!.span.offset, relu!.span.endOffset)).toBe('relu');
    expect(text.slice(dense!.span.offset, dense!.span.endOffset)).toBe('{type: Linear, out_features: 3}');
    expect(text.slice(dense!.fieldSpans['units']!.offset, dense!.fieldSpans['units']!.endOffset)).toBe('3');
    expect(dense!.path).toBe('/model/layers/2');
  });
});

describe('entry form errors', () => {
  test('a kind key that is not a name', () => {
    expect(codesAt(withConv(['{type: 3, channels: 2}', '{type: [conv], channels: 2}']))).toEqual(['config/type@7:14', 'config/type@8:14']);
  });

  test('two kind keys', () => {
    const d = diagnostics(withConv(['{type: conv, kind: conv, channels: 2}']));
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/layer-kind@7:20']);
    expect(d[0]!.message).toBe("model.layers[1] gives its kind 2 times ('type', 'kind'); keep one");
  });

  test('fields without a kind', () => {
    const d = diagnostics(withConv(['{out_channels: 2, kernel_size: 3}']));
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/layer-kind@7:7']);
    expect(d[0]!.message).toBe("model.layers[1] ('out_channels', 'kernel_size') names no layer kind; give it with 'type', e.g. '- {type: conv, channels: 64}'");
  });

  test('an unknown kind in the kind-key form is reported at the kind, with did-you-mean', () => {
    const d = diagnostics(withConv(['{type: Conv2dd, out_channels: 2}']));
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/unknown-layer-kind@7:14']);
    expect(d[0]!.message).toBe("model.layers[1]: unknown layer kind 'Conv2dd' (did you mean 'conv'?)");
  });

  test('a scalar body where the kind needs fields', () => {
    expect(codesAt(withConv(['relu: 3', 'dense: 10']))).toEqual(['config/type@7:13', 'config/type@8:14']);
  });

  test('an empty bare name', () => {
    expect(codesAt(withConv(['""']))).toEqual(['config/type@7:7']);
  });
});
