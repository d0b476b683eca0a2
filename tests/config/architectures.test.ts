/**
 * The corpus of realistic configs in examples/architectures/: each is a whole training config as a
 * team keeps it (activations, normalisation and dropout left in, common field spellings), and each
 * loads as written, without a diagnostic, and its shapes infer. The facts checked beside each are
 * derived here from the architecture (grid formulas in DEVELOPERS.md) or from the paper it follows.
 */
import { readdirSync } from 'node:fs';
import { describe, expect, test } from 'vitest';
import { loadConfigFile } from '../../src/config/load-config.js';
import type { LayeredModel } from '../../src/config/model.js';
import { inferShapes, type ModelShapes } from '../../src/config/model-shapes.js';
import { parameterCount } from '../../src/policy/parameters.js';

const DIR = new URL('../../examples/architectures/', import.meta.url);

/** Every file of the corpus and where its architecture sits. */
const CORPUS: Record<string, string> = {
  'inception-wildlife.yaml': '/pipeline/stages/1/network',
  'lenet-digits.yaml': '/model',
  'mlp-fashion.yaml': '/model',
  'mobilenet-leaf-disease.yaml': '/trainer/model',
  'resnet18-shelf-products.yaml': '/experiment/model',
  'tcn-fall-detection.yaml': '/model',
  'unet-nuclei-segmentation.yaml': '/model',
  'vgg11-aerial-tiles.yaml': '/training/network',
};

function loaded(file: string): { model: LayeredModel; shapes: ModelShapes } {
  const r = loadConfigFile(new URL(file, DIR).pathname, { modelPath: CORPUS[file]! });
  if (!r.ok) throw new Error(r.diagnostics.map((d) => `${d.span?.line}:${d.span?.column} ${d.code} ${d.message}`).join('\n'));
  if (r.model.kind !== 'layered') throw new Error('not layered');
  const s = inferShapes(r.model);
  if (!s.ok) throw new Error(s.diagnostics.map((d) => d.message).join('\n'));
  return { model: r.model, shapes: s.shapes };
}

const last = (s: ModelShapes) => s.layers[s.layers.length - 1]!;
const named = (m: LayeredModel, name: string) => m.layers.find((l) => l.name === name)!.index;

describe('examples/architectures', () => {
  test('the corpus is the eight configs listed here', () => {
    expect(readdirSync(DIR).sort()).toEqual(Object.keys(CORPUS).sort());
  });

  test.each(Object.keys(CORPUS))('%s loads as written', (file) => {
    const { model } = loaded(file);
    expect(model.layers.length).toBeGreaterThan(5);
  });

  test('18-layer residual net: 11,689,512 parameters; 7×7×512 before the pool', () => {
    // derived here from He et al. 2016, Table 1 (18-layer): convs without biases, batch
    // normalisation with a scale and shift per channel, a 1000-way linear head with bias
    const { model, shapes } = loaded('resnet18-shelf-products.yaml');
    expect(model.input.shape).toEqual([224, 224]);
    expect(model.layers.filter((l) => l.kind === 'conv' && l.kernel[0] !== 1).length).toBe(17);
    expect(parameterCount(model)).toBe(11689512n);
    expect(shapes.layers[named(model, 'layer4')]).toEqual({ shape: [7, 7], width: 512 });
    expect(model.layers.filter((l) => l.kind === 'merge').map((l) => l.name)).toEqual(['layer1[1]', 'layer1[2]', 'layer2_down', 'layer2', 'layer3_down', 'layer3', 'layer4_down', 'layer4']);
  });

  test('VGG configuration A: eight convs, three dense layers, 25088 values into fc6', () => {
    const { model, shapes } = loaded('vgg11-aerial-tiles.yaml');
    expect(model.layers.filter((l) => l.kind === 'conv').length + model.layers.filter((l) => l.kind === 'dense').length).toBe(11);
    const fc6 = named(model, 'fc6');
    expect(shapes.layers[fc6 - 1]).toEqual({ shape: [1, 1], width: 7 * 7 * 512 });
    // derived here: the 132,863,336 of configuration A with a 12-way head instead of 1000-way
    expect(parameterCount(model)).toBe(132863336n - 4096n * 988n - 988n);
  });

  test('encoder/decoder: skips join at matching grids; the output is analysed at (40, 90)', () => {
    const { model, shapes } = loaded('unet-nuclei-segmentation.yaml');
    const joins = model.layers.filter((l) => l.kind === 'merge');
    expect(joins.map((l) => [shapes.layers[l.index]!.shape, shapes.layers[l.index]!.width])).toEqual([
      [[32, 32], 256],
      [[64, 64], 128],
      [[128, 128], 64],
    ]);
    expect(last(shapes)).toEqual({ shape: [128, 128], width: 2 });
    expect(shapes.output).toEqual({ position: [40, 90], defaulted: false });
  });

  test('mobile net: thirteen depthwise convs, 1024 channels at 7×7', () => {
    const { model, shapes } = loaded('mobilenet-leaf-disease.yaml');
    expect(model.layers.filter((l) => l.kind === 'conv' && l.groups === 'depthwise').length).toBe(13);
    expect(shapes.layers[named(model, 'pw13')]).toEqual({ shape: [7, 7], width: 1024 });
    expect(model.layers.filter((l) => l.kind === 'pointwise' && l.op === 'relu6').length).toBe(26);
  });

  test('dilated causal temporal net: every conv causal, so the last step is analysed', () => {
    const { model, shapes } = loaded('tcn-fall-detection.yaml');
    expect(model.layers.filter((l) => l.kind === 'conv').every((l) => l.kind === 'conv' && l.padding.mode === 'causal')).toBe(true);
    expect(last(shapes)).toEqual({ shape: [1024], width: 2 });
    expect(shapes.output).toEqual({ position: [1023], defaulted: true });
  });

  test('LeNet-style: features: 1 is the grayscale channel, and M is the first conv’s 6', () => {
    const { model, shapes } = loaded('lenet-digits.yaml');
    expect(model.input).toMatchObject({ channels: 1, featuresAsChannels: true });
    expect(shapes.representation).toBe(6);
    // derived here: 32 → 28 → 14 → 10 → 5; flatten: 5·5·16 = 400 values into c5
    expect(shapes.layers[named(model, 'c5') - 1]).toEqual({ shape: [1, 1], width: 400 });
  });

  test('MLP: one flattened vector of 784 positions (M values each) into the first dense layer', () => {
    const { model, shapes } = loaded('mlp-fashion.yaml');
    const hidden1 = named(model, 'hidden1');
    // M defaults to the width of the first layer that maps the input: hidden1's 512
    expect(shapes.representation).toBe(512);
    expect(shapes.layers[hidden1 - 1]).toEqual({ shape: [1, 1], width: 784 * 512 });
    expect(shapes.denseReading[hidden1]).toBe('vector');
    // the real network reads the one grayscale channel: 784·512 + 512 + 512·512 + 512 + 512·10 + 10
    expect(parameterCount(model)).toBe(669706n);
  });

  test('inception-style: concatenations of 256, 480 and 512 channels', () => {
    // Szegedy et al. 2015, Table 1: inception (3a) 256, (3b) 480, (4a) 512 output channels
    const { model, shapes } = loaded('inception-wildlife.yaml');
    expect(['inception3a', 'inception3b', 'inception4a'].map((n) => shapes.layers[named(model, n)]!.width)).toEqual([256, 480, 512]);
  });
});
