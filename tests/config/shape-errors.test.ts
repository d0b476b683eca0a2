/**
 * The loader runs shape inference on every layered model it builds and reports its problems at
 * the field at fault: a window that does not fit its grid, causal padding on a 2D grid, groups
 * that do not divide the widths, a depthwise width that is not a multiple. Grid lengths follow
 * the formulas in DEVELOPERS.md ("Grid arithmetic").
 */
import { describe, expect, test } from 'vitest';
import { inferShapes } from '../../src/config/model-shapes.js';
import { diagnostics, layered, loadLayered } from './helpers.js';

const at = (text: string) => diagnostics(text).map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`);

describe('shape errors at the field', () => {
  test('a valid window larger than the grid: at the kernel', () => {
    expect(at(layered('    - conv: {channels: 2, kernel: 5, padding: valid}\n', '[4, 4]'))).toEqual(['config/window-does-not-fit@6:35']);
  });

  test('a pool window larger than what is left: at the window', () => {
    expect(at(layered('    - conv: {channels: 2}\n    - pool: {window: 4}\n    - pool: {pool_size: 4}\n', '[8, 8]'))).toEqual(['config/window-does-not-fit@8:25']);
  });

  test('causal padding on a 2D grid: at the padding', () => {
    const d = diagnostics(layered('    - conv: {channels: 2, kernel: 3, padding: causal}\n', '[8, 8]'));
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/causal-needs-1d@6:47']);
  });

  test('groups that do not divide the widths: at the groups', () => {
    expect(at(layered('    - conv: {channels: 6}\n    - conv: {channels: 8, groups: 4}\n'))).toEqual(['config/groups@7:35']);
  });

  test('a depthwise conv with channels that are not a multiple of its input', () => {
    expect(at(layered('    - conv: {channels: 6}\n    - conv: {channels: 8, depthwise: true}\n'))).toEqual(['config/groups@7:7']);
  });
});

describe('grids through the new kinds', () => {
  test('stride, dilation, explicit padding, transposed conv, upsample, flatten', () => {
    const m = loadLayered(
      layered(
        `    - conv: {channels: 4, kernel: 7, stride: 2, padding: 3}
    - MaxPool2d: {kernel_size: 3, stride: 2, padding: 1}
    - conv: {channels: 4, kernel: 3, dilation: 2, padding: valid}
    - ConvTranspose2d: {out_channels: 2, kernel_size: 4, stride: 2, padding: 1}
    - upsample: {factor: 2}
    - flatten
`,
        '[224, 224]',
      ),
    );
    const shapes = inferShapes(m);
    // derived here from the grid formulas: ⌊(224+6−7)/2⌋+1 = 112; ⌊(112+2−3)/2⌋+1 = 56;
    // 56 − (2·2+1) + 1 = 52; (52−1)·2 − 2 + 4 = 104; 208; flatten: one position of 208·208·2
    expect(shapes.ok && shapes.shapes.layers.map((s) => [s.shape, s.width])).toEqual([
      [[112, 112], 4],
      [[56, 56], 4],
      [[52, 52], 4],
      [[104, 104], 2],
      [[208, 208], 2],
      [[1, 1], 208 * 208 * 2],
    ]);
  });
});
