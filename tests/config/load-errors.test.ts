import { describe, expect, test } from 'vitest';
import { loadConfigText } from '../../src/config/load-config.js';
import { codesAt, diagnostics, layered } from './helpers.js';

describe('malformed YAML', () => {
  test('an unclosed flow sequence is a config/yaml diagnostic at its position', () => {
    expect(codesAt('model:\n  input: [1, 2\n  x: 1\n')).toEqual(['config/yaml@3:3']);
  });

  test('a badly indented block (yaml reports the start of the line)', () => {
    expect(codesAt('model:\n  input:\n    shape: [4]\n   features: 3\n')).toEqual(['config/yaml@4:1']);
  });

  test('several documents in one file', () => {
    expect(codesAt('model: {}\n---\nmodel: {}\n')).toEqual(['config/yaml@2:1']);
  });

  test('a duplicate key names the key and its first line', () => {
    const d = diagnostics('model:\n  input: 1\n  layers: []\n  input: 2\n');
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/duplicate-key@4:3']);
    expect(d[0]!.message).toBe("the key 'input' appears twice in one mapping (first on line 2); keep one");
  });

  test('a duplicate key outside the model is still an error', () => {
    expect(codesAt(layered('    - dense: {units: 1}\n', '[4]') + 'data: {a: 1, a: 2}\n')).toEqual(['config/duplicate-key@7:14']);
  });

  test('YAML errors stop the load before any model check', () => {
    expect(codesAt('model:\n  layers: [\n')).toEqual(['config/yaml@3:1']);
  });
});

describe('unknown names', () => {
  test("a misspelt field: unknown field with did-you-mean, and no extra 'missing' error", () => {
    const d = diagnostics(layered('    - conv: {chanels: 64}\n'));
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/unknown-field@6:14']);
    expect(d[0]!.message).toBe(
      "unknown field 'chanels' in model.layers[0].conv (did you mean 'channels'?); it reads channels, kernel, stride, dilation, padding, groups, depthwise, depth_multiplier, bias, norm, batch_norm, layer_norm, activation, dropout, name",
    );
  });

  test('a misspelt alias is suggested as written', () => {
    const d = diagnostics(layered('    - conv: {channels: 2, kernal_size: 3}\n'));
    expect(d.map((x) => x.code)).toEqual(['config/unknown-field']);
    expect(d[0]!.message).toContain("did you mean 'kernel_size'?");
  });

  test('an unknown field far from every name has no suggestion', () => {
    const d = diagnostics(layered('    - dense: {units: 2, xyzzy: 1}\n'));
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/unknown-field@6:25']);
    expect(d[0]!.message).not.toContain('did you mean');
  });

  test('unknown fields at the model and input level', () => {
    const text = 'model:\n  input: {shape: [4], features: 2, featurs: 3}\n  layer: []\n  layers: [{dense: {units: 1}}]\n';
    const d = diagnostics(text);
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/unknown-field@2:36', 'config/unknown-field@3:3']);
    expect(d[0]!.message).toContain("'featurs' in model.input (did you mean 'features'?)");
    expect(d[1]!.message).toContain("'layer' in model (did you mean 'layers'?)");
  });

  test('an unknown layer kind with did-you-mean', () => {
    const d = diagnostics(layered('    - dense: {units: 4}\n    - convv: {channels: 3}\n'));
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/unknown-layer-kind@7:7']);
    expect(d[0]!.message).toBe("model.layers[1]: unknown layer kind 'convv' (did you mean 'conv'?)");
  });

  test('two kinds in one layer, or none, give one message each', () => {
    expect(codesAt(layered('    - conv: {channels: 1}\n      pool: {window: 2}\n    - {}\n'))).toEqual(['config/layer-kind@6:7', 'config/layer-kind@8:7']);
  });

  test('a field put next to the kind instead of inside it', () => {
    const d = diagnostics(layered('    - conv: {channels: 1}\n      name: stem\n'));
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/layer-kind@7:7']);
    expect(d[0]!.message).toBe(
      "model.layers[0] has 'name' beside its kind 'conv'; fields go inside the kind ('- conv: {name: …}') or name the kind with 'type: conv'",
    );
  });
});

describe('sizes', () => {
  test.each([
    ['channels: 0', 'config/invalid-number', 24, 'model.layers[0].conv.channels must be a positive integer, got 0'],
    ['channels: -3', 'config/invalid-number', 24, 'model.layers[0].conv.channels must be a positive integer, got -3'],
    ['channels: 2.5', 'config/invalid-number', 24, 'model.layers[0].conv.channels must be a positive integer, got 2.5'],
    ['channels: "64"', 'config/type', 24, 'model.layers[0].conv.channels must be a positive integer, got the string "64"'],
    ['channels: 4, kernel: 0', 'config/invalid-number', 35, 'model.layers[0].conv.kernel must be a positive integer, got 0'],
    ['channels: 4, stride: [1, 0]', 'config/invalid-number', 39, 'model.layers[0].conv.stride[1] must be a positive integer, got 0'],
    [
      'channels: 4, kernel: [3, 3, 3]',
      'config/dimension-mismatch',
      35,
      'model.layers[0].conv.kernel has 3 entries, but model.input.shape is [32, 32] (2D); give one integer for every axis or [height, width]',
    ],
  ])('conv {%s}', (fields, code, column, message) => {
    const d = diagnostics(layered(`    - conv: {${fields}}\n`));
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual([`${code}@6:${column}`]);
    expect(d[0]!.message).toBe(message);
  });

  test('an alias field is named as written', () => {
    const d = diagnostics(layered('    - conv: {out_channels: 0}\n'));
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/invalid-number@6:28']);
    expect(d[0]!.message).toBe('model.layers[0].conv.out_channels must be a positive integer, got 0');
  });

  test('input shape and features', () => {
    const text = 'model:\n  input:\n    shape: [0, 4.5, 3, 2]\n    features: -1\n  layers: [{dense: {units: 1}}]\n';
    expect(codesAt(text)).toEqual([
      'config/invalid-length@3:12',
      'config/invalid-number@3:13',
      'config/invalid-number@3:16',
      'config/invalid-number@4:15',
    ]);
  });

  test('dense, recurrent and repeat sizes', () => {
    const text = layered('    - recurrent: {hidden: 0, depth: -2}\n    - repeat: {times: 0, layers: [{dense: {units: 1.5}}]}\n', '[8]');
    expect(codesAt(text)).toEqual([
      'config/invalid-number@6:27',
      'config/invalid-number@6:37',
      'config/invalid-number@7:23',
      'config/invalid-number@7:51',
    ]);
  });
});

describe('structure', () => {
  test('an empty layers list', () => {
    const d = diagnostics('model:\n  input: {shape: [4], features: 2}\n  layers: []\n');
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/empty-layers@3:11']);
    expect(d[0]!.message).toBe('model.layers is empty; list at least one layer');
  });

  test('layers that is not a list, and a layer that is neither a mapping nor a kind name', () => {
    expect(codesAt('model:\n  input: {shape: [4], features: 2}\n  layers: conv\n')).toEqual(['config/type@3:11']);
    const d = diagnostics(layered('    - conv\n    - [1, 2]\n    - 7\n    -\n'));
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual([
      'config/missing-field@6:7',
      'config/type@7:7',
      'config/type@8:7',
      'config/type@9:6',
    ]);
    expect(d[0]!.message).toBe("model.layers[0] is missing 'channels' (output channels)");
    expect(d[1]!.message).toBe(
      "model.layers[1] must be a layer, got a list; write a layer as '- conv: {channels: 64}', '- {type: Conv2d, out_channels: 64}' or '- relu'",
    );
    expect(d[2]!.message).toContain('model.layers[2] must be a layer, got 7');
  });

  test('a layer body that is not a mapping', () => {
    const d = diagnostics(layered('    - conv: 64\n    - pool: [2, 2]\n'));
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/type@6:13', 'config/type@7:13']);
    expect(d[0]!.message).toBe("model.layers[0].conv must be a mapping of the layer's fields, got 64; e.g. '- conv: {…}'");
  });

  test('a missing required field names it', () => {
    const d = diagnostics(layered('    - dense: {name: head}\n'));
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/missing-field@6:14']);
    expect(d[0]!.message).toBe("model.layers[0].dense is missing 'units' (output units)");
  });

  test('padding must be a known word or zeros per side', () => {
    const d = diagnostics(layered('    - conv: {channels: 1, padding: vald}\n'));
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/invalid-value@6:36']);
    expect(d[0]!.message).toContain("(did you mean 'valid'?)");
  });

  test('pool needs a window or global: true, not both', () => {
    expect(codesAt(layered('    - pool: {}\n    - pool: {window: 2, global: true}\n    - pool: {global: false}\n'))).toEqual([
      'config/missing-field@6:13',
      'config/conflicting-fields@7:14',
      'config/missing-field@8:13',
    ]);
  });

  test('pool with global: false and a window is a windowed pool', () => {
    const r = loadConfigText(layered('    - conv: {channels: 2}\n    - pool: {window: 2, global: false}\n'), 't.yaml');
    expect(r.ok && r.model.kind === 'layered' && r.model.layers[1]).toMatchObject({ window: [2, 2], stride: [2, 2], global: false });
  });

  test('the model needs input+layers or network, not both', () => {
    expect(codesAt('model: {}\n')).toEqual(['config/model-kind@1:8']);
    const d = diagnostics('model:\n  network: {shape: [1], tensors: [{name: a, legs: [{position: 0, dim: 2}]}]}\n  layers: [{dense: {units: 1}}]\n');
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/model-kind@2:3']);
    expect(d[0]!.message).toContain("has both 'network' and 'layers'");
  });

  test('a model that is not a mapping', () => {
    expect(codesAt('model: 3\n')).toEqual(['config/type@1:8']);
    expect(codesAt('model:\n')).toEqual(['config/type@1:7']);
  });

  test('weight_sharing must be a boolean', () => {
    expect(codesAt('model:\n  input: {shape: [4], features: 2}\n  weight_sharing: "yes"\n  layers: [{dense: {units: 1}}]\n')).toEqual(['config/type@3:19']);
  });

  test('a layer name must be a non-empty string', () => {
    expect(codesAt(layered('    - dense: {units: 1, name: ""}\n    - dense: {units: 1, name: 7}\n'))).toEqual([
      'config/invalid-value@6:31',
      'config/type@7:31',
    ]);
  });
});

describe('collecting', () => {
  test('all problems are reported, sorted by position', () => {
    const text = layered(
      '    - conv: {channels: 0, kernl: 3}\n    - convv: {}\n    - pool: {window: [2, 2, 2]}\n    - recurrent: {hidden: 4}\n    - dense: {units: x}\n',
    );
    expect(codesAt(text)).toEqual([
      'config/invalid-number@6:24',
      'config/unknown-field@6:27',
      'config/unknown-layer-kind@7:7',
      'config/dimension-mismatch@8:22',
      'config/type@10:22',
    ]);
  });

  test('shape problems are reported once the layers read: a recurrent layer on a 2D grid', () => {
    expect(codesAt(layered('    - conv: {channels: 1}\n    - recurrent: {hidden: 4}\n'))).toEqual(['config/recurrent-needs-1d@7:7']);
  });

  test('the same input gives the same list every time', () => {
    const text = layered('    - conv: {channels: 0, kernl: 3, stride: -1, padding: x}\n');
    const a = codesAt(text);
    expect(codesAt(text)).toEqual(a);
    expect(a).toHaveLength(4);
  });

  test('a layer reused through a YAML alias reports the typo once, at the anchor', () => {
    const text = 'blocks:\n  c: &c {conv: {chanels: 3}}\nmodel:\n  input: {shape: [4], features: 2}\n  layers: [*c, *c]\n';
    expect(codesAt(text)).toEqual(['config/unknown-field@2:17']);
  });
});
