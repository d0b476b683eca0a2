/**
 * The input and the analysed output. The data's raw channels (1 grayscale, 3 RGB) are not M:
 * `channels` and its aliases are recorded and never set M; `representation` sets M, and by
 * default M is the width of the first layer that reads the input (inferred by the shapes). A
 * shape written with its channel axis is accepted when that axis equals the channels.
 */
import { describe, expect, test } from 'vitest';
import { inferShapes } from '../../src/config/model-shapes.js';
import { codesAt, diagnostics, loadLayered } from './helpers.js';

const model = (input: string, more = '') => `model:\n  input: ${input}\n${more}  layers:\n    - conv: {channels: 16, kernel: 3}\n    - pool: {window: 2}\n`;

describe('channels and M', () => {
  test.each([
    ['features', true],
    ['channels', false],
    ['in_channels', false],
    ['num_channels', false],
  ])('%s is the raw channel count, never M', (key, asFeatures) => {
    const m = loadLayered(model(`{shape: [28, 28], ${key}: 1}`));
    expect(m.input.channels).toBe(1);
    expect(m.input.representation).toBeUndefined();
    expect(m.input.featuresAsChannels === true).toBe(asFeatures);
    expect(Object.keys(m.input.fieldSpans).sort()).toEqual(['channels', 'shape']);
    // M defaults to the width of the first layer that reads the input, not to the channels
    const shapes = inferShapes(m);
    expect(shapes.ok && shapes.shapes.representation).toBe(16);
  });

  test('representation sets M exactly', () => {
    const m = loadLayered(model('{shape: [28, 28], channels: 1, representation: 4}'));
    expect(m.input).toMatchObject({ channels: 1, representation: 4 });
    const shapes = inferShapes(m);
    expect(shapes.ok && shapes.shapes.representation).toBe(4);
  });

  test('two spellings of the channels conflict', () => {
    const d = diagnostics(model('{shape: [28, 28], features: 1, in_channels: 1}'));
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/alias-conflict@2:41']);
    expect(d[0]!.message).toBe("model.input gives 'features' and 'in_channels', which both mean 'channels'; keep only one of them");
  });

  test('a misspelt input field suggests the alias as written', () => {
    const d = diagnostics(model('{shape: [28, 28], num_chanels: 1}'));
    expect(d[0]!.message).toContain("did you mean 'num_channels'?");
  });

  test('no layer maps the input and no representation: at the input', () => {
    const d = diagnostics('model:\n  input: {shape: [8, 8]}\n  layers: [relu, {pool: {window: 2}}]\n');
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/no-representation@2:10']);
  });
});

describe('a shape with its channel axis', () => {
  test.each([
    ['[3, 32, 32]', 3, [32, 32]],
    ['[32, 32, 3]', 3, [32, 32]],
    ['[1, 28, 28]', 1, [28, 28]],
    ['[3, 3, 3]', 3, [3, 3]],
  ])('%s with channels %i → %j', (shape, channels, kept) => {
    const m = loadLayered(model(`{shape: ${shape}, channels: ${channels}}`).replace('kernel: 3', 'kernel: 1').replace('    - pool: {window: 2}\n', ''));
    expect(m.input.shape).toEqual(kept);
  });

  test('without channels: an error with the hint', () => {
    const d = diagnostics(model('{shape: [3, 64, 64]}'));
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/input-shape@2:18']);
    expect(d[0]!.message).toBe(
      'model.input.shape is [3, 64, 64]: only 1D ([length]) and 2D ([height, width]) grids are supported; if one entry is the channel count, give it as input.channels too (e.g. channels: 3) and it is dropped, or write the shape without it',
    );
  });

  test('channels that match neither end, or both ends with different results', () => {
    expect(codesAt(model('{shape: [5, 64, 64], channels: 3}'))).toEqual(['config/input-shape@2:18']);
    const d = diagnostics(model('{shape: [3, 64, 3], channels: 3}'));
    expect(d[0]!.message).toContain('both its first and its last entry equal input.channels (3)');
  });

  test('four entries are too many', () => {
    expect(codesAt(model('{shape: [1, 3, 8, 8], channels: 3}'))).toEqual(['config/invalid-length@2:18']);
  });
});

describe('output position', () => {
  const seg = (output: string) =>
    `model:\n  input: {shape: [16, 16], channels: 1}\n${output}  layers:\n    - conv: {channels: 4, kernel: 3}\n    - conv: {channels: 2, kernel: 1}\n`;

  test('a position per axis, or an integer in 1D', () => {
    const m = loadLayered(seg('  output: {position: [3, 12]}\n'));
    expect(m.output.position).toEqual([3, 12]);
    expect(m.output.span).toMatchObject({ line: 3, column: 22 });
    const shapes = inferShapes(m);
    expect(shapes.ok && shapes.shapes.output).toEqual({ position: [3, 12], defaulted: false });
    const one = loadLayered('model:\n  input: {shape: [16]}\n  output: {position: 5}\n  layers: [{conv: {channels: 2}}]\n');
    expect(one.output.position).toEqual([5]);
  });

  test('absent: the centre, marked as defaulted', () => {
    const m = loadLayered(seg(''));
    expect(m.output).toEqual({});
    const shapes = inferShapes(m);
    expect(shapes.ok && shapes.shapes.output).toEqual({ position: [8, 8], defaulted: true });
  });

  test('outside the grid, or of the wrong length: at the position', () => {
    const d = diagnostics(seg('  output: {position: [3, 16]}\n'));
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/output-position@3:22']);
    expect(d[0]!.message).toBe("output.position [3, 16] is outside the last layer's grid [16, 16]");
    expect(codesAt(seg('  output: {position: 3}\n'))).toEqual(['config/output-position@3:22']);
    expect(codesAt(seg('  output: {position: [-1, 2]}\n'))).toEqual(['config/invalid-number@3:23']);
  });
});
