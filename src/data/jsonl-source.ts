/**
 * Token sequences as JSON Lines: each line is an array of tokens (strings or integers), or an
 * object with a `tokens` array (and, with `--label-column KEY`, a label under KEY). Every sequence
 * must have the length of the first, unless `--length L` is given: longer ones are cut to their
 * first L tokens, shorter ones padded with a padding token distinct from every real token.
 */
import { statSync } from 'node:fs';
import type { Diagnostic } from '../diagnostic.js';
import { changedWhileRead, dataError, dataErrorAt, labelColumn, scanDataLines, type DataSource, type OpenOptions, type OpenResult } from './data-source.js';
import { tokenBatch } from './feature-batch.js';

type Parsed = { ok: true; tokens: unknown[]; label?: string } | { ok: false; message: string; column: number };

function parseRecord(text: string, labelKey: string | undefined): Parsed {
  let value: unknown;
  try {
    value = JSON.parse(text);
  } catch (e) {
    const message = (e as Error).message;
    const at = /position (\d+)/.exec(message);
    return { ok: false, message: `not valid JSON: ${message}`, column: at ? Number(at[1]) + 1 : 1 };
  }
  if (Array.isArray(value)) {
    if (labelKey !== undefined) return { ok: false, message: `the record is an array, so it has no label '${labelKey}'; write {"tokens": [...], "${labelKey}": ...}`, column: 1 };
    return { ok: true, tokens: value };
  }
  if (value !== null && typeof value === 'object' && Array.isArray((value as Record<string, unknown>)['tokens'])) {
    const record = value as Record<string, unknown>;
    if (labelKey === undefined) return { ok: true, tokens: record['tokens'] as unknown[] };
    const label = record[labelKey];
    if (typeof label !== 'string' && !(typeof label === 'number' && Number.isFinite(label)) && typeof label !== 'boolean') {
      return { ok: false, message: `the record has no label '${labelKey}' (a string, number or boolean)`, column: 1 };
    }
    return { ok: true, tokens: record['tokens'] as unknown[], label: String(label) };
  }
  return { ok: false, message: 'a record must be an array of tokens or an object with a "tokens" array', column: 1 };
}

function tokenKey(token: unknown): string | undefined {
  if (typeof token === 'string') return `s${token}`;
  if (typeof token === 'number' && Number.isInteger(token)) return `n${token}`;
  return undefined;
}

export function openJsonl(file: string, options: OpenOptions): OpenResult {
  const vocabulary = new Map<string, number>();
  const labels: string[] = [];
  let length = options.length ?? -1;
  let padded = false;
  const labelKey = options.labelColumn;

  const check = (text: string, line: number, offset: number): Diagnostic | undefined => {
    const parsed = parseRecord(text, labelKey);
    if (!parsed.ok) return dataErrorAt('data/jsonl', parsed.message, file, { line, column: parsed.column, lineOffset: offset });
    const tokens = parsed.tokens;
    if (length < 0) length = tokens.length;
    if (options.length === undefined && tokens.length !== length) {
      return dataErrorAt('data/length', `this sequence has ${tokens.length} tokens; the first has ${length}; give --length L to cut or pad every sequence to L`, file, { line, column: 1, lineOffset: offset });
    }
    if (tokens.length < length) padded = true;
    for (let i = 0; i < Math.min(tokens.length, length); i++) {
      const key = tokenKey(tokens[i]);
      if (key === undefined) {
        return dataErrorAt('data/token', `token ${i + 1} is ${JSON.stringify(tokens[i])}; a token is a string or an integer`, file, { line, column: 1, lineOffset: offset });
      }
      if (!vocabulary.has(key)) vocabulary.set(key, vocabulary.size);
    }
    if (parsed.label !== undefined) labels.push(parsed.label);
    return undefined;
  };

  const scanned = scanDataLines(file, check);
  if (!scanned.ok) return scanned;
  const records = scanned.records;
  if (records.count === 0 || length < 1) {
    records.close();
    return { ok: false, diagnostics: [dataError('data/empty', records.count === 0 ? 'the file holds no records' : 'the sequences are empty', file)] };
  }
  const positions = length;
  if (options.shape && (options.shape.length !== 1 || options.shape[0] !== positions)) {
    records.close();
    return { ok: false, diagnostics: [dataError('data/shape', `--shape ${options.shape.join(',')} does not match the sequences' length ${positions}; token sequences are 1D (use --length to cut or pad them)`, file)] };
  }
  const pad = -1;
  const source: DataSource = {
    file,
    format: 'jsonl',
    count: records.count,
    shape: [positions],
    kind: 'tokens',
    channels: 1,
    vocabulary: vocabulary.size + (padded ? 1 : 0),
    modified: statSync(file).mtime,
    read(indices) {
      const ids = new Int32Array(indices.length * positions).fill(pad);
      for (let k = 0; k < indices.length; k++) {
        const parsed = parseRecord(records.text(indices[k]!), labelKey);
        if (!parsed.ok) return { ok: false, diagnostic: changedWhileRead(file, records.line(indices[k]!)) };
        for (let i = 0; i < Math.min(parsed.tokens.length, positions); i++) {
          const id = vocabulary.get(tokenKey(parsed.tokens[i]) ?? '');
          if (id === undefined) return { ok: false, diagnostic: changedWhileRead(file, records.line(indices[k]!)) };
          ids[k * positions + i] = id;
        }
      }
      return { ok: true, batch: tokenBatch(ids, indices.length, positions) };
    },
    close: () => records.close(),
  };
  return labelKey !== undefined ? { ok: true, source, labels: labelColumn(labels) } : { ok: true, source };
}
