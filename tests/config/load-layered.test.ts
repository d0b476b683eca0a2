import { describe, expect, test } from 'vitest';
import { layered, loadLayered, codesAt, diagnostics } from './helpers.js';

const EXAMPLE = `model:
  input:
    shape: [224, 224]
    features: 3
  weight_sharing: false
  layers:
    - conv: {channels: 64, kernel: 3, stride: 2, padding: valid, name: stem}
    - pool: {window: 2}
    - recurrent: {hidden: 8}
    - pool: {global: true}
    - dense: {units: 10}
optimizer: {lr: 0.1}
`;

describe('a layered model', () => {
  test('loads with every field normalised', () => {
    // recurrent needs 1D, so use a 1D variant for the full field check
    const m = loadLayered(EXAMPLE.replace('[224, 224]', '[224]').replace('kernel: 3', 'kernel: [3]'));
    expect(m.file).toBe('test.yaml');
    expect(m.weightSharing).toBe(false);
    expect(m.input).toMatchObject({ shape: [224], channels: 3, featuresAsChannels: true });
    expect(m.input.representation).toBeUndefined();
    expect(m.output).toEqual({});
    expect(m.layers.map((l) => l.kind)).toEqual(['conv', 'pool', 'recurrent', 'pool', 'dense']);
    expect(m.layers.map((l) => l.inputs)).toEqual([[-1], [0], [1], [2], [3]]);
    expect(m.layers[0]).toEqual({
      kind: 'conv',
      index: 0,
      inputs: [-1],
      name: 'stem',
      channels: 64,
      kernel: [3],
      stride: [2],
      dilation: [1],
      padding: { mode: 'valid' },
      groups: 1,
      depthMultiplier: 1,
      path: '/model/layers/0',
      span: m.layers[0]!.span,
      fieldSpans: m.layers[0]!.fieldSpans,
    });
    expect(m.layers[1]).toMatchObject({ kind: 'pool', index: 1, mode: 'max', window: [2], stride: [2], padding: { mode: 'valid' }, global: false, path: '/model/layers/1' });
    expect(m.layers[2]).toMatchObject({ kind: 'recurrent', index: 2, hidden: 8, depth: 1 });
    expect(m.layers[3]).toMatchObject({ kind: 'pool', window: [], stride: [], global: true });
    expect(m.layers[4]).toMatchObject({ kind: 'dense', index: 4, units: 10, path: '/model/layers/4' });
    expect(m.layers[0]!.repeatIteration).toBeUndefined();
    expect('repeatIteration' in m.layers[0]!).toBe(false);
    expect(m.layers[1]!.name).toBeUndefined();
  });

  test('defaults: weight sharing on, kernel, stride and dilation 1, padding same, no groups, depth 1', () => {
    const m = loadLayered(layered('    - conv: {channels: 4}\n    - recurrent: {hidden: 2}\n', '[10]'));
    expect(m.weightSharing).toBe(true);
    expect(m.layers[0]).toMatchObject({ kernel: [1], stride: [1], dilation: [1], padding: { mode: 'same' }, groups: 1, depthMultiplier: 1 });
    expect('bias' in m.layers[0]!).toBe(false);
    expect(m.layers[1]).toMatchObject({ depth: 1 });
  });

  test('spans of the model, the input, a layer and its field values', () => {
    const m = loadLayered(EXAMPLE.replace('recurrent: {hidden: 8}', 'conv: {channels: 8}'));
    expect(m.span).toMatchObject({ line: 2, column: 3 });
    expect(m.input.span).toMatchObject({ line: 3, column: 5 });
    expect(m.input.fieldSpans['shape']).toMatchObject({ line: 3, column: 12, endLine: 3, endColumn: 22 });
    expect(m.input.fieldSpans['channels']).toMatchObject({ line: 4, column: 15 });
    const stem = m.layers[0]!;
    expect(stem.span).toMatchObject({ line: 7, column: 7 });
    expect(Object.keys(stem.fieldSpans).sort()).toEqual(['channels', 'kernel', 'name', 'padding', 'stride']);
    expect(stem.fieldSpans['channels']).toMatchObject({ line: 7, column: 24, endColumn: 26 });
    expect(stem.fieldSpans['kernel']).toMatchObject({ line: 7, column: 36 });
    expect(stem.fieldSpans['stride']).toMatchObject({ line: 7, column: 47 });
    expect(stem.fieldSpans['padding']).toMatchObject({ line: 7, column: 59 });
    expect(stem.fieldSpans['name']).toMatchObject({ line: 7, column: 72 });
    expect(m.layers[1]!.fieldSpans).toEqual({ window: expect.objectContaining({ line: 8, column: 22 }) });
    // offsets agree with the text
    const text = EXAMPLE.replace('recurrent: {hidden: 8}', 'conv: {channels: 8}');
    const s = stem.fieldSpans['channels']!;
    expect(text.slice(s.offset, s.endOffset)).toBe('64');
  });

  test('the rest of the file (optimizer, data) is ignored', () => {
    const m = loadLayered(layered('    - dense: {units: 1}\n', '[4]') + 'data: {path: /x, unknown_thing: [1, 2]}\nschedule: 3\n');
    expect(m.layers).toHaveLength(1);
  });
});

describe('per-dimension sizes', () => {
  test('2D: a scalar kernel, stride and window are broadcast to [h, w]', () => {
    const m = loadLayered(layered('    - conv: {channels: 4, kernel: 3, stride: 2}\n    - pool: {window: 2}\n'));
    expect(m.layers[0]).toMatchObject({ kernel: [3, 3], stride: [2, 2] });
    expect(m.layers[1]).toMatchObject({ window: [2, 2] });
  });

  test('2D: [h, w] lists are kept as given', () => {
    const m = loadLayered(layered('    - conv: {channels: 4, kernel: [3, 5], stride: [1, 2]}\n    - pool: {window: [2, 4]}\n'));
    expect(m.layers[0]).toMatchObject({ kernel: [3, 5], stride: [1, 2] });
    expect(m.layers[1]).toMatchObject({ window: [2, 4] });
  });

  test('1D: an integer or [n]', () => {
    const m = loadLayered(layered('    - conv: {channels: 4, kernel: 5}\n    - conv: {channels: 4, kernel: [7]}\n', '[100]'));
    expect(m.layers[0]).toMatchObject({ kernel: [5], stride: [1] });
    expect(m.layers[1]).toMatchObject({ kernel: [7] });
  });

  test('1D with [h, w] is rejected at the list', () => {
    expect(codesAt(layered('    - conv: {channels: 4, kernel: [3, 3]}\n', '[100]'))).toEqual(['config/dimension-mismatch@6:35']);
    expect(codesAt(layered('    - pool: {window: [2, 2]}\n', '[100]'))).toEqual(['config/dimension-mismatch@6:22']);
  });

  test('2D with [n] is rejected at the list', () => {
    const d = diagnostics(layered('    - conv: {channels: 4, stride: [2]}\n'));
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/dimension-mismatch@6:35']);
    expect(d[0]!.message).toContain('model.layers[0].conv.stride');
    expect(d[0]!.message).toContain('[32, 32]');
  });

  test('recurrent on a 2D input is rejected at the recurrent layer', () => {
    const d = diagnostics(layered('    - conv: {channels: 4}\n    - recurrent: {hidden: 8, depth: 2}\n'));
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/recurrent-needs-1d@7:7']);
    expect(d[0]!.message).toBe('layer 1 (line 7): a recurrent layer needs a 1D sequence, but the grid is [32, 32] here');
  });
});

describe('field aliases', () => {
  test.each([
    ['conv: {out_channels: 16}', 'channels', 16, 'out_channels'],
    ['conv: {filters: 16}', 'channels', 16, 'filters'],
    ['conv: {channels: 2, kernel_size: 5}', 'kernel', [5], 'kernel_size'],
    ['conv: {channels: 2, strides: 2}', 'stride', [2], 'strides'],
    ['conv: {channels: 2, dilation_rate: 2}', 'dilation', [2], 'dilation_rate'],
    ['recurrent: {hidden_size: 12}', 'hidden', 12, 'hidden_size'],
    ['recurrent: {hidden: 2, num_layers: 3}', 'depth', 3, 'num_layers'],
  ])('%s → %s', (layer, field, value, alias) => {
    const text = layered(`    - ${layer}\n`, '[8]');
    const l = loadLayered(text).layers[0]! as unknown as Record<string, unknown> & { fieldSpans: Record<string, { offset: number; endOffset: number }> };
    expect(l[field]).toEqual(value);
    expect(l[alias]).toBeUndefined();
    // the canonical field's span is the alias's value
    const span = l.fieldSpans[field]!;
    const aliasAt = text.indexOf(`${alias}: `) + alias.length + 2;
    expect(span.offset).toBe(aliasAt);
    expect(l.fieldSpans[alias]).toBeUndefined();
  });

  test('an alias together with its canonical name is an error at the later key', () => {
    expect(codesAt(layered('    - conv: {channels: 4, out_channels: 8}\n'))).toEqual(['config/alias-conflict@6:27']);
    expect(codesAt(layered('    - conv: {filters: 4, channels: 8}\n'))).toEqual(['config/alias-conflict@6:26']);
    expect(codesAt(layered('    - conv: {filters: 4, out_channels: 8}\n'))).toEqual(['config/alias-conflict@6:26']);
    expect(codesAt(layered('    - recurrent: {hidden: 4, depth: 1, num_layers: 2}\n', '[9]'))).toEqual(['config/alias-conflict@6:40']);
  });

  test('aliases are normalised inside repeat blocks too', () => {
    const m = loadLayered(layered('    - repeat:\n        times: 2\n        layers:\n          - conv: {filters: 3, kernel_size: 2}\n'));
    expect(m.layers.map((l) => (l.kind === 'conv' ? [l.channels, ...l.kernel] : []))).toEqual([
      [3, 2, 2],
      [3, 2, 2],
    ]);
  });
});
