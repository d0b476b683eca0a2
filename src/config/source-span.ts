/**
 * Turns character offsets of the YAML source into the `Span` that diagnostics and model nodes
 * carry. Kept apart so that every stage of the loader computes positions the same way.
 */
import type { LineCounter } from 'yaml';
import type { Span } from '../diagnostic.js';

export function spanFromOffsets(lines: LineCounter, offset: number, endOffset: number): Span {
  const start = lines.linePos(offset);
  const end = lines.linePos(Math.max(offset, endOffset));
  return {
    offset,
    endOffset: Math.max(offset, endOffset),
    line: start.line,
    column: start.col,
    endLine: end.line,
    endColumn: end.col,
  };
}

/** The span of a parsed YAML node (start to value end, trailing comments excluded). */
export function spanOfRange(lines: LineCounter, range: readonly [number, number, number] | null | undefined): Span | undefined {
  if (!range) return undefined;
  return spanFromOffsets(lines, range[0], range[1]);
}

/** From the start of `first` to the end of `last` (a key and its value). */
export function spanJoin(first: Span, last: Span): Span {
  if (last.endOffset < first.offset) return first;
  return { offset: first.offset, line: first.line, column: first.column, endOffset: last.endOffset, endLine: last.endLine, endColumn: last.endColumn };
}
