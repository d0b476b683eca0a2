/**
 * What the measurement reads from a data file, whatever its format: the sample count, the shape
 * of the positions, what a position holds (values with their scale, or tokens), optional class
 * labels, and random access to any samples by index. Opening a source reads the file once (to
 * index records, find the value range and check the text), so that batches can then be drawn in
 * any order with memory for one batch only.
 */
import type { Diagnostic } from '../diagnostic.js';
import type { Shape } from '../config/model.js';
import type { FeatureBatch, ValueRange } from './feature-batch.js';
import { scanLines, type LineRecords } from './line-records.js';

export type DataFormat = 'csv' | 'npy' | 'png' | 'jsonl';

export interface DataSource {
  /** The path as given. */
  readonly file: string;
  readonly format: DataFormat;
  readonly count: number;
  /** Shape of the positions (1D or 2D), as for configs. */
  readonly shape: Shape;
  readonly kind: 'values' | 'tokens';
  /** Values per position (1 for tokens). */
  readonly channels: number;
  /** For values: the scale lo … hi (from the data, the image depth, or `--range`). */
  readonly range?: ValueRange;
  /** For tokens: distinct tokens seen (plus one for padding when sequences were padded). */
  readonly vocabulary?: number;
  /** Newest modification time of the file(s) read. */
  readonly modified: Date;
  /** The samples, in order. */
  read(indices: ArrayLike<number>): ReadResult;
  close(): void;
}

export type ReadResult = { ok: true; batch: FeatureBatch } | { ok: false; diagnostic: Diagnostic };

export type OpenResult = { ok: true; source: DataSource; labels?: LabelColumn } | { ok: false; diagnostics: Diagnostic[] };

/** Class labels, one per sample, as indices into `classes` (sorted). */
export interface LabelColumn {
  readonly classes: readonly string[];
  readonly of: Int32Array;
}

export interface OpenOptions {
  /** Required shape of the positions (CSV), or a reshape of the positions (`.npy`). */
  readonly shape?: Shape;
  readonly range?: ValueRange;
  /** CSV column (header name or 1-based number) or JSON Lines key holding the label. */
  readonly labelColumn?: string;
  /** JSON Lines: sequences are cut or padded to this length. */
  readonly length?: number;
}

/** Builds label indices from label texts, classes sorted by their text (numbers numerically). */
export function labelColumn(texts: readonly string[]): LabelColumn {
  const distinct = [...new Set(texts)];
  const numeric = distinct.every((t) => t.trim() !== '' && Number.isFinite(Number(t)));
  distinct.sort(numeric ? (a, b) => Number(a) - Number(b) || (a < b ? -1 : a > b ? 1 : 0) : (a, b) => (a < b ? -1 : a > b ? 1 : 0));
  const index = new Map(distinct.map((c, i) => [c, i]));
  return { classes: distinct, of: Int32Array.from(texts, (t) => index.get(t)!) };
}

export function dataError(code: string, message: string, file: string): Diagnostic {
  return { code, message, file, severity: 'error' };
}

/** `scanLines` for a data source: a file that cannot be read, or a line `check` refuses, is a diagnostic. */
export function scanDataLines(
  file: string,
  check: (text: string, line: number, offset: number) => Diagnostic | undefined,
): { ok: true; records: LineRecords } | { ok: false; diagnostics: Diagnostic[] } {
  try {
    const scanned = scanLines(file, check);
    return scanned.ok ? scanned : { ok: false, diagnostics: [scanned.diagnostic] };
  } catch (e) {
    return { ok: false, diagnostics: [dataError('data/unreadable', `cannot read the data file: ${(e as Error).message}`, file)] };
  }
}

/** A diagnostic at `column` (1-based, characters) of line `line`, the line starting at byte `lineOffset`. */
export function dataErrorAt(code: string, message: string, file: string, at: { line: number; column: number; lineOffset: number; length?: number }): Diagnostic {
  const length = Math.max(1, at.length ?? 1);
  const offset = at.lineOffset + at.column - 1;
  return {
    code,
    message,
    file,
    span: { offset, endOffset: offset + length, line: at.line, column: at.column, endLine: at.line, endColumn: at.column + length },
    severity: 'error',
  };
}

/** A record that passed the first reading no longer reads the same: the file changed meanwhile. */
export function changedWhileRead(file: string, line: number): Diagnostic {
  return dataError('data/changed', `line ${line} changed while the file was being read; measure a file that is not being written`, file);
}
