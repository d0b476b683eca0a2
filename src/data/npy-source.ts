/**
 * NumPy `.npy` arrays: the first axis is the sample, then the positions ([length] or
 * [height, width]), then an optional channel axis. `--shape` may reshape the positions (e.g.
 * (n, 784) read as 28×28). Floats must be finite. The scale is the data's minimum and maximum
 * unless `--range` gives one.
 */
import { closeSync, fstatSync, openSync, readSync } from 'node:fs';
import { positionCount, type Shape } from '../config/model.js';
import type { Diagnostic } from '../diagnostic.js';
import { dataError, type DataSource, type OpenOptions, type OpenResult } from './data-source.js';
import { valueBatch } from './feature-batch.js';
import { npyElementReader, parseNpyHeader } from './npy-header.js';

const HEADER_PROBE = 65536 + 12;
const SCAN_RECORDS_BYTES = 1 << 22;

export function openNpy(file: string, options: OpenOptions): OpenResult {
  let fd: number;
  try {
    fd = openSync(file, 'r');
  } catch (e) {
    return { ok: false, diagnostics: [dataError('data/unreadable', `cannot read the data file: ${(e as Error).message}`, file)] };
  }
  const fail = (code: string, message: string): OpenResult => {
    closeSync(fd);
    return { ok: false, diagnostics: [dataError(code, message, file)] };
  };
  const size = fstatSync(fd).size;
  const probe = Buffer.alloc(Math.min(HEADER_PROBE, size));
  readSync(fd, probe, 0, probe.length, 0);
  const parsed = parseNpyHeader(probe);
  if (!parsed.ok) return fail('data/npy-header', parsed.message);
  const header = parsed.header;
  const dims = header.shape;
  if (dims.length < 2 || dims.length > 4) {
    return fail('data/shape', `the array has shape (${dims.join(', ')}); expected (samples, length), (samples, height, width) or (samples, height, width, channels)`);
  }
  const count = dims[0]!;
  const channels = dims.length === 4 ? dims[3]! : 1;
  const natural: Shape = dims.length === 2 ? [dims[1]!] : [dims[1]!, dims[2]!];
  const positions = positionCount(natural);
  if (count < 1 || positions < 1 || channels < 1) return fail('data/empty', `the array has shape (${dims.join(', ')}) and holds no samples or no positions`);
  const shape = options.shape ?? natural;
  if (positionCount(shape) !== positions) {
    return fail('data/shape', `--shape ${shape.join(',')} has ${positionCount(shape)} positions, but each sample of the array (${dims.join(', ')}) has ${positions}`);
  }
  const perRecord = positions * channels;
  const recordBytes = perRecord * header.bytes;
  const need = header.dataOffset + count * recordBytes;
  if (size < need) return fail('data/truncated', `the file is truncated: its header promises ${count} samples (${need} bytes), but it has ${size} bytes`);
  const element = npyElementReader(header);
  const isFloat = header.element === 'f4' || header.element === 'f8';

  const badValue = (sample: number, index: number, v: number): Diagnostic =>
    dataError('data/not-a-number', `sample ${sample + 1} of ${count}, element ${index} (0-based, row-major within the sample): ${v} is not a finite number`, file);

  let range = options.range;
  if (!range || isFloat) {
    // One pass over the data: the value range, and a check that every float is finite.
    let lo = Infinity;
    let hi = -Infinity;
    const perChunk = Math.max(1, Math.floor(SCAN_RECORDS_BYTES / recordBytes));
    const buffer = Buffer.alloc(perChunk * recordBytes);
    for (let s0 = 0; s0 < count; s0 += perChunk) {
      const records = Math.min(perChunk, count - s0);
      readSync(fd, buffer, 0, records * recordBytes, header.dataOffset + s0 * recordBytes);
      const view = new DataView(buffer.buffer, buffer.byteOffset, records * recordBytes);
      for (let i = 0; i < records * perRecord; i++) {
        const v = element(view, i);
        if (!Number.isFinite(v)) {
          closeSync(fd);
          return { ok: false, diagnostics: [badValue(s0 + Math.floor(i / perRecord), i % perRecord, v)] };
        }
        if (v < lo) lo = v;
        if (v > hi) hi = v;
      }
    }
    range ??= { lo, hi };
  }
  const scale = range;
  const record = Buffer.alloc(recordBytes);
  const source: DataSource = {
    file,
    format: 'npy',
    count,
    shape,
    kind: 'values',
    channels,
    range: scale,
    modified: fstatSync(fd).mtime,
    read(indices) {
      const values = new Float64Array(indices.length * perRecord);
      const view = new DataView(record.buffer, record.byteOffset, recordBytes);
      for (let k = 0; k < indices.length; k++) {
        readSync(fd, record, 0, recordBytes, header.dataOffset + indices[k]! * recordBytes);
        for (let i = 0; i < perRecord; i++) values[k * perRecord + i] = element(view, i);
      }
      return { ok: true, batch: valueBatch(values, indices.length, positions, channels, scale) };
    },
    close: () => closeSync(fd),
  };
  return { ok: true, source };
}
