/**
 * Labels kept apart from the data: a text file with one label per line (blank lines ignored),
 * or a one-dimensional `.npy` array, in sample order (for an image folder: file-name order).
 */
import { readFileSync } from 'node:fs';
import type { Diagnostic } from '../diagnostic.js';
import { dataError, labelColumn, type LabelColumn } from './data-source.js';
import { npyElementReader, parseNpyHeader } from './npy-header.js';

const MAX_LABEL_FILE_BYTES = 256 * 1024 * 1024;

export function readLabelsFile(file: string, samples: number): { ok: true; labels: LabelColumn } | { ok: false; diagnostic: Diagnostic } {
  let bytes: Buffer;
  try {
    bytes = readFileSync(file);
  } catch (e) {
    return { ok: false, diagnostic: dataError('data/unreadable', `cannot read the labels file: ${(e as Error).message}`, file) };
  }
  if (bytes.length > MAX_LABEL_FILE_BYTES) return { ok: false, diagnostic: dataError('data/labels', 'the labels file is larger than 256 MiB', file) };
  let texts: string[];
  if (/\.npy$/i.test(file)) {
    const parsed = parseNpyHeader(bytes);
    if (!parsed.ok) return { ok: false, diagnostic: dataError('data/npy-header', parsed.message, file) };
    const { header } = parsed;
    if (header.shape.length !== 1) return { ok: false, diagnostic: dataError('data/labels', `a labels array must be one-dimensional; this one has shape (${header.shape.join(', ')})`, file) };
    const n = header.shape[0]!;
    if (bytes.length < header.dataOffset + n * header.bytes) return { ok: false, diagnostic: dataError('data/truncated', `the file is truncated: its header promises ${n} labels`, file) };
    const view = new DataView(bytes.buffer, bytes.byteOffset + header.dataOffset, n * header.bytes);
    const element = npyElementReader(header);
    texts = Array.from({ length: n }, (_, i) => String(element(view, i)));
  } else {
    texts = bytes
      .toString('utf8')
      .split(/\r?\n/)
      .map((t) => t.trim())
      .filter((t) => t !== '');
  }
  if (texts.length !== samples) {
    return { ok: false, diagnostic: dataError('data/labels', `the labels file has ${texts.length} labels, but the data has ${samples} samples; give one label per sample, in order`, file) };
  }
  return { ok: true, labels: labelColumn(texts) };
}
