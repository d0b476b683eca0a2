/**
 * Blocks become merge layers with the right inputs: residual (main path + shortcut), branches
 * (parallel paths, concat or sum), long skips (`add`/`concat` from a named layer) and named
 * sequences. The wiring is checked layer by layer; shape errors of merges come from shape
 * inference, positioned at the block.
 */
import { describe, expect, test } from 'vitest';
import type { Layer } from '../../src/config/model.js';
import { inferShapes } from '../../src/config/model-shapes.js';
import { codesAt, diagnostics, layered, loadLayered } from './helpers.js';

/** `kind inputs` per layer, with merges as `merge:mode:origin`. */
function wiring(layers: readonly Layer[]): string[] {
  return layers.map((l) => `${l.kind === 'merge' ? `merge:${l.mode}:${l.origin}` : l.kind === 'pointwise' ? l.op : l.kind} ${l.inputs.join(',')}`);
}

describe('residual', () => {
  test('an identity shortcut: the merge adds the main path and the block input', () => {
    const m = loadLayered(
      layered(`    - conv: {channels: 8, kernel: 3}
    - residual:
        layers:
          - conv: {channels: 8, kernel: 3, norm: batch, activation: relu}
          - conv: {channels: 8, kernel: 3, norm: batch}
        activation: relu
`),
    );
    expect(wiring(m.layers)).toEqual(['conv -1', 'conv 0', 'batch_norm 1', 'relu 2', 'conv 3', 'batch_norm 4', 'merge:sum:residual 5,0', 'relu 6']);
    const merge = m.layers[6]!;
    expect(merge.path).toBe('/model/layers/1');
    expect(merge.span).toMatchObject({ line: 7, column: 7 });
    expect(Object.keys(merge.fieldSpans).sort()).toEqual(['activation', 'layers']);
  });

  test('a projection shortcut (strided 1×1 conv) under its common spellings', () => {
    for (const [main, short] of [
      ['layers', 'shortcut'],
      ['body', 'projection'],
      ['main', 'downsample'],
    ]) {
      const m = loadLayered(
        layered(`    - conv: {channels: 8}
    - residual:
        ${main}: [{conv: {channels: 16, kernel: 3, stride: 2}}, {conv: {channels: 16, kernel: 3}}]
        ${short}: [{conv: {channels: 16, kernel: 1, stride: 2}}]
`),
      );
      expect(wiring(m.layers)).toEqual(['conv -1', 'conv 0', 'conv 1', 'conv 0', 'merge:sum:residual 2,3']);
      const shapes = inferShapes(m);
      expect(shapes.ok && shapes.shapes.layers[4]).toEqual({ shape: [16, 16], width: 16 });
    }
  });

  test('an empty or null shortcut is the identity', () => {
    for (const short of ['[]', 'null']) {
      const m = loadLayered(layered(`    - conv: {channels: 8}\n    - residual: {layers: [{conv: {channels: 8}}], shortcut: ${short}}\n`));
      expect(wiring(m.layers)).toEqual(['conv -1', 'conv 0', 'merge:sum:residual 1,0']);
    }
  });

  test('widths that do not agree: at the block, naming both paths', () => {
    const d = diagnostics(layered('    - conv: {channels: 8}\n    - residual: {layers: [{conv: {channels: 16}}]}\n'));
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/merge-width@7:7']);
    expect(d[0]!.message).toContain('the paths it adds have different widths 16 and 8');
  });

  test('grids that do not agree: a strided main path with an identity shortcut', () => {
    expect(codesAt(layered('    - conv: {channels: 8}\n    - residual: {layers: [{conv: {channels: 8, stride: 2}}]}\n'))).toEqual(['config/merge-shape@7:7']);
  });

  test('the main path may not be empty', () => {
    expect(codesAt(layered('    - conv: {channels: 8}\n    - residual: {layers: []}\n    - residual: {shortcut: []}\n'))).toEqual([
      'config/empty-layers@7:26',
      'config/missing-field@8:17',
    ]);
  });
});

describe('branches', () => {
  const INCEPTION = `    - conv: {channels: 8}
    - branches:
        merge: concat
        paths:
          - - conv: {channels: 4, kernel: 1}
          - - conv: {channels: 2, kernel: 1}
            - conv: {channels: 6, kernel: 3}
          - - {type: MaxPool2d, kernel_size: 3, stride: 1, padding: 1}
            - conv: {channels: 2, kernel: 1}
          - []
`;

  test('each path reads the block input; concat widths add (4 + 6 + 2 + 8)', () => {
    const m = loadLayered(layered(INCEPTION));
    expect(wiring(m.layers)).toEqual(['conv -1', 'conv 0', 'conv 0', 'conv 2', 'pool 0', 'conv 4', 'merge:concat:branches 1,3,5,0']);
    const shapes = inferShapes(m);
    expect(shapes.ok && shapes.shapes.layers[6]).toEqual({ shape: [32, 32], width: 20 });
  });

  test('merge: sum (and add), a path written as one entry', () => {
    const m = loadLayered(layered('    - conv: {channels: 8}\n    - branches: {merge: add, paths: [{conv: {channels: 8, kernel: 3}}, [{conv: {channels: 8, kernel: 5}}]]}\n'));
    expect(wiring(m.layers)).toEqual(['conv -1', 'conv 0', 'conv 0', 'merge:sum:branches 1,2']);
  });

  test('concat is the default merge', () => {
    const m = loadLayered(layered('    - conv: {channels: 8}\n    - branches: {paths: [[], []]}\n'));
    expect(wiring(m.layers)).toEqual(['conv -1', 'merge:concat:branches 0,0']);
  });

  test('at least two paths, and a known merge', () => {
    const d = diagnostics(layered('    - conv: {channels: 8}\n    - branches: {paths: [[]]}\n    - branches: {paths: [[], []], merge: mul}\n'));
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/branches@7:25', 'config/invalid-value@8:42']);
    expect(d[0]!.message).toBe('model.layers[1].branches.paths must list at least two paths (each a list of layers; an empty list is the identity), got 1 path');
  });
});

describe('long skips', () => {
  const UNET = `    - conv: {channels: 8, kernel: 3, name: enc1}
    - pool: {window: 2}
    - conv: {channels: 16, kernel: 3, name: enc2}
    - pool: {window: 2}
    - conv: {channels: 32, kernel: 3}
    - upsample: {factor: 2}
    - concat: {from: enc2}
    - conv: {channels: 16, kernel: 3}
    - {type: ConvTranspose2d, out_channels: 8, kernel_size: 2, stride: 2}
    - concat: {from: enc1, activation: relu}
    - conv: {channels: 8}
    - add: {from: enc1}
`;

  test('concat and add merge the current grid with the named layers, in that order', () => {
    const m = loadLayered(layered(UNET, '[16, 16]'));
    expect(wiring(m.layers)).toEqual([
      'conv -1',
      'pool 0',
      'conv 1',
      'pool 2',
      'conv 3',
      'upsample 4',
      'merge:concat:skip 5,2',
      'conv 6',
      'conv-transpose 7',
      'merge:concat:skip 8,0',
      'relu 9',
      'conv 10',
      'merge:sum:skip 11,0',
    ]);
    const shapes = inferShapes(m);
    expect(shapes.ok && shapes.shapes.layers.map((s) => s.width)).toEqual([8, 8, 16, 16, 32, 32, 48, 16, 8, 16, 16, 8, 8]);
    expect(m.layers[6]!.fieldSpans['from']).toMatchObject({ line: 12, column: 22 });
  });

  test("a list of names, and 'input' for the model input", () => {
    const m = loadLayered(`model:
  input: {shape: [8], representation: 4}
  layers:
    - conv: {channels: 4, name: a}
    - conv: {channels: 4, name: b}
    - add: {from: [a, input]}
`);
    expect(wiring(m.layers)).toEqual(['conv -1', 'conv 0', 'merge:sum:skip 1,0,-1']);
  });

  test('a skip at another resolution is a shape error at the merge', () => {
    const d = diagnostics(layered('    - conv: {channels: 8, name: enc}\n    - pool: {window: 2}\n    - concat: {from: enc}\n'));
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/merge-shape@8:7']);
    expect(d[0]!.message).toContain('[16, 16] and [32, 32]');
  });

  test('from is required and names layers', () => {
    expect(codesAt(layered('    - conv: {channels: 8}\n    - add: {}\n    - concat: {from: [3]}\n    - concat: {from: []}\n'))).toEqual([
      'config/missing-field@7:12',
      'config/invalid-value@8:23',
      'config/invalid-value@9:22',
    ]);
  });
});

describe('sequence', () => {
  test('a named sub-list: its name refers to its output, which takes it as its label', () => {
    const m = loadLayered(
      layered(`    - sequence:
        name: stem
        layers:
          - conv: {channels: 8, kernel: 3}
          - BatchNorm2d
          - relu
    - conv: {channels: 8}
    - add: {from: stem}
`),
    );
    expect(wiring(m.layers)).toEqual(['conv -1', 'batch_norm 0', 'relu 1', 'conv 2', 'merge:sum:skip 3,2']);
    expect(m.layers.map((l) => l.name)).toEqual([undefined, undefined, 'stem', undefined, undefined]);
  });

  test('block is an alias', () => {
    const m = loadLayered(layered('    - block: {layers: [{conv: {channels: 2}}, relu]}\n'));
    expect(wiring(m.layers)).toEqual(['conv -1', 'relu 0']);
  });
});

describe('blocks inside repeat', () => {
  test('a residual stage repeated: each copy reads the one before', () => {
    const m = loadLayered(
      layered(`    - conv: {channels: 4}
    - repeat:
        times: 2
        layers:
          - residual: {name: res, layers: [{conv: {channels: 4, kernel: 3}}], activation: relu}
`),
    );
    expect(wiring(m.layers)).toEqual(['conv -1', 'conv 0', 'merge:sum:residual 1,0', 'relu 2', 'conv 3', 'merge:sum:residual 4,3', 'relu 5']);
    expect(m.layers.map((l) => l.name)).toEqual([undefined, undefined, 'res[1]', undefined, undefined, 'res[2]', undefined]);
    expect(m.layers.map((l) => l.repeatIteration)).toEqual([undefined, 0, 0, 0, 1, 1, 1]);
  });
});
