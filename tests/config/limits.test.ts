import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, test } from 'vitest';
import { loadConfigFile, loadConfigText } from '../../src/config/load-config.js';
import { codesAt, diagnostics, layered, loadLayered } from './helpers.js';

/** Nine levels of nine aliases each: 9^9 layers if expanded naively. */
function billionLaughs(): string {
  const lines = ['a0: &a0 [{dense: {units: 1}}]'];
  for (let i = 1; i <= 9; i++) {
    const refs = Array.from({ length: 9 }, () => `*a${i - 1}`).join(', ');
    lines.push(`a${i}: &a${i} [${refs}]`);
  }
  lines.push('model:', '  input: {shape: [4], features: 2}', '  layers: *a9');
  return lines.join('\n') + '\n';
}

describe('alias expansion', () => {
  test('a billion-laughs document is refused with a diagnostic', () => {
    const d = diagnostics(billionLaughs());
    expect(d.map((x) => x.code)).toEqual(['config/alias-limit']);
    expect(d[0]!.message).toContain('too many alias expansions');
    // the alias whose expansion went over the budget
    expect(d[0]!.span).toMatchObject({ line: 2, column: 10 });
  });

  test('the same bomb outside the model is never expanded', () => {
    const text = billionLaughs().replace('  layers: *a9', '  layers: [{dense: {units: 1}}]');
    expect(loadLayered(text).layers).toHaveLength(1);
  });

  test('a few aliases are fine', () => {
    const text = 'b: &b {conv: {channels: 4}}\nmodel:\n  input: {shape: [4], features: 2}\n  layers: [*b, *b, *b]\n';
    const m = loadLayered(text);
    expect(m.layers.map((l) => l.index)).toEqual([0, 1, 2]);
    // the layer span is where the alias is used, the field spans where the anchor defines them
    expect(m.layers[1]!.span).toMatchObject({ line: 4, column: 16 });
    expect(m.layers[1]!.fieldSpans['channels']).toMatchObject({ line: 1, column: 25 });
  });

  test('a redefined anchor: each alias takes the last definition before it', () => {
    const text = 'x: &l {dense: {units: 1}}\nmodel:\n  input: {shape: [4], features: 2}\n  layers:\n    - *l\n    - &l {dense: {units: 2}}\n    - *l\n';
    expect(loadLayered(text).layers.map((l) => (l.kind === 'dense' ? l.units : 0))).toEqual([1, 2, 2]);
  });

  test('an alias inside its own anchor is a cycle, not a stack overflow', () => {
    const text = 'model: &m\n  input: {shape: [4], features: 2}\n  layers: [*m]\n';
    expect(codesAt(text)).toEqual(['config/alias-cycle@3:12']);
  });

  test('an alias to a missing anchor is a YAML error', () => {
    expect(codesAt('model: *nothing\n').map((c) => c.split('@')[0])).toEqual(['config/yaml']);
  });
});

describe('size and depth', () => {
  test('a document larger than 4 MiB is refused before parsing', () => {
    const text = layered('    - dense: {units: 1}\n', '[4]') + '# ' + 'x'.repeat(4 * 1024 * 1024) + '\n';
    const d = diagnostics(text);
    expect(d.map((x) => x.code)).toEqual(['config/too-large']);
    expect(d[0]!.span).toBeUndefined();
  });

  test('4 MiB counts UTF-8 bytes', () => {
    const text = layered('    - dense: {units: 1}\n', '[4]') + '# ' + 'é'.repeat(2 * 1024 * 1024) + '\n';
    expect(text.length).toBeLessThan(4 * 1024 * 1024);
    expect(codesAt(text)).toEqual(['config/too-large']);
  });

  test('deep flow nesting is a YAML resource error, not a crash', () => {
    const text = `model:\n  input: ${'['.repeat(5000)}${']'.repeat(5000)}\n`;
    const codes = codesAt(text).map((c) => c.split('@')[0]);
    expect(codes).toEqual(['config/yaml']);
  });

  test('deep nesting inside the model is refused', () => {
    const text = `model:\n  input: {shape: [4], features: 2}\n  layers: [{dense: {units: ${'['.repeat(150)}1${']'.repeat(150)}}}]\n`;
    expect(codesAt(text).map((c) => c.split('@')[0])).toEqual(['config/too-deep']);
  });
});

describe('loading a file', () => {
  const dir = mkdtempSync(join(tmpdir(), 'rankfloor-config-'));

  test('reads and loads a file, with its path in every diagnostic', () => {
    const good = join(dir, 'good.yaml');
    writeFileSync(good, layered('    - dense: {units: 1}\n', '[4]'));
    const r = loadConfigFile(good);
    expect(r.ok && r.model.file).toBe(good);
    const bad = join(dir, 'bad.yaml');
    writeFileSync(bad, layered('    - dense: {units: 0}\n', '[4]'));
    const b = loadConfigFile(bad);
    expect(b.ok).toBe(false);
    if (!b.ok) expect(b.diagnostics.map((x) => [x.file, x.code, x.span?.line, x.span?.column])).toEqual([[bad, 'config/invalid-number', 6, 22]]);
  });

  test('a missing file or a directory is config/unreadable without a span', () => {
    for (const path of [join(dir, 'nope.yaml'), dir]) {
      const r = loadConfigFile(path);
      expect(r.ok).toBe(false);
      if (!r.ok) {
        expect(r.diagnostics.map((x) => [x.code, x.file, x.span])).toEqual([['config/unreadable', path, undefined]]);
      }
    }
  });

  test('the model path option reaches the file loader', () => {
    const path = join(dir, 'train.yaml');
    writeFileSync(path, 'lr: 1\narch:\n  input: {shape: [2], features: 1}\n  layers: [{dense: {units: 1}}]\n');
    expect(loadConfigFile(path, { modelPath: '/arch' }).ok).toBe(true);
    expect(loadConfigFile(path).ok).toBe(false);
  });
});

describe('never throws for user input', () => {
  test.each([
    ['binary junk', '\u0000\u0001\u0002: [\u0003'],
    ['a bare scalar document', '42\n'],
    ['a list document', '- 1\n- 2\n'],
    ['odd keys', 'model:\n  ? [a, b]\n  : 1\n'],
    ['a null key', 'model:\n  ~: 1\n'],
    ['__proto__ as a field', layered('    - conv: {channels: 1, __proto__: {x: 1}}\n')],
    ['constructor as a kind', layered('    - constructor: {}\n')],
    ['tags', 'model: !!str 3\n'],
    ['a huge integer', layered('    - dense: {units: 1e400}\n')],
    ['.inf and .nan', layered('    - dense: {units: .inf}\n    - dense: {units: .nan}\n')],
  ])('%s', (_, text) => {
    const r = loadConfigText(text, 'x.yaml');
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.diagnostics.length).toBeGreaterThan(0);
      for (const d of r.diagnostics) expect(d.code.startsWith('config/')).toBe(true);
    }
  });

  test('__proto__ is reported as an unknown field at its key', () => {
    expect(codesAt(layered('    - conv: {channels: 1, __proto__: {x: 1}}\n'))).toEqual(['config/unknown-field@6:27']);
  });

  test('a YAML merge key is an unknown field with its own explanation', () => {
    const text = 'defaults: &d {kernel: 3}\nmodel:\n  input: {shape: [4], features: 2}\n  layers:\n    - conv: {<<: *d, channels: 4}\n';
    const d = diagnostics(text);
    expect(d.map((x) => `${x.code}@${x.span?.line}:${x.span?.column}`)).toEqual(['config/unknown-field@5:14']);
    expect(d[0]!.message).toContain("merge key ('<<')");
  });

  test('a non-string key is config/key-type', () => {
    expect(codesAt('model:\n  ? [a, b]\n  : 1\n')).toEqual(['config/key-type@2:5']);
  });
});
