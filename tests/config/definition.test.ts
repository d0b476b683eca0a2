/**
 * Configs that name an architecture definition: loading, provenance of every field, and every
 * problem reported in the file and at the place it belongs (the config's value, or the
 * definition's expression). Positions are checked against the texts below (derived here).
 */
import { mkdtempSync, mkdirSync, rmSync, symlinkSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, test } from 'vitest';
import type { Diagnostic } from '../../src/diagnostic.js';
import { loadConfigFile, loadConfigText, type LoadResult } from '../../src/config/load-config.js';
import type { LayeredModel } from '../../src/config/model.js';
import { memorySource, NET } from '../helpers/definitions.js';

function loadWith(config: string, files: Record<string, string> = { 'arch/net.yaml': NET }, judging?: Record<string, string>): LoadResult {
  return loadConfigText(config, 'configs/run.yaml', { definitions: memorySource(files, judging), configPath: 'configs/run.yaml' });
}

function model(config: string, files?: Record<string, string>): LayeredModel {
  const r = loadWith(config, files);
  if (!r.ok) throw new Error(r.diagnostics.map(at).join('\n'));
  return r.model as LayeredModel;
}

function at(d: Diagnostic): string {
  return `${d.file}:${d.span?.line ?? 0}:${d.span?.column ?? 0} ${d.code}`;
}

function problems(config: string, files?: Record<string, string>, judging?: Record<string, string>): Diagnostic[] {
  const r = loadWith(config, files, judging);
  if (r.ok) throw new Error('expected problems, the config loaded');
  return r.diagnostics;
}

const SMALL = `run: {epochs: 3}
model:
  architecture: ../arch/net.yaml
  width: 0.5
  blocks: [2, 1]
`;

describe('a config that names a definition', () => {
  test('gets the model the definition makes with its values', () => {
    const m = model(SMALL);
    expect(m.input.shape).toEqual([16, 16]);
    expect(m.layers.map((l) => [l.kind, l.name, 'channels' in l ? l.channels : undefined])).toEqual([
      ['conv', 'stem', 4],
      ['conv', 'a[1]', 4],
      ['conv', 'a[2]', 4],
      ['pool', undefined, undefined],
      ['conv', 'b[1]', 8],
      ['pool', undefined, undefined],
      ['dense', undefined, undefined],
    ]);
    expect(m.file).toBe('configs/run.yaml');
    expect(m.architecture).toMatchObject({ file: 'arch/net.yaml', path: 'arch/net.yaml', name: 'tiny-net', span: { line: 3, column: 17 } });
    expect(m.architecture!.parameters.map((p) => [p.name, p.value, p.span?.line, p.declared.line])).toEqual([
      ['width', '0.5', 4, 4],
      ['blocks', '[2, 1]', 5, 11],
      ['size', '16', undefined, 17],
    ]);
  });

  test('layers keep the definition line that made them and the config line of each parameter that fed a field', () => {
    const m = model(SMALL);
    const stem = m.layers[0]!;
    expect(stem.span.line).toBe(21);
    expect(stem.fieldSpans["channels"]).toMatchObject({ line: 21, column: 24 });
    expect(stem.fieldParams).toEqual({ channels: [{ name: 'width', span: expect.objectContaining({ line: 4, column: 10 }) }] });
    // the copies of a repeat record the parameter of the count under `layer`
    expect(m.layers[1]!.fieldParams).toEqual({
      channels: [{ name: 'width', span: expect.objectContaining({ line: 4 }) }],
      layer: [{ name: 'blocks', span: expect.objectContaining({ line: 5 }) }],
    });
    // a default has no line in the config
    expect(m.input.fieldParams).toEqual({ shape: [{ name: 'size' }] });
    expect(m.layers[6]!.fieldParams).toBeUndefined();
  });

  test('a parameter space for the fix search: each number and each list entry', () => {
    const r = loadWith(SMALL);
    if (!r.ok || !r.parameters) throw new Error('expected parameters');
    expect(r.parameters.choices.map((c) => [c.label, c.set, c.span.line])).toEqual([
      ['width', true, 4],
      ['blocks[0]', true, 5],
      ['blocks[1]', true, 5],
      ['size', false, 3],
    ]);
    const wider = r.parameters.withValue(r.parameters.choices[0]!, { n: 3n, d: 4n });
    expect(wider?.layers.map((l) => ('channels' in l ? l.channels : null))).toEqual([6, 6, 6, null, 12, null, null]);
    expect(wider?.architecture?.parameters[0]).toMatchObject({ name: 'width', value: '0.75' });
    const deeper = r.parameters.withValue(r.parameters.choices[2]!, { n: 3n, d: 1n });
    expect(deeper?.layers.filter((l) => l.name?.startsWith('b[')).length).toBe(3);
  });

  test('a config that lists its layers directly is read as before, with no parameters', () => {
    const r = loadConfigText('model:\n  input: {shape: [8, 8], channels: 1}\n  layers:\n    - conv: {channels: 4}\n', 'plain.yaml');
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.parameters).toBeUndefined();
    expect((r.model as LayeredModel).architecture).toBeUndefined();
    expect((r.model as LayeredModel).layers[0]!.fieldParams).toBeUndefined();
    expect((r.model as LayeredModel).input.fieldParams).toBeUndefined();
  });
});

describe('problems in the config are reported at the config value', () => {
  test('an unknown parameter, with a suggestion', () => {
    const d = problems(SMALL.replace('width: 0.5', 'widht: 0.5'));
    expect(d.map(at)).toEqual(['configs/run.yaml:4:3 config/unknown-parameter']);
    expect(d[0]!.message).toContain("'widht' is not a parameter of arch/net.yaml (did you mean 'width'?); its parameters are width, blocks, size");
  });

  test('a value outside the declared range, of the wrong type, or a list of the wrong length', () => {
    const d = problems(SMALL.replace('width: 0.5', 'width: 0.125').replace('[2, 1]', '[2, 1, 1]'));
    expect(d.map(at)).toEqual(['configs/run.yaml:4:10 config/parameter-range', 'configs/run.yaml:5:11 config/parameter-length']);
    expect(d[0]!.message).toBe('model.width is 0.125, below the minimum 0.25: parameter width allows 0.25 to 4 (declared in arch/net.yaml)');
    expect(problems(SMALL.replace('[2, 1]', '[2, 1.5]')).map(at)).toEqual(['configs/run.yaml:5:15 config/parameter-type']);
    expect(problems(`${SMALL}  size: 12.5\n`).map(at)).toEqual(['configs/run.yaml:6:9 config/parameter-type']);
    expect(problems(SMALL.replace('[2, 1]', '[2, 9]')).map(at)).toEqual(['configs/run.yaml:5:15 config/parameter-range']);
  });

  test('the judging version of the definition declares the ranges: a change cannot widen its own', () => {
    const wider = NET.replace('min: 0.25', 'min: 0.125');
    const config = SMALL.replace('width: 0.5', 'width: 0.125');
    expect(loadWith(config, { 'arch/net.yaml': wider }).ok).toBe(true);
    const d = problems(config, { 'arch/net.yaml': wider }, { 'arch/net.yaml': NET });
    expect(d.map(at)).toEqual(['configs/run.yaml:4:10 config/parameter-range']);
    expect(d[0]!.message).toContain('below the minimum 0.25: parameter width allows 0.25 to 4 (its range as the base revision declares it in arch/net.yaml');
  });

  test('paths that leave the repository, absolute paths, missing files', () => {
    expect(problems(SMALL.replace('../arch/net.yaml', '../../etc/net.yaml')).map(at)).toEqual(['configs/run.yaml:3:17 config/architecture-outside-root']);
    expect(problems(SMALL.replace('../arch/net.yaml', '/etc/passwd')).map(at)).toEqual(['configs/run.yaml:3:17 config/architecture-outside-root']);
    expect(problems(SMALL.replace('../arch/net.yaml', '../arch/nets.yaml')).map(at)).toEqual(['configs/run.yaml:3:17 config/architecture-missing']);
    expect(problems(SMALL.replace('../arch/net.yaml', '""')).map(at)).toEqual(['configs/run.yaml:3:17 config/architecture']);
  });
});

describe('problems in the definition are reported in the definition', () => {
  test('division by zero at the divisor, saying which values made it zero', () => {
    const net = NET.replace('"=ceil(16 * width)"', '"=ceil(16 / (width - 0.5))"');
    const d = problems(SMALL, { 'arch/net.yaml': net });
    expect(d.map(at)).toEqual(['configs/run.yaml:3:17 config/architecture-failed', 'arch/net.yaml:30:42 definition/division-by-zero']);
    expect(d[1]!.message).toBe('model.layers[3].repeat.layers[0].conv.channels: division by zero: the divisor is 0 here (with width = 0.5 from configs/run.yaml:4:10)');
  });

  test('a computed width the layer reader refuses says how it was computed', () => {
    const net = NET.replace('"=ceil(8 * width)", kernel: 3, name: stem', '"=floor(width) - 1", kernel: 3, name: stem');
    const d = problems(SMALL, { 'arch/net.yaml': net });
    expect(d.map(at)).toEqual(['configs/run.yaml:3:17 config/architecture-failed', 'arch/net.yaml:21:24 definition/invalid-number']);
    expect(d[1]!.message).toContain("got -1 (computed as -1 by '=floor(width) - 1' with width = 0.5 from configs/run.yaml:4:10)");
  });

  test('overflow and syntax at the characters at fault', () => {
    const net = NET.replace('"=ceil(8 * width)", kernel: 3, name: stem', '"=ceil(8 * width * 2^62)", kernel: 3, name: stem').replace('"=blocks[0]"', '"=blocks[0"');
    const d = problems(SMALL, { 'arch/net.yaml': net });
    expect(d.map(at)).toEqual(['configs/run.yaml:3:17 config/architecture-failed', 'arch/net.yaml:23:26 definition/expression-syntax']);
    const over = NET.replace('"=ceil(8 * width)", kernel: 3, name: stem', '"=ceil(8 * width * 2^62)", kernel: 3, name: stem');
    expect(problems(SMALL, { 'arch/net.yaml': over }).map(at)).toEqual(['configs/run.yaml:3:17 config/architecture-failed', 'arch/net.yaml:21:31 definition/overflow']);
  });

  test('declarations: a default outside its range, an empty range, a reserved name, a missing description', () => {
    const net = NET.replace('default: 1\n', 'default: 8\n').replace('size: {type: int, default: 16, min: 8, max: 64', 'size: {type: int, default: 16, min: 80, max: 64').replace('  blocks:\n', '  ceil:\n').replace('description: A small residual-free image net for tests.\n', '');
    expect(problems(SMALL, { 'arch/net.yaml': net }).map(at)).toEqual(['configs/run.yaml:3:17 config/architecture-failed', 'arch/net.yaml:1:1 definition/missing-field']);
    const bad = NET.replace('default: 1\n', 'default: 8\n').replace('size: {type: int, default: 16, min: 8, max: 64', 'size: {type: int, default: 16, min: 80, max: 64').replace('  blocks:\n', '  ceil:\n');
    expect(problems(SMALL, { 'arch/net.yaml': bad }).map(at)).toEqual([
      'configs/run.yaml:3:17 config/architecture-failed',
      'arch/net.yaml:6:14 definition/parameter-range',
      'arch/net.yaml:11:3 definition/invalid-name',
      'arch/net.yaml:17:48 definition/invalid-range',
    ]);
  });

  test('a definition cannot name another one, so there are no cycles to follow', () => {
    const nested = NET.replace('model:\n  input:', 'model:\n  architecture: ./net.yaml\n  input:');
    const d = problems(SMALL, { 'arch/net.yaml': nested });
    expect(d.map(at)).toEqual(['configs/run.yaml:3:17 config/architecture-failed', 'arch/net.yaml:19:3 definition/unknown-field']);
  });
});

describe('the model path and sizes', () => {
  const nested = `experiment:\n  seed: 1\n  network:\n    architecture: ../arch/net.yaml\n    width: 0.5\n`;

  test('a definition named under another model path (--model-path, a policy model_path)', () => {
    const r = loadConfigText(nested, 'configs/run.yaml', { modelPath: '/experiment/network', definitions: memorySource({ 'arch/net.yaml': NET }), configPath: 'configs/run.yaml' });
    expect(r.ok && (r.model as LayeredModel).architecture?.parameters[0]).toMatchObject({ name: 'width', value: '0.5', span: { line: 5, column: 12 } });
  });

  test('the hint of a model path that does not resolve names where the architecture is named', () => {
    const d = problems(nested);
    expect(d.map(at)).toEqual(['configs/run.yaml:1:1 config/model-missing']);
    expect(d[0]!.message).toContain('pass --model-path /experiment/network');
  });

  test('computed sizes meet the same limits as written ones, at the expression', () => {
    const many = NET.replace('max: 4\n    description: convolutions per stage', 'max: 9000\n    description: convolutions per stage');
    const d = problems(SMALL.replace('[2, 1]', '[6000, 6000]'), { 'arch/net.yaml': many });
    expect(d.map(at)).toEqual(['configs/run.yaml:3:17 config/architecture-failed', 'arch/net.yaml:23:16 definition/too-many-layers']);
    expect(d[1]!.message).toContain("is 6000, which makes the model expand to 12004 layers");
    const wide = NET.replace('"=ceil(8 * width)", kernel: 3, name: stem', '"=ceil(8 * width * 2^30)", kernel: 3, name: stem');
    const w = problems(SMALL, { 'arch/net.yaml': wide });
    expect(w.map(at)).toEqual(['configs/run.yaml:3:17 config/architecture-failed', 'arch/net.yaml:21:24 definition/number-too-large']);
    expect(w[1]!.message).toContain("(computed as 4294967296 by '=ceil(8 * width * 2^30)' with width = 0.5 from configs/run.yaml:4:10)");
  });
});

describe('definitions on disk', () => {
  const dir = mkdtempSync(join(tmpdir(), 'rankfloor-def-'));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));
  mkdirSync(join(dir, '.git'));
  mkdirSync(join(dir, 'arch'));
  mkdirSync(join(dir, 'configs'));
  writeFileSync(join(dir, 'arch', 'net.yaml'), NET);
  writeFileSync(join(dir, 'configs', 'run.yaml'), SMALL);
  symlinkSync(join(dir, 'arch', 'net.yaml'), join(dir, 'arch', 'linked.yaml'));
  symlinkSync(join(dir, 'arch'), join(dir, 'linked-dir'));
  writeFileSync(join(dir, 'configs', 'linked.yaml'), SMALL.replace('../arch/net.yaml', '../arch/linked.yaml'));
  writeFileSync(join(dir, 'configs', 'behind.yaml'), SMALL.replace('../arch/net.yaml', '../linked-dir/net.yaml'));

  test('are read from the repository around the config', () => {
    const r = loadConfigFile(join(dir, 'configs', 'run.yaml'));
    expect(r.ok && (r.model as LayeredModel).layers.length).toBe(7);
  });

  test('are never read through a link, the file or a directory on the way', () => {
    for (const name of ['linked', 'behind']) {
      const r = loadConfigFile(join(dir, 'configs', `${name}.yaml`));
      expect(r.ok).toBe(false);
      if (!r.ok) expect(r.diagnostics.map((d) => `${d.span?.line}:${d.span?.column} ${d.code}`)).toEqual(['3:17 config/architecture-symlink']);
    }
  });
});

describe('numbers too large to hold exactly', () => {
  test('in a declaration or a config value: an error at the value, never a crash', () => {
    expect(problems(SMALL, { 'arch/net.yaml': NET.replace('max: 4\n    step: 0.25', 'max: 99999999999999999999.0\n    step: 0.25') }).map(at)).toEqual([
      'configs/run.yaml:3:17 config/architecture-failed',
      'arch/net.yaml:8:10 definition/number-too-large',
    ]);
    expect(problems(SMALL.replace('width: 0.5', 'width: 99999999999999999999.0')).map(at)).toEqual(['configs/run.yaml:4:10 config/number-too-large']);
  });
});

test('a definition holds at most 32 parameters and a list at most 16 entries (each is searched by a fix)', () => {
  const long = NET.replace('default: [1, 2]', `default: [${new Array(17).fill(1).join(', ')}]`);
  expect(problems(SMALL, { 'arch/net.yaml': long }).map(at)).toEqual(['configs/run.yaml:3:17 config/architecture-failed', 'arch/net.yaml:13:14 definition/invalid-length']);
  const many = Array.from({ length: 33 }, (_, i) => `  p${i}: {type: int, default: 1, min: 1, max: 2, description: unused}`).join('\n');
  const crowded = NET.replace('parameters:\n', `parameters:\n${many}\n`);
  const codes = problems(SMALL, { 'arch/net.yaml': crowded }).map((d) => d.code);
  expect(codes[0]).toBe('config/architecture-failed');
  expect(codes.length).toBe(2);
});
