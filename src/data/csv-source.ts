/**
 * CSV: one sample per row, one column per position (row-major for a 2D `--shape`), optionally a
 * header row and a label column. Every value must be a finite decimal number; the scale is the
 * data's minimum and maximum unless `--range` gives one.
 */
import { statSync } from 'node:fs';
import { positionCount } from '../config/model.js';
import type { Diagnostic } from '../diagnostic.js';
import { splitCsvLine, numberOf } from './csv-fields.js';
import { changedWhileRead, dataError, dataErrorAt, labelColumn, scanDataLines, type DataSource, type OpenOptions, type OpenResult } from './data-source.js';
import { valueBatch } from './feature-batch.js';

export function openCsv(file: string, options: OpenOptions): OpenResult {
  let header: string[] | undefined;
  let columnCount = -1;
  let labelIndex = -1;
  let lo = Infinity;
  let hi = -Infinity;
  const labels: string[] = [];
  const first = { done: false };
  const labelSpec = options.labelColumn;

  const check = (text: string, line: number, offset: number): Diagnostic | undefined => {
    const split = splitCsvLine(text);
    if (!split.ok) return dataErrorAt('data/csv-syntax', split.message, file, { line, column: split.column, lineOffset: offset });
    const { fields, columns } = split;
    if (!first.done) {
      first.done = true;
      columnCount = fields.length;
      if (labelSpec !== undefined) {
        const asNumber = /^\d+$/.test(labelSpec) ? Number(labelSpec) : undefined;
        if (asNumber !== undefined) {
          if (asNumber < 1 || asNumber > fields.length) {
            return dataErrorAt('data/label-column', `--label-column ${labelSpec}: the rows have ${fields.length} columns (numbered from 1)`, file, { line, column: 1, lineOffset: offset });
          }
          labelIndex = asNumber - 1;
        } else {
          labelIndex = fields.findIndex((f) => f.trim() === labelSpec);
          if (labelIndex < 0) {
            return dataErrorAt('data/label-column', `--label-column '${labelSpec}' is not a column of the header row (${fields.map((f) => `'${f.trim()}'`).join(', ')})`, file, { line, column: 1, lineOffset: offset });
          }
          header = fields;
          return undefined;
        }
      }
      if (fields.some((f, i) => i !== labelIndex && numberOf(f) === undefined)) {
        header = fields;
        return undefined;
      }
    }
    if (fields.length !== columnCount) {
      return dataErrorAt('data/column-count', `this row has ${fields.length} columns; the first row has ${columnCount}`, file, { line, column: 1, lineOffset: offset });
    }
    for (let i = 0; i < fields.length; i++) {
      if (i === labelIndex) continue;
      const v = numberOf(fields[i]!);
      if (v === undefined) {
        const shown = fields[i]!.length > 40 ? `${fields[i]!.slice(0, 40)}…` : fields[i]!;
        return dataErrorAt('data/not-a-number', `column ${i + 1}${header ? ` ('${header[i]!.trim()}')` : ''} holds '${shown}', which is not a finite number`, file, { line, column: columns[i]!, lineOffset: offset, length: Math.max(1, fields[i]!.length) });
      }
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
    if (labelIndex >= 0) labels.push(fields[labelIndex]!.trim());
    return undefined;
  };

  const scanned = scanDataLines(file, check);
  if (!scanned.ok) return scanned;
  const records = scanned.records;
  const headerRows = header ? 1 : 0;
  const count = records.count - headerRows;
  const fail = (d: Diagnostic): OpenResult => {
    records.close();
    return { ok: false, diagnostics: [d] };
  };
  if (count < 1) return fail(dataError('data/empty', 'the file holds no data rows', file));
  const positions = columnCount - (labelIndex >= 0 ? 1 : 0);
  const shape = options.shape ?? [positions];
  if (positionCount(shape) !== positions) {
    return fail(dataError('data/shape', `--shape ${shape.join(',')} has ${positionCount(shape)} positions, but the rows have ${positions} value columns${labelIndex >= 0 ? ' besides the label' : ''}`, file));
  }
  const range = options.range ?? { lo, hi };
  const source: DataSource = {
    file,
    format: 'csv',
    count,
    shape,
    kind: 'values',
    channels: 1,
    range,
    modified: statSync(file).mtime,
    read(indices) {
      const values = new Float64Array(indices.length * positions);
      for (let k = 0; k < indices.length; k++) {
        const i0 = indices[k]! + headerRows;
        const split = splitCsvLine(records.text(i0));
        if (!split.ok || split.fields.length !== columnCount) return { ok: false, diagnostic: changedWhileRead(file, records.line(i0)) };
        let p = 0;
        for (let i = 0; i < split.fields.length; i++) {
          if (i === labelIndex) continue;
          const v = numberOf(split.fields[i]!);
          if (v === undefined) return { ok: false, diagnostic: changedWhileRead(file, records.line(i0)) };
          values[k * positions + p++] = v;
        }
      }
      return { ok: true, batch: valueBatch(values, indices.length, positions, 1, range) };
    },
    close: () => records.close(),
  };
  return labelIndex >= 0 ? { ok: true, source, labels: labelColumn(labels) } : { ok: true, source };
}
