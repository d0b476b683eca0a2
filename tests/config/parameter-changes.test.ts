/**
 * Attribution of a change to a config built from an architecture definition: a changed parameter
 * at its config line with the layer fields it changed, an edit of the definition at its line
 * there, a switch of definition at the `architecture` line. The widths are those of
 * tests/helpers/definitions.ts (derived here: ceil(8 · width), ceil(16 · width)).
 */
import { describe, expect, test } from 'vitest';
import { diffModels, type FieldChange } from '../../src/config/model-diff.js';
import { NET, runConfig, runModel } from '../helpers/definitions.js';

const show = (c: FieldChange): string => {
  const where = `${c.file ?? 'config'}:${c.span.line}:${c.span.column}`;
  const effects = c.effects ? ` [${c.effects.map((e) => `${e.layer}.${e.field} ${e.from}→${e.to}`).join(', ')}]` : '';
  return `${c.layer}.${c.field}: ${c.from} → ${c.to} @${where}${effects}`;
};

const diff = (base: string, head: string, baseFiles?: Record<string, string>, headFiles?: Record<string, string>): string[] =>
  diffModels(runModel(base, baseFiles), runModel(head, headFiles)).map(show);

describe('a changed parameter', () => {
  test('is one change at its config line, with every layer field it changed', () => {
    expect(diff(runConfig('width: 1.0'), runConfig('width: 0.5'))).toEqual([
      'parameter.width: 1 → 0.5 @config:4:10 [stem.channels 8→4, a[1].channels 8→4, b[1].channels 16→8, b[2].channels 16→8]',
    ]);
  });

  test('a list entry that removes repeated layers names them', () => {
    expect(diff(runConfig('blocks: [1, 2]'), runConfig('blocks: [1, 1]'))).toEqual(['parameter.blocks: [1, 2] → [1, 1] @config:4:11 [b[2].layer conv→(removed)]']);
  });

  test('setting a parameter that used its default points at the new line; removing it at the architecture line', () => {
    expect(diff(runConfig(), runConfig('size: 8'))).toEqual(['parameter.size: 16 → 8 @config:4:9 [input.shape [16, 16]→[8, 8]]']);
    expect(diff(runConfig('width: 0.5'), runConfig())).toEqual([
      'parameter.width: 0.5 → 1 @config:3:17 [stem.channels 4→8, a[1].channels 4→8, b[1].channels 8→16, b[2].channels 8→16]',
    ]);
  });

  test('a value written differently but equal is no change', () => {
    expect(diff(runConfig('width: 1.0'), runConfig('width: 1'))).toEqual([]);
  });
});

describe('an edited definition', () => {
  test('is attributed to the definition line, with the definition named', () => {
    const edited = NET.replace('"=ceil(16 * width)"', '"=ceil(12 * width)"');
    expect(diff(runConfig(), runConfig(), undefined, { 'arch/net.yaml': edited })).toEqual([
      'b[1].channels: 16 → 12 @arch/net.yaml:30:30',
      'b[2].channels: 16 → 12 @arch/net.yaml:30:30',
    ]);
  });

  test('beside a changed parameter, each change goes where it comes from', () => {
    const edited = NET.replace('"=ceil(16 * width)"', '"=32"');
    expect(diff(runConfig('width: 1'), runConfig('width: 0.5'), undefined, { 'arch/net.yaml': edited })).toEqual([
      'parameter.width: 1 → 0.5 @config:4:10 [stem.channels 8→4, a[1].channels 8→4]',
      'b[1].channels: 16 → 32 @arch/net.yaml:30:30',
      'b[2].channels: 16 → 32 @arch/net.yaml:30:30',
    ]);
  });

  test('a switch to another definition is one change at the architecture line', () => {
    const files = { 'arch/net.yaml': NET, 'arch/other.yaml': NET.replace('"=ceil(8 * width)", kernel: 3, name: stem', '"=ceil(4 * width)", kernel: 3, name: stem') };
    const head = runConfig().replace('../arch/net.yaml', '../arch/other.yaml');
    expect(diff(runConfig(), head, files, files)).toEqual(['model.architecture: arch/net.yaml → arch/other.yaml @config:3:17 [stem.channels 8→4]']);
  });
});
