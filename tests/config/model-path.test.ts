import { describe, expect, test } from 'vitest';
import { formatPointer, parsePointer } from '../../src/config/json-pointer.js';
import { codesAt, diagnostics, loadLayered } from './helpers.js';

const TRAINING = `optimizer:
  name: adam
  lr: 0.001
data:
  path: /data/scans
  batch: 32
training:
  epochs: 10
  network:
    input: {shape: [8], features: 2}
    layers:
      - conv: {channels: 4}
      - repeat: {times: 2, layers: [{dense: {units: 3}}]}
`;

describe('the model path', () => {
  test('a custom pointer into a training config', () => {
    const m = loadLayered(TRAINING, { modelPath: '/training/network' });
    expect(m.input.shape).toEqual([8]);
    expect(m.layers.map((l) => l.path)).toEqual([
      '/training/network/layers/0',
      '/training/network/layers/1/repeat/layers/0',
      '/training/network/layers/1/repeat/layers/0',
    ]);
    expect(m.span).toMatchObject({ line: 10, column: 5 });
  });

  test('messages name fields from the document root', () => {
    const d = diagnostics(TRAINING.replace('channels: 4', 'channels: 0'), { modelPath: '/training/network' });
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/invalid-number@12:26']);
    expect(d[0]!.message).toBe('training.network.layers[0].conv.channels must be a positive integer, got 0');
  });

  test('the default /model does not resolve in a training config: error at the deepest node, suggesting --model-path', () => {
    const d = diagnostics(TRAINING);
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/model-missing@1:1']);
    expect(d[0]!.message).toContain("the model path '/model' does not resolve");
    expect(d[0]!.message).toContain('--model-path');
    expect(d[0]!.message).toContain("'optimizer', 'data', 'training'");
    // the hint names where this file holds an architecture, not a made-up example
    expect(d[0]!.message).toContain('pass --model-path /training/network');
    expect(d[0]!.message).not.toContain('/training/model');
  });

  test('without a mapping of layers, the hint builds the pointer from the keys the file has', () => {
    const d = diagnostics('optimizer: {lr: 0.1}\nexperiment: {epochs: 3}\n');
    expect(d[0]!.message).toContain('e.g. --model-path /optimizer');
    expect(d[0]!.message).not.toContain('/training/model');
  });

  test('a missing key deeper down points at its parent and suggests a close key', () => {
    const d = diagnostics(TRAINING, { modelPath: '/training/netwrk' });
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/model-missing@8:3']);
    expect(d[0]!.message).toContain("training has no key 'netwrk' (did you mean 'network'?)");
  });

  test('a pointer through a list uses indices', () => {
    const text = 'models:\n  - name: a\n  - input: {shape: [2], features: 1}\n    layers: [{dense: {units: 1}}]\n';
    const m = loadLayered(text, { modelPath: '/models/1' });
    expect(m.layers[0]!.path).toBe('/models/1/layers/0');
    expect(codesAt(text, { modelPath: '/models/2' })).toEqual(['config/model-missing@2:3']);
    expect(codesAt(text, { modelPath: '/models/01' })).toEqual(['config/model-missing@2:3']);
  });

  test('a pointer into a scalar', () => {
    expect(codesAt('model: 3\n', { modelPath: '/model/layers' })).toEqual(['config/model-missing@1:8']);
  });

  test('an empty document', () => {
    expect(codesAt('')).toEqual(['config/model-missing@1:1']);
    expect(codesAt('# only a comment\n', { modelPath: '' })).toEqual(['config/model-missing@1:1']);
  });

  test('the empty pointer is the whole document', () => {
    const m = loadLayered('input: {shape: [3], features: 1}\nlayers: [{dense: {units: 2}}]\n', { modelPath: '' });
    expect(m.layers[0]!.path).toBe('/layers/0');
    const d = diagnostics('input: {shape: [3], features: 1}\nlayers: []\n', { modelPath: '' });
    expect(d[0]!.message).toBe('layers is empty; list at least one layer');
  });

  test('escaped segments: ~1 is a slash and ~0 a tilde', () => {
    const text = '"a/b":\n  "c~d":\n    input: {shape: [3], features: 1}\n    layers: [{dense: {units: 2}}]\n';
    const m = loadLayered(text, { modelPath: '/a~1b/c~0d' });
    expect(m.layers[0]!.path).toBe('/a~1b/c~0d/layers/0');
  });

  test('pointer syntax errors are config/model-path diagnostics without a position', () => {
    for (const bad of ['model', '/model/~2x', '/a~']) {
      const d = diagnostics('model: {}\n', { modelPath: bad });
      expect(d.map((x) => x.code)).toEqual(['config/model-path']);
      expect(d[0]!.span).toBeUndefined();
    }
  });

  test('the model path may go through a YAML alias', () => {
    const text = 'base: &m\n  input: {shape: [3], features: 1}\n  layers: [{dense: {units: 2}}]\nrun:\n  model: *m\n';
    const m = loadLayered(text, { modelPath: '/run/model' });
    expect(m.layers[0]!.path).toBe('/run/model/layers/0');
    expect(m.layers[0]!.span).toMatchObject({ line: 3, column: 12 });
    expect(m.span).toMatchObject({ line: 5, column: 10 });
  });
});

describe('JSON pointers', () => {
  test('parse and format round-trip', () => {
    expect(parsePointer('')).toEqual({ ok: true, segments: [] });
    expect(parsePointer('/')).toEqual({ ok: true, segments: [''] });
    expect(parsePointer('/a~1b/~0/0')).toEqual({ ok: true, segments: ['a/b', '~', '0'] });
    expect(formatPointer(['a/b', '~', 0])).toBe('/a~1b/~0/0');
    expect(parsePointer('x').ok).toBe(false);
  });
});
