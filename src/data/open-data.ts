/**
 * Opens a data sample by what the path is: a folder (of PNG images), `.csv`, `.npy`, or
 * `.jsonl` / `.ndjson` (token sequences); and attaches labels from a separate file.
 */
import { statSync } from 'node:fs';
import { openCsv } from './csv-source.js';
import { dataError, type OpenOptions, type OpenResult } from './data-source.js';
import { openJsonl } from './jsonl-source.js';
import { readLabelsFile } from './labels-file.js';
import { openNpy } from './npy-source.js';
import { openPngFolder } from './png-folder-source.js';

export interface OpenDataOptions extends OpenOptions {
  /** A file with one label per sample. */
  readonly labelsFile?: string;
}

export function openData(path: string, options: OpenDataOptions): OpenResult {
  let isDirectory: boolean;
  try {
    isDirectory = statSync(path).isDirectory();
  } catch (e) {
    return { ok: false, diagnostics: [dataError('data/unreadable', `cannot read the data: ${(e as Error).message}`, path)] };
  }
  if (options.labelsFile !== undefined && options.labelColumn !== undefined) {
    return { ok: false, diagnostics: [dataError('data/labels', 'give labels either as a column (--label-column) or as a file (--labels), not both', path)] };
  }
  let opened: OpenResult;
  if (isDirectory) {
    if (options.labelColumn !== undefined) return { ok: false, diagnostics: [dataError('data/labels', 'an image folder has no label column; give --labels FILE with one label per image, in file-name order', path)] };
    opened = openPngFolder(path, options);
  } else if (/\.csv$/i.test(path)) opened = openCsv(path, options);
  else if (/\.npy$/i.test(path)) {
    if (options.labelColumn !== undefined) return { ok: false, diagnostics: [dataError('data/labels', 'a .npy array has no label column; give --labels FILE', path)] };
    opened = openNpy(path, options);
  } else if (/\.(jsonl|ndjson)$/i.test(path)) opened = openJsonl(path, options);
  else {
    return {
      ok: false,
      diagnostics: [dataError('data/unknown-format', 'unknown data format: give a .csv, .npy or .jsonl file, or a folder of .png images', path)],
    };
  }
  if (!opened.ok || options.labelsFile === undefined) return opened;
  const labels = readLabelsFile(options.labelsFile, opened.source.count);
  if (!labels.ok) {
    opened.source.close();
    return { ok: false, diagnostics: [labels.diagnostic] };
  }
  return { ok: true, source: opened.source, labels: labels.labels };
}
