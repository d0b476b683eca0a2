/**
 * The header of a NumPy `.npy` file (format versions 1.0, 2.0 and 3.0): magic bytes, version,
 * header length, then a Python dict literal with `descr` (the element type), `fortran_order` and
 * `shape`. Only what a data array needs is accepted: plain numeric or boolean elements, C order.
 */

export type NpyElement = 'b1' | 'i1' | 'u1' | 'i2' | 'u2' | 'i4' | 'u4' | 'i8' | 'u8' | 'f4' | 'f8';

export interface NpyHeader {
  readonly element: NpyElement;
  readonly littleEndian: boolean;
  readonly bytes: number;
  readonly shape: readonly number[];
  /** Byte offset of the first element. */
  readonly dataOffset: number;
}

export type NpyHeaderResult = { ok: true; header: NpyHeader } | { ok: false; message: string };

const MAGIC = [0x93, 0x4e, 0x55, 0x4d, 0x50, 0x59]; // \x93NUMPY
const ELEMENTS: readonly NpyElement[] = ['b1', 'i1', 'u1', 'i2', 'u2', 'i4', 'u4', 'i8', 'u8', 'f4', 'f8'];

/** Reads the header from the first bytes of the file (at least 12, all of the header if possible). */
export function parseNpyHeader(start: Uint8Array): NpyHeaderResult {
  if (start.length < 10 || MAGIC.some((b, i) => start[i] !== b)) {
    return { ok: false, message: 'not a NumPy .npy file: it does not start with the bytes \\x93NUMPY' };
  }
  const major = start[6]!;
  if (major < 1 || major > 3) return { ok: false, message: `.npy format version ${major}.${start[7]} is not supported (1.0, 2.0 and 3.0 are)` };
  const view = new DataView(start.buffer, start.byteOffset, start.byteLength);
  const lengthBytes = major === 1 ? 2 : 4;
  if (start.length < 8 + lengthBytes) return { ok: false, message: 'the .npy header is truncated' };
  const headerLength = major === 1 ? view.getUint16(8, true) : view.getUint32(8, true);
  const dataOffset = 8 + lengthBytes + headerLength;
  if (start.length < dataOffset) return { ok: false, message: 'the .npy header is truncated' };
  const text = new TextDecoder(major === 3 ? 'utf-8' : 'latin1').decode(start.subarray(8 + lengthBytes, dataOffset));

  const descr = /['"]descr['"]\s*:\s*['"]([^'"]*)['"]/.exec(text);
  if (!descr) {
    return /['"]descr['"]\s*:\s*\[/.test(text)
      ? { ok: false, message: 'the .npy array has a structured element type; save a plain numeric array' }
      : { ok: false, message: `the .npy header has no 'descr' (element type): ${text.trim()}` };
  }
  const type = /^([<>|=])([biuf])(\d+)$/.exec(descr[1]!);
  const element = type ? (`${type[2]}${type[3]}` as NpyElement) : undefined;
  if (!type || !element || !ELEMENTS.includes(element)) {
    return { ok: false, message: `the .npy element type '${descr[1]}' is not supported; use a boolean, integer (1 to 8 bytes) or float32/float64 array` };
  }
  const fortran = /['"]fortran_order['"]\s*:\s*(True|False)/.exec(text);
  if (!fortran) return { ok: false, message: `the .npy header has no 'fortran_order': ${text.trim()}` };
  if (fortran[1] === 'True') return { ok: false, message: 'the .npy array is stored in Fortran (column-major) order; save it in C order (numpy.ascontiguousarray)' };
  const shapeText = /['"]shape['"]\s*:\s*\(([^)]*)\)/.exec(text);
  if (!shapeText) return { ok: false, message: `the .npy header has no 'shape': ${text.trim()}` };
  const parts = shapeText[1]!.split(',').map((s) => s.trim()).filter((s) => s !== '');
  if (parts.some((s) => !/^\d+L?$/.test(s))) return { ok: false, message: `the .npy shape (${shapeText[1]}) is not a tuple of integers` };
  const shape = parts.map((s) => Number(s.replace(/L$/, '')));
  const bytes = Number(type[3]);
  const littleEndian = type[1] !== '>';
  return { ok: true, header: { element, littleEndian, bytes, shape, dataOffset } };
}

/** Element `index` of a record (a DataView over the record's bytes). */
export function npyElementReader(header: Pick<NpyHeader, 'element' | 'littleEndian'>): (view: DataView, index: number) => number {
  const le = header.littleEndian;
  switch (header.element) {
    case 'b1':
    case 'u1':
      return (v, i) => v.getUint8(i);
    case 'i1':
      return (v, i) => v.getInt8(i);
    case 'i2':
      return (v, i) => v.getInt16(2 * i, le);
    case 'u2':
      return (v, i) => v.getUint16(2 * i, le);
    case 'i4':
      return (v, i) => v.getInt32(4 * i, le);
    case 'u4':
      return (v, i) => v.getUint32(4 * i, le);
    case 'i8':
      return (v, i) => Number(v.getBigInt64(8 * i, le));
    case 'u8':
      return (v, i) => Number(v.getBigUint64(8 * i, le));
    case 'f4':
      return (v, i) => v.getFloat32(4 * i, le);
    case 'f8':
      return (v, i) => v.getFloat64(8 * i, le);
  }
}
