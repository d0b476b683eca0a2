/**
 * A folder of PNG images, one sample per image, in file-name order: every image must have the
 * size of the first; grey images give one value per pixel, colour (and palette) images three
 * (alpha is ignored). Decoded by a pure-JavaScript decoder at 8 bits per channel (16-bit images
 * are scaled down), so the scale is 0 … 255.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { PNG } from 'pngjs';
import { dataError, type DataSource, type OpenOptions, type OpenResult, type ReadResult } from './data-source.js';
import { valueBatch } from './feature-batch.js';

interface Decoded {
  readonly width: number;
  readonly height: number;
  readonly color: boolean;
  readonly rgba: Buffer;
}

function decode(path: string): Decoded | string {
  try {
    const png = PNG.sync.read(readFileSync(path));
    return { width: png.width, height: png.height, color: png.color, rgba: png.data };
  } catch (e) {
    return `not a readable PNG image: ${(e as Error).message}`;
  }
}

export function openPngFolder(dir: string, options: OpenOptions): OpenResult {
  let names: string[];
  try {
    names = readdirSync(dir).filter((n) => /\.png$/i.test(n) && statSync(join(dir, n)).isFile());
  } catch (e) {
    return { ok: false, diagnostics: [dataError('data/unreadable', `cannot read the image folder: ${(e as Error).message}`, dir)] };
  }
  names.sort((a, b) => (a < b ? -1 : a > b ? 1 : 0));
  if (names.length === 0) return { ok: false, diagnostics: [dataError('data/empty', 'the folder holds no .png images', dir)] };
  const files = names.map((n) => join(dir, n));
  const firstImage = decode(files[0]!);
  if (typeof firstImage === 'string') return { ok: false, diagnostics: [dataError('data/png', firstImage, files[0]!)] };
  const { width, height } = firstImage;
  const channels = firstImage.color ? 3 : 1;
  const shape = [height, width];
  if (options.shape && (options.shape.length !== 2 || options.shape[0] !== height || options.shape[1] !== width)) {
    return { ok: false, diagnostics: [dataError('data/shape', `--shape ${options.shape.join(',')} differs from the images' size ${height}×${width} (height × width)`, files[0]!)] };
  }
  let modified = 0;
  for (const f of files) modified = Math.max(modified, statSync(f).mtimeMs);
  const range = options.range ?? { lo: 0, hi: 255 };
  const positions = width * height;
  const source: DataSource = {
    file: dir,
    format: 'png',
    count: files.length,
    shape,
    kind: 'values',
    channels,
    range,
    modified: new Date(modified),
    read(indices): ReadResult {
      const values = new Float64Array(indices.length * positions * channels);
      for (let k = 0; k < indices.length; k++) {
        const path = files[indices[k]!]!;
        const image = decode(path);
        if (typeof image === 'string') return { ok: false, diagnostic: dataError('data/png', image, path) };
        if (image.width !== width || image.height !== height) {
          return { ok: false, diagnostic: dataError('data/image-size', `the image is ${image.height}×${image.width}; the first image (${names[0]}) is ${height}×${width}; every image must have one size`, path) };
        }
        if (image.color && channels === 1) {
          return { ok: false, diagnostic: dataError('data/image-colour', `the image is in colour, but the first image (${names[0]}) is grey; convert the folder to one kind`, path) };
        }
        const base = k * positions * channels;
        for (let p = 0; p < positions; p++) {
          for (let c = 0; c < channels; c++) values[base + p * channels + c] = image.rgba[p * 4 + c]!;
        }
      }
      return { ok: true, batch: valueBatch(values, indices.length, positions, channels, range) };
    },
    close: () => undefined,
  };
  return { ok: true, source };
}
