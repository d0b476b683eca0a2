/**
 * The data readers: each format gives the samples it holds (checked through the feature map's
 * cosines), the same data in different formats gives the same measurement, and bad input is a
 * diagnostic with its place (file:line:col for text, the sample number for binary files).
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { PNG } from 'pngjs';
import { afterAll, describe, expect, test } from 'vitest';
import type { Diagnostic } from '../../src/diagnostic.js';
import type { FeatureBatch } from '../../src/data/feature-batch.js';
import { measureSource } from '../../src/data/measure.js';
import { openData, type OpenDataOptions } from '../../src/data/open-data.js';
import { seededRandom } from '../../src/data/seeded-random.js';
import { defaultPartitions, resolvePartition, type Partition } from '../../src/partition/partition.js';
import { tempDir } from './helpers.js';

const dir = tempDir();
afterAll(() => dir.remove());
const fixture = (name: string) => new URL(`./fixtures/${name}`, import.meta.url).pathname;

function write(name: string, content: string | Buffer): string {
  const path = join(dir.path, name);
  writeFileSync(path, content);
  return path;
}

function open(path: string, options: OpenDataOptions = {}) {
  const r = openData(path, options);
  if (!r.ok) throw new Error(JSON.stringify(r.diagnostics));
  return r;
}

function failure(path: string, options: OpenDataOptions = {}): Diagnostic {
  const r = openData(path, options);
  if (r.ok) {
    const read = r.source.read(Array.from({ length: r.source.count }, (_, i) => i));
    r.source.close();
    if (read.ok) throw new Error('expected a diagnostic');
    return read.diagnostic;
  }
  expect(r.diagnostics).toHaveLength(1);
  return r.diagnostics[0]!;
}

function partition(spec: string, shape: readonly number[]): Partition {
  const r = resolvePartition(spec, shape);
  if (!r.ok) throw new Error(r.message);
  return r.partition;
}

const where = (d: Diagnostic) => `${d.code}@${d.span ? `${d.span.line}:${d.span.column}` : '-'}`;

/** The values a batch holds, recovered from φ's cosine: t = (2/π)·acos(cos), v = lo + t·(hi − lo). */
function valuesOf(batch: FeatureBatch, lo: number, hi: number): number[] {
  if (batch.kind !== 'values') throw new Error('not values');
  return Array.from(batch.cos, (c) => Math.round((lo + ((2 / Math.PI) * Math.acos(Math.min(1, c))) * (hi - lo)) * 1e6) / 1e6);
}

function readAll(path: string, options: OpenDataOptions = {}) {
  const r = open(path, options);
  const read = r.source.read(Array.from({ length: r.source.count }, (_, i) => i));
  r.source.close();
  if (!read.ok) throw new Error(JSON.stringify(read.diagnostic));
  return { source: r.source, batch: read.batch, labels: r.labels };
}

/** The NumPy format (NEP 1): magic, version 1.0, header length, dict literal padded to 64 bytes. */
function npy(descr: string, shape: readonly number[], data: Uint8Array): Buffer {
  let header = `{'descr': '${descr}', 'fortran_order': False, 'shape': (${shape.join(', ')}${shape.length === 1 ? ',' : ''}), }`;
  header += ' '.repeat((64 - ((10 + header.length + 1) % 64)) % 64) + '\n';
  const head = Buffer.from([0x93, 0x4e, 0x55, 0x4d, 0x50, 0x59, 1, 0, 0, 0]);
  head.writeUInt16LE(header.length, 8);
  return Buffer.concat([head, Buffer.from(header, 'latin1'), Buffer.from(data.buffer, data.byteOffset, data.byteLength)]);
}

function png(width: number, height: number, rgb: readonly number[], channels: 1 | 3): Buffer {
  const image = new PNG({ width, height, colorType: channels === 1 ? 0 : 2, inputColorType: 2, inputHasAlpha: false });
  const data = Buffer.alloc(width * height * 3);
  for (let p = 0; p < width * height; p++) for (let c = 0; c < 3; c++) data[p * 3 + c] = rgb[p * channels + (channels === 1 ? 0 : c)]!;
  image.data = data;
  return PNG.sync.write(image, { colorType: channels === 1 ? 0 : 2, inputColorType: 2, inputHasAlpha: false });
}

describe('.npy files written by NumPy', () => {
  test('float32, 3 samples of 2×2', () => {
    const { source, batch } = readAll(fixture('numpy-f4-3x2x2.npy'));
    expect(source.shape).toEqual([2, 2]);
    expect(source.range!.lo).toBe(0);
    expect(source.range!.hi).toBeCloseTo(1, 7);
    expect(valuesOf(batch, 0, 1).map((v) => Math.round(v * 11))).toEqual([0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11]);
  });

  test('big-endian int16 with negative values', () => {
    const { source, batch } = readAll(fixture('numpy-be-i2-3x2x2.npy'));
    expect(source.range).toEqual({ lo: -5, hi: 6 });
    expect(valuesOf(batch, -5, 6)).toEqual([-5, -4, -3, -2, -1, 0, 1, 2, 3, 4, 5, 6]);
  });

  test('uint8 with a channel axis: 2 samples, 2×2 positions, 3 channels', () => {
    const { source, batch } = readAll(fixture('numpy-u1-2x2x2x3.npy'), { range: { lo: 0, hi: 255 } });
    expect([source.shape, source.channels]).toEqual([[2, 2], 3]);
    expect(valuesOf(batch, 0, 255)).toEqual(Array.from({ length: 24 }, (_, i) => i * 10));
  });

  test('format version 2.0, int64, reshaped by --shape', () => {
    const { source, batch } = readAll(fixture('numpy-v2-i8-2x3.npy'), { shape: [3] });
    expect(source.shape).toEqual([3]);
    expect(valuesOf(batch, 0, 5)).toEqual([0, 1, 2, 3, 4, 5]);
  });

  test('Fortran order is refused with a way out', () => {
    const d = failure(fixture('numpy-f8-fortran-3x4.npy'));
    expect(d.code).toBe('data/npy-header');
    expect(d.message).toContain('C order');
  });
});

describe('bad .npy input', () => {
  test.each([
    ['not npy', Buffer.from('hello world, not an array'), 'data/npy-header'],
    ['structured', npy("[('a', '<f4')]", [2, 2], new Uint8Array(16)).toString('latin1').replace(`'[('a', '<f4')]'`, `[('a', '<f4')]`), 'data/npy-header'],
    ['complex', npy('<c8', [2, 2], new Uint8Array(32)), 'data/npy-header'],
    ['one axis', npy('|u1', [4], new Uint8Array(4)), 'data/shape'],
    ['truncated', npy('|u1', [4, 4], new Uint8Array(10)), 'data/truncated'],
  ])('%s', (name, bytes, code) => {
    const path = write(`bad-${name.replace(' ', '-')}.npy`, typeof bytes === 'string' ? Buffer.from(bytes, 'latin1') : bytes);
    expect(failure(path).code).toBe(code);
  });

  test('a NaN names its sample and element', () => {
    const values = new Float32Array([0, 1, 2, 3, 4, NaN, 6, 7]);
    const d = failure(write('nan.npy', npy('<f4', [4, 2], new Uint8Array(values.buffer))));
    expect(d.code).toBe('data/not-a-number');
    expect(d.message).toContain('sample 3 of 4, element 1');
  });

  test('--shape that does not match the positions', () => {
    expect(failure(fixture('numpy-f4-3x2x2.npy'), { shape: [3] }).code).toBe('data/shape');
  });
});

describe('CSV', () => {
  test('a header, a label column by name, a 2D shape; labels sorted numerically', () => {
    const path = write('small.csv', 'a,b,digit,c,d\n0,1,10,2,3\n4,5,9,6,7\n8,9,10,10,11\n');
    const { source, batch, labels } = readAll(path, { shape: [2, 2], labelColumn: 'digit' });
    expect([source.count, source.shape, source.range]).toEqual([3, [2, 2], { lo: 0, hi: 11 }]);
    expect(valuesOf(batch, 0, 11)).toEqual([0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11]);
    expect(labels!.classes).toEqual(['9', '10']);
    expect(Array.from(labels!.of)).toEqual([1, 0, 1]);
  });

  test('no header, the label column by number, quoted fields, CRLF and a byte-order mark', () => {
    const path = write('quoted.csv', '\ufeff1,"2",cat\r\n3,4,"dog, big"\r\n\r\n');
    const { source, batch, labels } = readAll(path, { labelColumn: '3' });
    expect([source.count, source.shape]).toEqual([2, [2]]);
    expect(valuesOf(batch, 1, 4)).toEqual([1, 2, 3, 4]);
    expect(labels!.classes).toEqual(['cat', 'dog, big']);
  });

  test.each([
    ['x.csv', '1,2,3\n4,oops,6\n', {}, 'data/not-a-number@2:3'],
    ['y.csv', '1,2,3\n4,5\n', {}, 'data/column-count@2:1'],
    ['z.csv', '1,2\n"3,4\n', {}, 'data/csv-syntax@2:1'],
    ['w.csv', 'a,b\n1,2\n', { labelColumn: 'label' }, 'data/label-column@1:1'],
    ['v.csv', '1,2,3\n', { shape: [2, 2] }, 'data/shape@-'],
    ['u.csv', 'a,b\n', {}, 'data/empty@-'],
    ['t.csv', '1,2\n3,nan\n', {}, 'data/not-a-number@2:3'],
  ])('%s: %j', (name, text, options, expected) => {
    expect(where(failure(write(name, text), options))).toBe(expected);
  });
});

describe('JSON Lines token sequences', () => {
  test('arrays of strings and integers; a vocabulary of the distinct tokens', () => {
    const path = write('tokens.jsonl', '["a", 1, "b"]\n["b", 1, "a"]\n\n["a", 2, "a"]\n');
    const { source, batch } = readAll(path);
    expect([source.count, source.shape, source.vocabulary, source.kind]).toEqual([3, [3], 4, 'tokens']);
    if (batch.kind !== 'tokens') throw new Error('tokens expected');
    expect(Array.from(batch.ids)).toEqual([0, 1, 2, 2, 1, 0, 0, 3, 0]);
  });

  test('objects with a label key; --length cuts and pads with a token of its own', () => {
    const path = write('labelled.jsonl', '{"tokens": ["x", "y", "z"], "label": "pos"}\n{"tokens": ["y"], "label": "neg"}\n');
    const { source, batch, labels } = readAll(path, { labelColumn: 'label', length: 2 });
    expect([source.shape, source.vocabulary]).toEqual([[2], 3]);
    if (batch.kind !== 'tokens') throw new Error('tokens expected');
    expect(Array.from(batch.ids)).toEqual([0, 1, 1, -1]);
    expect(labels!.classes).toEqual(['neg', 'pos']);
  });

  test('a copied pair in a file measures exactly 1 bit (as in known-answers)', () => {
    const r = open(write('pair.jsonl', '["on", "on"]\n["off", "off"]\n'));
    const m = measureSource(r.source, [partition('start-end', [2])], undefined, { batch: 2 });
    if (!m.ok) throw new Error('measured');
    expect(m.measurement.partitions[0]!.bits).toBeCloseTo(1, 12);
  });

  test.each([
    ['a.jsonl', '["a"]\n["a", ]\n', {}, 'data/jsonl@2:'],
    ['b.jsonl', '["a", "b"]\n["a"]\n', {}, 'data/length@2:1'],
    ['c.jsonl', '["a", 1.5]\n', {}, 'data/token@1:1'],
    ['d.jsonl', '{"words": []}\n', {}, 'data/jsonl@1:1'],
    ['e.jsonl', '["a"]\n', { labelColumn: 'label' }, 'data/jsonl@1:1'],
    ['f.jsonl', '{"tokens": ["a"], "class": null}\n', { labelColumn: 'class' }, 'data/jsonl@1:1'],
    ['g.jsonl', '["a", "b"]\n', { shape: [2, 1] }, 'data/shape@-'],
  ])('%s: %j', (name, text, options, expected) => {
    expect(where(failure(write(name, text), options)).startsWith(expected)).toBe(true);
  });
});

describe('the same data in every format gives the same measurement', () => {
  const random = seededRandom(42);
  const n = 40;
  const grey = Array.from({ length: n }, () => Array.from({ length: 6 }, () => Math.floor(random() * 4) * 85));
  const labels = grey.map((_, i) => (i % 3 === 0 ? 'yes' : 'no'));

  function measured(path: string, options: OpenDataOptions) {
    const r = open(path, options);
    const shape = r.source.shape;
    const parts = defaultPartitions(shape).map((s) => partition(s, shape));
    const m = measureSource(r.source, parts, r.labels, { batch: 20 });
    r.source.close();
    if (!m.ok) throw new Error(JSON.stringify(m.diagnostics));
    return m.measurement.partitions.map((p) => [p.partition, p.bits, p.spread]);
  }

  test('grey: CSV with a label column, .npy with a labels file, a PNG folder with a labels file', () => {
    const csv = write('same.csv', grey.map((row, i) => [...row.slice(0, 3), labels[i], ...row.slice(3)].join(',')).join('\n') + '\n');
    const npyPath = write('same.npy', npy('|u1', [n, 2, 3], Uint8Array.from(grey.flat())));
    const labelsPath = write('same-labels.txt', labels.join('\n') + '\n');
    const folder = join(dir.path, 'same-png');
    mkdirSync(folder);
    grey.forEach((row, i) => writeFileSync(join(folder, `img-${String(i).padStart(3, '0')}.png`), png(3, 2, row, 1)));
    const range = { lo: 0, hi: 255 };
    const fromCsv = measured(csv, { shape: [2, 3], labelColumn: '4', range });
    expect(fromCsv.map((p) => p[0])).toEqual(['left-right', 'top-bottom', 'checkerboard']);
    expect(measured(npyPath, { labelsFile: labelsPath })).toEqual(fromCsv);
    expect(measured(folder, { labelsFile: labelsPath })).toEqual(fromCsv);
  });

  test('colour: a PNG folder and a .npy array with a channel axis', () => {
    const rgb = Array.from({ length: n }, () => Array.from({ length: 2 * 2 * 3 }, () => Math.floor(random() * 3) * 127));
    const npyPath = write('rgb.npy', npy('|u1', [n, 2, 2, 3], Uint8Array.from(rgb.flat())));
    const folder = join(dir.path, 'rgb-png');
    mkdirSync(folder);
    rgb.forEach((row, i) => writeFileSync(join(folder, `${String(i).padStart(3, '0')}.png`), png(2, 2, row, 3)));
    expect(measured(folder, {})).toEqual(measured(npyPath, { range: { lo: 0, hi: 255 } }));
  });

  test('a PNG of another size, or not a PNG, is named', () => {
    const folder = join(dir.path, 'mixed-png');
    mkdirSync(folder);
    writeFileSync(join(folder, 'a.png'), png(2, 2, [0, 1, 2, 3], 1));
    writeFileSync(join(folder, 'b.png'), png(3, 2, [0, 1, 2, 3, 4, 5], 1));
    const d = failure(folder);
    expect([d.code, d.file]).toEqual(['data/image-size', join(folder, 'b.png')]);
    writeFileSync(join(folder, 'b.png'), 'not an image');
    expect(failure(folder).code).toBe('data/png');
  });

  test('a labels file with the wrong count', () => {
    const labelsPath = write('short-labels.txt', 'a\nb\n');
    expect(failure(fixture('numpy-f4-3x2x2.npy'), { labelsFile: labelsPath }).code).toBe('data/labels');
  });
});
