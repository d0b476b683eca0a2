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
  'bigru-shipment-tagger.yaml': '/network',
  'causal-lm-release-notes.yaml': '/model',
  'inception-wildlife.yaml': '/pipeline/stages/1/network',
  'lenet-digits.yaml': '/model',
  'lstm-ticket-router.yaml': '/model',
  'mlp-fashion.yaml': '/model',
  'mobilenet-leaf-disease.yaml': '/trainer/model',
  'resnet18-shelf-products.yaml': '/experiment/model',
  'tcn-fall-detection.yaml': '/model',
  'unet-nuclei-segmentation.yaml': '/model',
  'vgg11-aerial-tiles.yaml': '/training/network',
  'vit-solar-panel-defects.yaml': '/experiment/model',
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
  test('the corpus is the twelve configs listed here', () => {
    expect(readdirSync(DIR).sort()).toEqual(Object.keys(CORPUS).sort());
  });

  test.each(Object.keys(CORPUS))('%s loads as written', (file) => {
    const { model } = loaded(file);
    expect(model.layers.length).toBeGreaterThan(4);
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

  test('LSTM document classifier: 32,000 tokens, two LSTM levels of 256, read at the last token', () => {
    const { model, shapes } = loaded('lstm-ticket-router.yaml');
    expect(model.input.vocabulary).toBe(32000);
    expect(shapes.representation).toBe(32000);
    expect(model.layers[named(model, 'encoder')]).toMatchObject({ kind: 'recurrent', cell: 'lstm', hidden: 256, depth: 2, bidirectional: false, sequence: true });
    expect(shapes.output).toEqual({ position: [511], defaulted: true });
    // derived here (one bias per gate): 32000·128 + 4·(256·(128+256) + 256) + 4·(256·(256+256) + 256) + 256·14 + 14
    expect(parameterCount(model)).toBe(32000n * 128n + 4n * (256n * 384n + 256n) + 4n * (256n * 512n + 256n) + 256n * 14n + 14n);
  });

  test('bidirectional GRU tagger: both directions concatenated per step, analysed at token 96', () => {
    const { model, shapes } = loaded('bigru-shipment-tagger.yaml');
    expect(model.input.vocabulary).toBe(12000);
    expect(shapes.layers[named(model, 'context')]).toEqual({ shape: [192], width: 256 });
    expect(last(shapes)).toEqual({ shape: [192], width: 9 });
    expect(shapes.output).toEqual({ position: [96], defaulted: false });
    // derived here: 12000·100 + 2·3·(128·(100+128) + 128) + 2·3·(128·(256+128) + 128) + 256·9 + 9
    expect(parameterCount(model)).toBe(1200000n + 6n * (128n * 228n + 128n) + 6n * (128n * 384n + 128n) + 2304n + 9n);
  });

  test('causal language model: four causal blocks of width 256, 8 heads of 32; the next token after the last position', () => {
    const { model, shapes } = loaded('causal-lm-release-notes.yaml');
    const attention = model.layers.filter((l) => l.kind === 'attention');
    expect(attention.map((l) => l.kind === 'attention' && [l.heads, l.causal])).toEqual(new Array(4).fill([8, true]));
    expect(attention.map((l) => shapes.headDims[l.index])).toEqual([32, 32, 32, 32]);
    expect(model.layers.filter((l) => l.name?.startsWith('block')).map((l) => l.name)).toEqual(['block[1]', 'block[2]', 'block[3]', 'block[4]']);
    expect(shapes.output).toEqual({ position: [255], defaulted: true });
    // derived here, no biases: 8192·256 + 256·256 + 4·(2·256 + 4·256² + 2·256·1024) + 256 + 256·8192
    expect(parameterCount(model)).toBe(8192n * 256n * 2n + 65536n + 4n * (512n + 4n * 65536n + 2n * 256n * 1024n) + 256n);
  });

  test('patch-based image transformer: 64 patches and a class token, read at the class token', () => {
    const { model, shapes } = loaded('vit-solar-panel-defects.yaml');
    // derived here: 64/8 = 8 patches per side, 8·8 + 1 = 65 positions after the class token
    expect(shapes.layers[named(model, 'patch_embed')]).toEqual({ shape: [8, 8], width: 192 });
    expect(shapes.layers[named(model, 'patch_embed') + 1]).toEqual({ shape: [65], width: 192 });
    expect(model.layers.filter((l) => l.kind === 'attention').length).toBe(6);
    expect(shapes.output).toEqual({ position: [0], defaulted: true });
    // derived here: 8·8·3·192 + 192 + 192 + 65·192 + 6·(4·192 + 4·192² + 4·192 + 2·192·768 + 768 + 192) + 2·192 + 192·5 + 5
    expect(parameterCount(model)).toBe(37056n + 192n + 12480n + 6n * (768n + 4n * 36864n + 768n + 2n * 147456n + 960n) + 384n + 965n);
  });
});
