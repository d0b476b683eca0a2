/**
 * Text formats with one sample per line (CSV, JSON Lines), read twice without holding the file:
 * a first pass hands every non-blank line to a checker and keeps each record's byte offset,
 * length and line number (16 bytes a record); later, any record is read back by a positioned
 * read. Lines are split on bytes, so a multi-byte character never straddles a chunk.
 */
import { closeSync, openSync, readSync } from 'node:fs';
import type { Diagnostic } from '../diagnostic.js';

const CHUNK = 1 << 20;

export interface LineRecords {
  readonly count: number;
  /** The text of record i (0-based), without its line break. */
  text(i: number): string;
  /** 1-based line number and byte offset of record i. */
  line(i: number): number;
  offset(i: number): number;
  close(): void;
}

/**
 * Calls `check(text, line, offset)` for every non-blank line (a UTF-8 byte-order mark at the start
 * is skipped); stops at the first diagnostic it returns.
 */
export function scanLines(file: string, check: (text: string, line: number, offset: number) => Diagnostic | undefined): { ok: true; records: LineRecords } | { ok: false; diagnostic: Diagnostic } {
  const fd = openSync(file, 'r');
  let offsets = new Float64Array(1024);
  let lengths = new Int32Array(1024);
  let lines = new Int32Array(1024);
  let count = 0;
  const push = (offset: number, length: number, line: number): void => {
    if (count === offsets.length) {
      const grow = <T extends Float64Array | Int32Array>(a: T): T => {
        const b = new (a.constructor as new (n: number) => T)(a.length * 2);
        b.set(a);
        return b;
      };
      offsets = grow(offsets);
      lengths = grow(lengths);
      lines = grow(lines);
    }
    offsets[count] = offset;
    lengths[count] = length;
    lines[count] = line;
    count++;
  };
  const buffer = Buffer.alloc(CHUNK);
  let carry: Buffer = Buffer.alloc(0);
  let carryOffset = 0;
  let position = 0;
  let line = 0;
  let failure: Diagnostic | undefined;
  const handle = (bytes: Buffer, offset: number): void => {
    line++;
    let start = 0;
    if (offset === 0 && bytes.length >= 3 && bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf) start = 3;
    let end = bytes.length;
    if (end > start && bytes[end - 1] === 0x0d) end--;
    const text = bytes.toString('utf8', start, end);
    if (text.trim() === '') return;
    failure = check(text, line, offset + start);
    if (!failure) push(offset + start, end - start, line);
  };
  try {
    for (;;) {
      const read = readSync(fd, buffer, 0, CHUNK, position);
      if (read === 0) break;
      const chunk = buffer.subarray(0, read);
      let from = 0;
      for (let i = 0; i < read && !failure; i++) {
        if (chunk[i] !== 0x0a) continue;
        const piece = chunk.subarray(from, i);
        const bytes = carry.length > 0 ? Buffer.concat([carry, piece]) : piece;
        handle(bytes, carry.length > 0 ? carryOffset : position + from);
        carry = Buffer.alloc(0);
        from = i + 1;
      }
      if (failure) break;
      if (from < read) {
        if (carry.length === 0) carryOffset = position + from;
        carry = Buffer.concat([carry, chunk.subarray(from)]);
      }
      position += read;
    }
    if (!failure && carry.length > 0) handle(carry, carryOffset);
  } catch (e) {
    closeSync(fd);
    throw e;
  }
  if (failure) {
    closeSync(fd);
    return { ok: false, diagnostic: failure };
  }
  let scratch = Buffer.alloc(0);
  return {
    ok: true,
    records: {
      count,
      text(i) {
        const length = lengths[i]!;
        if (scratch.length < length) scratch = Buffer.alloc(Math.max(length, scratch.length * 2));
        readSync(fd, scratch, 0, length, offsets[i]!);
        return scratch.toString('utf8', 0, length);
      },
      line: (i) => lines[i]!,
      offset: (i) => offsets[i]!,
      close: () => closeSync(fd),
    },
  };
}
